import crypto from 'node:crypto';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Attachment } from '../../server/db/entities/attachment.entity';
import { drawInvoice } from '../../server/db/seed/demo-photos';
import { claimWorld, createDraft, goodClaimFields } from '../support/claim-factories';
import { HOSTILE_PDFS, multiPagePdf, objectStreamPdf, UNREADABLE_PDFS } from '../support/hostile-pdfs';
import { closeTestApp, createTestApp, type TestContext } from '../support/test-app';
import { plainPdf, receiptPdf } from '../support/upload-fixtures';

// Issue 13: PDFs that act on their own are refused by a real parser's reading of every object, and nothing of
// them is kept; ordinary PDFs still go through byte for byte.

let t: TestContext;
let storageDir: string;
let world: Awaited<ReturnType<typeof claimWorld>>;
let base: string;

beforeAll(async () => {
  storageDir = fs.mkdtempSync(path.join(os.tmpdir(), 'lumenproof-pdf-'));
  t = await createTestApp({ STORAGE_DIR: storageDir });
  world = await claimWorld(t);
  const draft = await createDraft(
    world.installer.agent,
    world.installation.id,
    goodClaimFields(world.installation.serials[0]),
  );
  base = `/api/claims/${draft.id}/attachments`;
});
afterAll(async () => {
  await closeTestApp(t);
  fs.rmSync(storageDir, { recursive: true, force: true });
});

function listFiles(dir: string): string[] {
  if (!fs.existsSync(dir)) return [];
  return fs
    .readdirSync(dir, { recursive: true, withFileTypes: true })
    .filter((e) => e.isFile())
    .map((e) => path.relative(dir, path.join(e.parentPath, e.name)))
    .sort();
}

const rowCount = () => t.ds.getRepository(Attachment).count();
const upload = (pdf: Buffer) =>
  world.installer.agent
    .post(base)
    .field('purpose', 'proof_of_purchase')
    .attach('file', pdf, { filename: 'invoice.pdf', contentType: 'application/pdf' });
const sha256 = (b: Buffer) => crypto.createHash('sha256').update(b).digest('hex');

describe('hostile PDFs', () => {
  it('has at least ten, each a file a PDF reader would open', () => {
    expect(Object.keys(HOSTILE_PDFS).length).toBeGreaterThanOrEqual(10);
  });

  it.each(Object.keys(HOSTILE_PDFS))('refuses %s (422) and keeps nothing', async (name) => {
    const pdf = await HOSTILE_PDFS[name]();
    expect(pdf.subarray(0, 5).toString('latin1')).toBe('%PDF-');
    const files = listFiles(storageDir);
    const rows = await rowCount();
    const res = await upload(pdf);
    expect(res.status).toBe(422);
    expect(res.body.error).toMatchObject({
      code: 'attachment.pdf_active_content',
      message: expect.stringMatching(/scripts, actions or embedded files/),
      details: [{ path: 'file', message: expect.stringMatching(/^It contains \//) }],
    });
    expect(listFiles(storageDir)).toEqual(files);
    expect(await rowCount()).toBe(rows);
  });

  it.each(Object.keys(UNREADABLE_PDFS))('refuses %s as unreadable (422) and keeps nothing', async (name) => {
    const files = listFiles(storageDir);
    const rows = await rowCount();
    const res = await upload(UNREADABLE_PDFS[name]());
    expect(res.status).toBe(422);
    expect(res.body.error.code).toBe('attachment.unreadable');
    expect(listFiles(storageDir)).toEqual(files);
    expect(await rowCount()).toBe(rows);
  });
});

describe('ordinary PDFs', () => {
  const ORDINARY: Record<string, () => Promise<Buffer> | Buffer> = {
    'the demo’s invoice (pdfkit)': () =>
      drawInvoice({
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
    'a pdfkit receipt': receiptPdf,
    'a twelve-page pdfkit document with a web link': () => multiPagePdf(12),
    'a pdf-lib document saved with object streams': objectStreamPdf,
    'a PDF that opens at its first page': plainPdf,
  };

  it.each(Object.keys(ORDINARY))('accepts %s and keeps it byte for byte', async (name) => {
    const pdf = await ORDINARY[name]();
    const res = await upload(pdf);
    expect(res.status).toBe(201);
    const row = await t.ds.getRepository(Attachment).findOneByOrFail({ id: res.body.attachment.id });
    expect(sha256(fs.readFileSync(path.join(storageDir, row.storageKey)))).toBe(sha256(pdf));
  });
});
