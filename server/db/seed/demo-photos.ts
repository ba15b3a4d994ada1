import PDFDocument from 'pdfkit';
import sharp from 'sharp';
import type { AttachmentPurpose } from '../../../shared/schemas/attachments';

// Drawn photos for the demo claims: a fixture's nameplate, its LED board with dark segments, and the site. All
// fictional, drawn from SVG and encoded as small JPEGs (800 x 600), so the demo never ships real photographs;
// and the distributor's invoice a contractor keeps as proof of purchase, a one-page PDF.

const WIDTH = 800;
const HEIGHT = 600;

const esc = (s: string) =>
  s.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;');

/** A small deterministic generator, so that the same inputs always draw the same picture. */
function seeded(seed: string) {
  let h = 2166136261;
  for (const ch of seed) h = Math.imul(h ^ ch.charCodeAt(0), 16777619);
  return () => {
    h = Math.imul(h ^ (h >>> 15), 2246822507);
    h = Math.imul(h ^ (h >>> 13), 3266489909);
    h ^= h >>> 16;
    return (h >>> 0) / 4294967296;
  };
}

// Plain libjpeg, not mozjpeg: five times faster here, and the upload path encodes every photo again anyway.
const toJpeg = (svg: string) =>
  sharp(Buffer.from(svg))
    .resize(WIDTH, HEIGHT)
    .flatten({ background: '#808080' })
    .jpeg({ quality: 80 })
    .toBuffer();

export type NameplateInfo = {
  manufacturer: string;
  model: string;
  /** Left off for a model's nameplate shared by many units (the serial then sits on its own sticker). */
  serial?: string;
  /** e.g. "120-277 V AC 50/60 Hz 1.3 A" */
  input?: string;
  power?: string;
  location?: string;
  dateCode?: string;
};

export function drawNameplate(info: NameplateInfo): Promise<Buffer> {
  const rows: [string, string][] = [
    ['MODEL', info.model],
    ...(info.serial ? [['SERIAL', info.serial] as [string, string]] : []),
    ['INPUT', info.input ?? '120-277 V AC 50/60 Hz'],
    ['POWER', info.power ?? '150 W'],
    ['LOCATION', info.location ?? 'Suitable for damp locations'],
    ['DATE CODE', info.dateCode ?? '2331'],
  ];
  const lines = rows
    .map(
      ([k, v], i) =>
        `<text x="180" y="${250 + i * 38}" font-family="DejaVu Sans, sans-serif" font-size="18" fill="#333">${esc(k)}</text>` +
        `<text x="310" y="${250 + i * 38}" font-family="DejaVu Sans Mono, monospace" font-size="18" font-weight="bold" fill="#111">${esc(v)}</text>`,
    )
    .join('');
  const svg = `<svg xmlns="http://www.w3.org/2000/svg" width="${WIDTH}" height="${HEIGHT}">
  <defs>
    <linearGradient id="housing" x1="0" y1="0" x2="1" y2="1"><stop offset="0" stop-color="#5b6066"/><stop offset="1" stop-color="#2f3338"/></linearGradient>
    <linearGradient id="label" x1="0" y1="0" x2="0" y2="1"><stop offset="0" stop-color="#f4f4ef"/><stop offset="1" stop-color="#dcdcd2"/></linearGradient>
  </defs>
  <rect width="100%" height="100%" fill="url(#housing)"/>
  ${Array.from({ length: 14 }, (_, i) => `<rect x="0" y="${i * 44}" width="${WIDTH}" height="6" fill="#000" opacity="0.12"/>`).join('')}
  <g transform="rotate(-3 400 300)">
    <rect x="150" y="140" width="510" height="340" rx="10" fill="url(#label)" stroke="#999" stroke-width="2"/>
    <rect x="150" y="140" width="510" height="60" rx="10" fill="#1d3557"/>
    <text x="180" y="180" font-family="DejaVu Sans, sans-serif" font-size="24" font-weight="bold" fill="#fff">${esc(info.manufacturer)}</text>
    ${lines}
    <rect x="180" y="462" width="200" height="8" fill="#222"/>
    <circle cx="166" cy="470" r="6" fill="#888"/><circle cx="644" cy="470" r="6" fill="#888"/>
  </g>
  <rect width="100%" height="100%" fill="#fff" opacity="0.04"/>
</svg>`;
  return toJpeg(svg);
}

export type LedBoardInfo = {
  strings: number;
  ledsPerString: number;
  /** [string, led] pairs (0-based) that are dark; or a whole string as [string, -1]. */
  dark: [number, number][];
  seed?: string;
};

