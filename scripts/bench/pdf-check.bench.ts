// npx tsx scripts/bench/pdf-check.bench.ts
// What the upload check of a PDF (server/lib/uploads/pdf.ts: pdf-lib's parse of every object) costs, beside two
// baselines from the same run: reading the same file from disk, and the SHA-256 every upload computes anyway.
// Files: the demo's invoice (pdfkit, one page) and a larger scanned-style document (pdfkit, 40 pages, each
// with a photo and a table). BENCH_SECONDS_PDF_CHECK (2) a measurement. Asserts nothing.
import crypto from 'node:crypto';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import PDFDocument from 'pdfkit';
import sharp from 'sharp';
import { drawInvoice } from '../../server/db/seed/demo-photos';
import { checkPdf } from '../../server/lib/uploads/pdf';

const SECONDS = Number(process.env.BENCH_SECONDS_PDF_CHECK ?? 2);

async function largePdf(pages: number): Promise<Buffer> {
  const photo = await sharp({
    create: { width: 1200, height: 900, channels: 3, background: { r: 90, g: 110, b: 130 } },
  })
    .composite([
      {
        input: Buffer.from(
          `<svg xmlns="http://www.w3.org/2000/svg" width="1200" height="900">${Array.from(
            { length: 60 },
            (_, i) =>
              `<circle cx="${(i * 97) % 1200}" cy="${(i * 53) % 900}" r="${20 + (i % 7) * 9}" fill="#${((i * 2654435761) >>> 8).toString(16).padStart(6, '0').slice(0, 6)}"/>`,
          ).join('')}</svg>`,
        ),
      },
    ])
    .jpeg({ quality: 85 })
    .toBuffer();
  return new Promise((resolve, reject) => {
    const doc = new PDFDocument({ size: 'LETTER', info: { Title: 'Site survey (fictional)' } });
    const parts: Buffer[] = [];
    doc.on('data', (c: Buffer) => parts.push(c));
    doc.on('end', () => resolve(Buffer.concat(parts)));
    doc.on('error', reject);
    for (let p = 0; p < pages; p++) {
      if (p) doc.addPage();
      doc.fontSize(14).text(`Site survey, sheet ${p + 1} of ${pages}`);
      doc.image(photo, { width: 480 });
      for (let r = 0; r < 12; r++)
        doc.fontSize(8).text(`Bay ${p * 12 + r + 1}: HB-150 150 W 4000 K, reading 0.0 A`);
    }
    doc.end();
  });
}

async function timePerCall(fn: () => Promise<unknown> | unknown): Promise<number> {
  for (let i = 0; i < 3; i++) await fn();
  let n = 0;
  const t0 = performance.now();
  while (performance.now() - t0 < SECONDS * 1000) {
    await fn();
    n++;
  }
  return (performance.now() - t0) / n;
}

async function main() {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'lumenproof-pdf-check-'));
  const files: [string, Buffer][] = [
    [
      'demo invoice (pdfkit, 1 page)',
      await drawInvoice({
        distributor: 'Northgate Electrical Supply',
        invoiceNumber: 'INV-10442',
        date: '2024-02-15',
        billTo: 'Example contractor',
        shipTo: 'Example site',
        model: 'HB-150',
        description: 'High-bay luminaire 150 W',
        quantity: 12,
        unitPrice: '189.00',
      }),
    ],
    ['site survey (pdfkit, 40 pages with photos)', await largePdf(40)],
  ];
  try {
    for (const [label, pdf] of files) {
      const file = path.join(dir, 'f.pdf');
      fs.writeFileSync(file, pdf);
      const read = await timePerCall(() => fs.promises.readFile(file));
      const hash = await timePerCall(() => crypto.createHash('sha256').update(pdf).digest('hex'));
      const check = await timePerCall(() => checkPdf(pdf));
      console.log(`${label}: ${(pdf.length / 1024).toFixed(0)} KB`);
      console.log(`  read from disk (baseline)   ${read.toFixed(3).padStart(9)} ms`);
      console.log(`  sha-256 (baseline)          ${hash.toFixed(3).padStart(9)} ms`);
      console.log(
        `  checkPdf                    ${check.toFixed(3).padStart(9)} ms   ${(check / read).toFixed(1)}x the read, ${(check / hash).toFixed(1)}x the hash`,
      );
    }
  } finally {
    fs.rmSync(dir, { recursive: true, force: true });
  }
}

main().catch((e) => {
  console.error(e);
  process.exit(1);
});