export function drawLedBoard(info: LedBoardInfo): Promise<Buffer> {
  const rnd = seeded(info.seed ?? `${info.strings}x${info.ledsPerString}`);
  const isDark = (s: number, l: number) => info.dark.some(([ds, dl]) => ds === s && (dl === -1 || dl === l));
  const cols = info.ledsPerString;
  const pitchX = Math.min(60, 640 / cols);
  const pitchY = Math.min(70, 400 / info.strings);
  const x0 = (WIDTH - pitchX * (cols - 1)) / 2;
  const y0 = (HEIGHT - pitchY * (info.strings - 1)) / 2;
  const r = Math.min(pitchX, pitchY) * 0.28;
  const leds: string[] = [];
  for (let s = 0; s < info.strings; s++) {
    for (let l = 0; l < cols; l++) {
      const x = x0 + l * pitchX + (rnd() - 0.5) * 2;
      const y = y0 + s * pitchY + (rnd() - 0.5) * 2;
      if (isDark(s, l)) {
        leds.push(
          `<rect x="${x - r}" y="${y - r}" width="${2 * r}" height="${2 * r}" rx="3" fill="#3a3020"/>`,
        );
        leds.push(`<circle cx="${x}" cy="${y}" r="${r * 0.5}" fill="#241c10"/>`);
      } else {
        leds.push(`<circle cx="${x}" cy="${y}" r="${r * 2.2}" fill="url(#glow)"/>`);
        leds.push(
          `<rect x="${x - r}" y="${y - r}" width="${2 * r}" height="${2 * r}" rx="3" fill="#fffbe8"/>`,
        );
      }
    }
  }
  const svg = `<svg xmlns="http://www.w3.org/2000/svg" width="${WIDTH}" height="${HEIGHT}">
  <defs>
    <radialGradient id="glow"><stop offset="0" stop-color="#fff6c8" stop-opacity="0.9"/><stop offset="1" stop-color="#fff6c8" stop-opacity="0"/></radialGradient>
  </defs>
  <rect width="100%" height="100%" fill="#1b1e22"/>
  <rect x="40" y="60" width="720" height="480" rx="14" fill="#2d6a4f" stroke="#1b4332" stroke-width="6"/>
  ${Array.from({ length: info.strings }, (_, s) => `<line x1="${x0 - 30}" y1="${y0 + s * pitchY}" x2="${x0 + pitchX * (cols - 1) + 30}" y2="${y0 + s * pitchY}" stroke="#b08d57" stroke-width="3" opacity="0.7"/>`).join('')}
  ${leds.join('')}
</svg>`;
  return toJpeg(svg);
}

export type SiteInfo = { fixtures?: number; label?: string; seed?: string };

/** A warehouse aisle under high-bay fixtures, one of them out. */
export function drawSite(info: SiteInfo = {}): Promise<Buffer> {
  const rnd = seeded(info.seed ?? 'site');
  const n = info.fixtures ?? 6;
  const out = Math.floor(rnd() * n);
  const fixtures = Array.from({ length: n }, (_, i) => {
    const x = 110 + i * (580 / Math.max(1, n - 1));
    const lit = i !== out;
    return (
      `<line x1="${x}" y1="0" x2="${x}" y2="70" stroke="#444" stroke-width="2"/>` +
      `<path d="M ${x - 40} 110 L ${x - 22} 70 L ${x + 22} 70 L ${x + 40} 110 Z" fill="#6c757d"/>` +
      `<ellipse cx="${x}" cy="110" rx="40" ry="8" fill="${lit ? '#fffbe0' : '#3b3b3b'}"/>` +
      (lit
        ? `<path d="M ${x - 40} 112 L ${x - 120} 600 L ${x + 120} 600 L ${x + 40} 112 Z" fill="#fff8d0" opacity="0.08"/>`
        : '')
    );
  }).join('');
  const racks = Array.from({ length: 5 }, (_, i) => {
    const y = 260 + i * 60;
    return `<rect x="30" y="${y}" width="200" height="10" fill="#e07a1f"/><rect x="570" y="${y}" width="200" height="10" fill="#e07a1f"/>`;
  }).join('');
  const boxes = Array.from({ length: 16 }, (_, i) => {
    const side = i % 2 ? 580 : 40;
    const row = Math.floor(i / 4);
    const x = side + (i % 4) * 45 + rnd() * 6;
    return `<rect x="${x}" y="${222 + row * 60 + rnd() * 6}" width="40" height="36" fill="#b5835a" stroke="#7f5539"/>`;
  }).join('');
  const svg = `<svg xmlns="http://www.w3.org/2000/svg" width="${WIDTH}" height="${HEIGHT}">
  <defs><linearGradient id="floor" x1="0" y1="0" x2="0" y2="1"><stop offset="0" stop-color="#6b6b66"/><stop offset="1" stop-color="#9a9a92"/></linearGradient></defs>
  <rect width="100%" height="100%" fill="#3d4147"/>
  <path d="M 0 600 L 300 250 L 500 250 L 800 600 Z" fill="url(#floor)"/>
  <path d="M 395 600 L 398 250 L 402 250 L 405 600 Z" fill="#f2c94c" opacity="0.7"/>
  ${racks}${boxes}${fixtures}
  ${info.label ? `<rect x="20" y="548" width="${16 + info.label.length * 11}" height="34" fill="#000" opacity="0.55"/><text x="28" y="572" font-family="DejaVu Sans, sans-serif" font-size="18" fill="#fff">${esc(info.label)}</text>` : ''}
</svg>`;
  return toJpeg(svg);
}

export type DemoPhoto = { purpose: AttachmentPurpose; name: string; body: Buffer };

/** The usual evidence for one claim: the nameplate, the failure and the site. */
export async function demoPhotosFor(claim: {
  manufacturer: string;
  model: string;
  serial: string;
  strings?: number;
  ledsPerString?: number;
  darkStrings?: number[];
  site?: string;
}): Promise<DemoPhoto[]> {
  const strings = claim.strings ?? 4;
  const dark = (claim.darkStrings ?? [1]).map((s) => [s, -1] as [number, number]);
  return [
    { purpose: 'nameplate', name: `nameplate-${claim.serial}.jpg`, body: await drawNameplate(claim) },
    {
      purpose: 'failure',
      name: `led-board-${claim.serial}.jpg`,
      body: await drawLedBoard({
        strings,
        ledsPerString: claim.ledsPerString ?? 12,
        dark,
        seed: claim.serial,
      }),
    },
    {
      purpose: 'site',
      name: `site-${claim.serial}.jpg`,
      body: await drawSite({ label: claim.site, seed: claim.serial }),
    },
  ];
}

export type InvoiceInfo = {
  distributor: string;
  invoiceNumber: string;
  /** YYYY-MM-DD; also the PDF's own dates, so the same invoice always has the same bytes. */
  date: string;
  billTo: string;
  shipTo: string;
  model: string;
  description: string;
  quantity: number;
  /** Decimal string, e.g. "148.00". */
  unitPrice: string;
};

const cents = (s: string) => Math.round(Number(s) * 100);
const money = (c: number) =>
  `${(c / 100).toLocaleString('en-US', { minimumFractionDigits: 2, maximumFractionDigits: 2 })}`;

/**
 * A distributor's invoice for the fixtures, as a contractor would scan or download it: one page in the PDF
 * standard fonts (nothing embedded, nothing active), deterministic.
 */
export function drawInvoice(info: InvoiceInfo): Promise<Buffer> {
  const date = new Date(`${info.date}T12:00:00Z`);
  const doc = new PDFDocument({
    size: 'LETTER',
    margin: 56,
    info: {
      Title: `Invoice ${info.invoiceNumber}`,
      Author: info.distributor,
      CreationDate: date,
      ModDate: date,
    },
  });
  const parts: Buffer[] = [];
  const done = new Promise<Buffer>((resolve, reject) => {
    doc.on('data', (c: Buffer) => parts.push(c));
    doc.on('end', () => resolve(Buffer.concat(parts)));
    doc.on('error', reject);
  });
  const net = cents(info.unitPrice) * info.quantity;
  const tax = Math.round(net * 0.065);
  doc.font('Helvetica-Bold').fontSize(20).fillColor('#1d3557').text(info.distributor);
  doc
    .font('Helvetica')
    .fontSize(9)
    .fillColor('#555')
    .text('Electrical and lighting supply. Fictional: Lumenproof demo data.');
  doc.moveDown(1.5);
  doc.font('Helvetica-Bold').fontSize(14).fillColor('#111').text(`INVOICE ${info.invoiceNumber}`);
  doc.font('Helvetica').fontSize(10).text(`Date: ${info.date}    Terms: net 30`);
  doc.moveDown();
  doc.font('Helvetica-Bold').text('Bill to', { continued: false }).font('Helvetica').text(info.billTo);
  doc.moveDown(0.5);
  doc.font('Helvetica-Bold').text('Ship to').font('Helvetica').text(info.shipTo);
  doc.moveDown(1.5);
  const y = doc.y;
  const cols = [56, 150, 380, 440, 500];
  doc.font('Helvetica-Bold');
  ['Item', 'Description', 'Qty', 'Unit', 'Amount'].forEach((h, i) =>
    doc.text(h, cols[i], y, { lineBreak: false }),
  );
  doc
    .moveTo(56, y + 14)
    .lineTo(556, y + 14)
    .strokeColor('#999')
    .stroke();
  doc.font('Helvetica');
  const row = y + 22;
  [info.model, info.description, String(info.quantity), money(cents(info.unitPrice)), money(net)].forEach(
    (v, i) => doc.text(v, cols[i], row, { width: i === 1 ? 220 : 60, lineBreak: i === 1 }),
  );
  let ty = row + 44;
  for (const [label, value] of [
    ['Subtotal', net],
    ['Sales tax 6.5 %', tax],
    ['Total USD', net + tax],
  ] as const) {
    doc
      .font(label.startsWith('Total') ? 'Helvetica-Bold' : 'Helvetica')
      .text(label, 380, ty, { lineBreak: false });
    doc.text(money(value), 500, ty, { lineBreak: false });
    ty += 16;
  }
  doc
    .font('Helvetica')
    .fontSize(8)
    .fillColor('#777')
    .text('Keep this invoice: the manufacturer may ask for it with a warranty claim.', 56, ty + 30);
  doc.end();
  return done;
}
