import crypto from 'node:crypto';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import exifr from 'exifr';
import { PDFParse } from 'pdf-parse';
import sharp from 'sharp';
import type { Test } from 'supertest';
import type { Router } from 'express';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Role } from '../../shared/roles';
import type { AppContext } from '../../server/context';
import { Attachment } from '../../server/db/entities/attachment.entity';
import { AuditEvent } from '../../server/db/entities/audit-event.entity';
import { Organization } from '../../server/db/entities/organization.entity';
import { createLogger } from '../../server/lib/logger';
import { createDiskStorage } from '../../server/lib/storage';
import { inspectUpload, MAX_FILE_BYTES } from '../../server/lib/uploads/inspect';
import { contentDisposition, safeDisplayName } from '../../server/lib/uploads/names';
import { attachmentsRouter } from '../../server/modules/attachments/attachments.router';
import { adoptDraftAttachments, saveAttachment } from '../../server/modules/attachments/attachments.service';
import { createOrganization, createUser, signIn } from '../support/factories';
import { startFakeS3 } from '../support/fake-s3';
import { closeTestApp, createTestApp, type TestContext } from '../support/test-app';
import {
  HTML_PAGE,
  MiB,
  pdfWithEscapedJavaScriptName,
  pdfWithJavaScript,
  pdfWithJavaScriptInObjectStream,
  pdfWithLaunch,
  photoWithExif,
  pixelFloodPng,
  plainPdf,
  pngImage,
  POLYGLOT_TAIL,
  receiptPdf,
  SVG_WITH_SCRIPT,
  webpImage,
} from '../support/upload-fixtures';

// The attachment machinery on a test-only owner: an organisation's own files at /api/organizations/:id/attachments,
// readable by its members and writable by its installers and administrators. Claims mount the same router later.
const OWNER_TYPE = 'test_org';

function mountOrganizationAttachments(api: Router, ctx: AppContext) {
  api.use(
    '/organizations/:id/attachments',
    attachmentsRouter(ctx, {
      ownerType: OWNER_TYPE,
      ownerLabel: 'organisation',
      loadOwner: (_req, id) => ctx.ds.getRepository(Organization).findOneBy({ id }),
      canRead: (req, org) => req.user!.organizationId === org.id,
      canWrite: (req, org) =>
        req.user!.organizationId === org.id &&
        req.user!.roles.some((r) => r === 'installer' || r === 'administrator'),
    }),
  );
}

function listFiles(dir: string): string[] {
  if (!fs.existsSync(dir)) return [];
  return fs
    .readdirSync(dir, { recursive: true, withFileTypes: true })
    .filter((e) => e.isFile())
    .map((e) => path.relative(dir, path.join(e.parentPath, e.name)))
    .sort();
}

const sha256 = (b: Buffer) => crypto.createHash('sha256').update(b).digest('hex');

let t: TestContext;
let storageDir: string;
beforeAll(async () => {
  storageDir = fs.mkdtempSync(path.join(os.tmpdir(), 'lumenproof-uploads-'));
  t = await createTestApp({ STORAGE_DIR: storageDir }, { mountApi: mountOrganizationAttachments });
});
afterAll(async () => {
  await closeTestApp(t);
  fs.rmSync(storageDir, { recursive: true, force: true });
});

async function member(kind: 'contractor' | 'manufacturer' = 'contractor', roles: Role[] = ['installer']) {
  const org = await createOrganization(t.ds, kind);
  const user = await createUser(t.ds, org, roles);
  const agent = await signIn(t.request(), user.email);
  return { org, user, agent, base: `/api/organizations/${org.id}/attachments` };
}

const rowsOf = (orgId: string) =>
  t.ds
    .getRepository(Attachment)
    .find({ where: { ownerType: OWNER_TYPE, ownerId: orgId }, withDeleted: true });

/** Sends one file and checks that a refusal left no stored file and no row behind. */
async function refused(
  who: Awaited<ReturnType<typeof member>>,
  body: Buffer,
  name: string,
  expected: { status: number; code: string },
) {
  const filesBefore = listFiles(storageDir);
  const rowsBefore = (await rowsOf(who.org.id)).length;
  const res = await who.agent
    .post(who.base)
    .field('purpose', 'failure')
    .attach('file', body, { filename: name, contentType: 'image/png' });
  expect(res.status).toBe(expected.status);
  expect(res.body.error.code).toBe(expected.code);
  expect(res.body.error.message).toEqual(expect.any(String));
  expect(listFiles(storageDir)).toEqual(filesBefore);
  expect(await rowsOf(who.org.id)).toHaveLength(rowsBefore);
  return res;
}

describe('display names', () => {
  it.each([
    ['../../etc/passwd.png', ['png'], 'passwd.png'],
    ['C:\\Users\\ines\\Desktop\\nameplate.JPG', ['jpg', 'jpeg'], 'nameplate.JPG'.replace('JPG', 'jpg')],
    ['bad\u0000name.jpg', ['jpg', 'jpeg'], 'badname.jpg'],
    ['invoice\u202Egpj.exe', ['jpg', 'jpeg'], 'invoicegpj.jpg'],
    ['receipt\u2066\u2069.pdf', ['pdf'], 'receipt.pdf'],
    ['photo.png', ['jpg', 'jpeg'], 'photo.jpg'],
    ['', ['pdf'], 'document.pdf'],
    ['....', ['pdf'], 'document.pdf'],
    ['what?<is>this|*.pdf', ['pdf'], 'what__is_this__.pdf'],
  ])('%j becomes %j', (input, exts, expected) => {
    expect(
      safeDisplayName(input, exts, input.endsWith('.pdf') || exts[0] === 'pdf' ? 'document' : 'photo'),
    ).toBe(expected);
  });

  it('keeps long names to 120 characters, extension included', () => {
    const name = safeDisplayName(`${'é'.repeat(300)}.pdf`, ['pdf'], 'document');
    expect(Array.from(name)).toHaveLength(120);
    expect(name.endsWith('.pdf')).toBe(true);
  });

  it('builds a Content-Disposition with an ASCII fallback and the exact UTF-8 name (RFC 6266, RFC 5987)', () => {
    expect(contentDisposition('Überprüfung "B" (1).pdf')).toBe(
      `attachment; filename="Uberprufung _B_ (1).pdf"; filename*=UTF-8''%C3%9Cberpr%C3%BCfung%20%22B%22%20%281%29.pdf`,
    );
    expect(contentDisposition('設備.jpg')).toBe(
      `attachment; filename="__.jpg"; filename*=UTF-8''%E8%A8%AD%E5%82%99.jpg`,
    );
  });
});

describe('inspecting an upload', () => {
  it('accepts JPEG, PNG and WebP photos and re-encodes them, with a WebP thumbnail', async () => {
    for (const [buffer, type] of [
      [await photoWithExif(), 'image/jpeg'],
      [await pngImage(), 'image/png'],
      [await webpImage(), 'image/webp'],
    ] as const) {
      const out = await inspectUpload(buffer, 'x');
      expect(out).toMatchObject({ kind: 'photo', contentType: type });
      expect((await sharp(out.body).metadata()).format).toBe(type.split('/')[1]);
      expect(out.thumbnail?.contentType).toBe('image/webp');
      expect(Math.max(out.thumbnail!.width, out.thumbnail!.height)).toBeLessThanOrEqual(320);
      expect(out.sha256).toBe(sha256(out.body));
    }
  });

  it('reads the capture time before stripping EXIF and GPS from the photo and its thumbnail', async () => {
    const original = await photoWithExif();
    // The fixture really carries GPS and a capture time.
    expect(await exifr.gps(original)).toMatchObject({
      latitude: expect.closeTo(41.87, 1),
      longitude: expect.closeTo(-87.63, 1),
    });
    const out = await inspectUpload(original, 'nameplate.jpg');
    // 09:26:53 at UTC-05:00.
    expect(out.capturedAt?.toISOString()).toBe('2025-03-14T14:26:53.000Z');
    expect(await exifr.parse(out.body)).toBeUndefined();
    // exifr does not read WebP; sharp reports any EXIF or XMP block the thumbnail would carry.
    const thumbMeta = await sharp(out.thumbnail!.body).metadata();
    expect(thumbMeta.exif).toBeUndefined();
    expect(thumbMeta.xmp).toBeUndefined();
    const meta = await sharp(out.body).metadata();
    expect(meta.exif).toBeUndefined();
    expect(meta.icc).toBeUndefined();
  });

  it('turns the pixels upright as the EXIF orientation says, since the orientation tag goes with the EXIF', async () => {
    const out = await inspectUpload(
      await photoWithExif({ width: 400, height: 300, orientation: 6 }),
      'sideways.jpg',
    );
    expect([out.width, out.height]).toEqual([300, 400]);
  });

  it('accepts a passive PDF as sent (a generated receipt, and one that opens at page 1)', async () => {
    const receipt = await receiptPdf();
    // The fixture is a PDF that a real reader parses.
    const parsed = await new PDFParse({ data: new Uint8Array(receipt) }).getText();
    expect(parsed.text).toContain('Receipt 10442');
    const out = await inspectUpload(receipt, 'receipt.pdf');
    expect(out).toMatchObject({
      kind: 'document',
      contentType: 'application/pdf',
      thumbnail: null,
      capturedAt: null,
    });
    expect(out.body.equals(receipt)).toBe(true);
    await expect(inspectUpload(plainPdf(), 'p.pdf')).resolves.toMatchObject({ kind: 'document' });
  });

  it('finds JavaScript hidden in a Flate-compressed object stream', async () => {
    const pdf = pdfWithJavaScriptInObjectStream();
    expect(pdf.toString('latin1')).not.toContain('JavaScript');
    await expect(inspectUpload(pdf, 'x.pdf')).rejects.toMatchObject({
      status: 422,
      code: 'attachment.pdf_active_content',
    });
  });

  it('finds active names written with #xx escapes', async () => {
    await expect(inspectUpload(pdfWithEscapedJavaScriptName(), 'x.pdf')).rejects.toMatchObject({
      status: 422,
      code: 'attachment.pdf_active_content',
    });
  });
});

describe('uploading', () => {
  it('stores a photo under a random name, with its thumbnail, and answers with what was kept', async () => {
    const who = await member();
    const original = await photoWithExif();
    const res = await who.agent
      .post(who.base)
      .field('purpose', 'nameplate')
      .attach('file', original, { filename: 'IMG_2041.JPG', contentType: 'text/html' });
    expect(res.status).toBe(201);
    const a = res.body.attachment;
    expect(a).toMatchObject({
      kind: 'photo',
      purpose: 'nameplate',
      name: 'IMG_2041.jpg',
      contentType: 'image/jpeg',
      width: 640,
      height: 480,
      capturedAt: '2025-03-14T14:26:53.000Z',
      contentUrl: `${who.base}/${a.id}/content`,
      thumbnailUrl: `${who.base}/${a.id}/thumbnail`,
      uploadedBy: { id: who.user.id },
    });

    const row = await t.ds.getRepository(Attachment).findOneByOrFail({ id: a.id });
    expect(row).toMatchObject({
      ownerType: OWNER_TYPE,
      ownerId: who.org.id,
      organizationId: who.org.id,
      uploadedById: who.user.id,
    });
    expect(row.storageKey).toMatch(/^attachments\/[0-9a-f-]{36}$/);
    expect(row.storageKey).not.toContain('IMG');
    expect(row.thumbnailKey).toBe(`${row.storageKey}-thumb`);
    const stored = fs.readFileSync(path.join(storageDir, row.storageKey));
    expect(stored.length).toBe(row.byteSize);
    expect(sha256(stored)).toBe(row.sha256);
    expect(await exifr.parse(stored)).toBeUndefined();
    expect(fs.existsSync(path.join(storageDir, row.thumbnailKey!))).toBe(true);
    // Outside the web root: nothing under the static client folder, and no route serves the folder.
    expect(path.relative(path.resolve('dist'), storageDir).startsWith('..')).toBe(true);
    expect((await who.agent.get(`/${row.storageKey}`)).status).not.toBe(200);

    const audit = await t.ds
      .getRepository(AuditEvent)
      .findOneByOrFail({ entityType: 'Attachment', entityId: a.id });
    expect(audit).toMatchObject({ action: 'attachment.added', actorUserId: who.user.id });
  });

  it('accepts a PDF proof of purchase and keeps it byte for byte', async () => {
    const who = await member();
    const pdf = await receiptPdf();
    const res = await who.agent
      .post(who.base)
      .field('purpose', 'proof_of_purchase')
      .attach('file', pdf, 'receipt.pdf');
    expect(res.status).toBe(201);
    expect(res.body.attachment).toMatchObject({
      kind: 'document',
      contentType: 'application/pdf',
      thumbnailUrl: null,
      name: 'receipt.pdf',
    });
    const row = await t.ds.getRepository(Attachment).findOneByOrFail({ id: res.body.attachment.id });
    expect(sha256(fs.readFileSync(path.join(storageDir, row.storageKey)))).toBe(sha256(pdf));
  });

  it('re-encodes a JPEG/HTML polyglot, so the stored bytes no longer carry the script', async () => {
    const who = await member();
    const polyglot = Buffer.concat([await photoWithExif(), Buffer.from(POLYGLOT_TAIL)]);
    const res = await who.agent.post(who.base).attach('file', polyglot, 'evil.html');
    expect(res.status).toBe(201);
    expect(res.body.attachment).toMatchObject({
      contentType: 'image/jpeg',
      name: 'evil.jpg',
      purpose: 'other',
    });
    const row = await t.ds.getRepository(Attachment).findOneByOrFail({ id: res.body.attachment.id });
    const stored = fs.readFileSync(path.join(storageDir, row.storageKey));
    expect(stored.includes('<script')).toBe(false);
    expect(stored.includes('<html')).toBe(false);
    const download = await who.agent.get(`${who.base}/${row.id}/content`).buffer(true).parse(binary);
    expect((download.body as Buffer).includes('<script')).toBe(false);
  });

  it('refuses an SVG named .png and an HTML page named .png (415), keeping nothing', async () => {
    const who = await member();
    await refused(who, SVG_WITH_SCRIPT, 'nameplate.png', {
      status: 415,
      code: 'attachment.unsupported_type',
    });
    await refused(who, HTML_PAGE, 'nameplate.png', { status: 415, code: 'attachment.unsupported_type' });
    await refused(who, Buffer.from('GIF89a\x01\x00\x01\x00\x00\x00\x00;', 'latin1'), 'a.gif', {
      status: 415,
      code: 'attachment.unsupported_type',
    });
  });

  it('refuses PDFs with JavaScript (plain, escaped, or in a compressed object stream) and with /Launch', async () => {
    const who = await member();
    const js = await refused(who, pdfWithJavaScript(), 'invoice.pdf', {
      status: 422,
      code: 'attachment.pdf_active_content',
    });
    expect(js.body.error.details[0].message).toMatch(/OpenAction|JavaScript|JS/);
    await refused(who, pdfWithEscapedJavaScriptName(), 'invoice.pdf', {
      status: 422,
      code: 'attachment.pdf_active_content',
    });
    await refused(who, pdfWithJavaScriptInObjectStream(), 'invoice.pdf', {
      status: 422,
      code: 'attachment.pdf_active_content',
    });
    const launch = await refused(who, pdfWithLaunch(), 'invoice.pdf', {
      status: 422,
      code: 'attachment.pdf_active_content',
    });
    expect(launch.body.error.details).toEqual([{ path: 'file', message: 'It contains /Launch.' }]);
  });

  it('refuses a truncated PDF and a truncated JPEG as unreadable (422)', async () => {
    const who = await member();
    const pdf = await receiptPdf();
    await refused(who, pdf.subarray(0, Math.floor(pdf.length / 2)), 'half.pdf', {
      status: 422,
      code: 'attachment.unreadable',
    });
    const jpeg = await photoWithExif();
    await refused(who, jpeg.subarray(0, Math.floor(jpeg.length * 0.6)), 'half.jpg', {
      status: 422,
      code: 'attachment.unreadable',
    });
  });

  it('refuses a pixel flood (a small PNG that declares 30000 x 30000 pixels) with 422', async () => {
    const who = await member();
    const flood = pixelFloodPng();
    expect(flood.length).toBeLessThan(200 * 1024);
    await refused(who, flood, 'flood.png', { status: 422, code: 'attachment.too_many_pixels' });
  });

  it('takes a file of exactly 15 MiB and refuses one byte more with 413', async () => {
    const who = await member();
    const photo = await photoWithExif();
    // Padding after the end of the image: a valid JPEG of the exact size, which re-encoding then drops.
    const exact = Buffer.concat([photo, Buffer.alloc(15 * MiB - photo.length)]);
    expect(exact.length).toBe(MAX_FILE_BYTES);
    const ok = await who.agent.post(who.base).attach('file', exact, 'exact.jpg');
    expect(ok.status).toBe(201);
    expect(ok.body.attachment.byteSize).toBeLessThan(1 * MiB);

    const rows = (await rowsOf(who.org.id)).length;
    await refused(who, Buffer.concat([exact, Buffer.alloc(1)]), 'over.jpg', {
      status: 413,
      code: 'attachment.too_large',
    });
    expect(await rowsOf(who.org.id)).toHaveLength(rows);
  });

  it('cleans the names people send: folders, right-to-left override, and keeps honest Unicode', async () => {
    const who = await member();
    const png = await pngImage();
    const names: [string, string][] = [
      ['../../../../etc/cron.d/x.png', 'x.png'],
      ['..\\..\\windows\\win.ini.png', 'win.ini.png'],
      ['photo\u202Egnp.exe', 'photognp.png'],
      ['Ünïcødé façade.png', 'Ünïcødé façade.png'],
    ];
    for (const [sent, kept] of names) {
      const res = await who.agent.post(who.base).attach('file', png, sent);
      expect(res.status, JSON.stringify(res.body)).toBe(201);
      expect(res.body.attachment.name).toBe(kept);
    }
    // Nothing was written outside the attachments folder of the store.
    expect(listFiles(storageDir).every((f) => f.startsWith(`attachments${path.sep}`))).toBe(true);
  });

  it('refuses a NUL in the part header itself as a malformed form (the name cleaning covers it beyond that)', async () => {
    const who = await member();
    await refused(who, await pngImage(), 'nul\u0000byte.png', {
      status: 400,
      code: 'request.malformed_multipart',
    });
  });

  it('refuses the 21st file on one owner with 409 and keeps nothing of it', async () => {
    const who = await member();
    const png = await pngImage(16, 16);
    for (let i = 0; i < 20; i++) {
      const res = await who.agent.post(who.base).attach('file', png, `p${i}.png`);
      expect(res.status).toBe(201);
    }
    await refused(who, png, 'p21.png', { status: 409, code: 'attachment.limit_reached' });
    expect(await rowsOf(who.org.id)).toHaveLength(20);
    // Another owner is not affected.
    const other = await member();
    expect((await other.agent.post(other.base).attach('file', png, 'p.png')).status).toBe(201);
  });

  it('answers clearly for a request without a file, with two files, or not multipart', async () => {
    const who = await member();
    const png = await pngImage(16, 16);
    const none = await who.agent.post(who.base).field('purpose', 'site');
    expect(none.status).toBe(400);
    expect(none.body.error.details).toEqual([{ path: 'file', message: 'Choose a file to upload.' }]);
    const two = await who.agent.post(who.base).attach('file', png, 'a.png').attach('file', png, 'b.png');
    expect(two.status).toBe(413);
    expect(two.body.error.code).toBe('attachment.too_many_files');
    const json = await who.agent.post(who.base).send({ file: 'aGVsbG8=' });
    expect(json.status).toBe(415);
    const badPurpose = await who.agent.post(who.base).field('purpose', 'selfie').attach('file', png, 'a.png');
    expect(badPurpose.status).toBe(400);
    expect(badPurpose.body.error.details[0].path).toBe('purpose');
    expect(await rowsOf(who.org.id)).toHaveLength(0);
    expect(listFiles(storageDir).length).toBeGreaterThanOrEqual(0);
  });

  it('keeps multipart bodies away from every other route', async () => {
    const who = await member();
    const res = await who.agent.post('/api/auth/logout').attach('file', await pngImage(8, 8), 'a.png');
    expect(res.status).toBe(415);
  });

  it('answers 404 to members of other organisations and 403 to members who may only read, storing nothing', async () => {
    const owner = await member();
    const stranger = await member();
    const reader = await createUser(t.ds, (await createOrganization(t.ds, 'manufacturer')) as Organization, [
      'reviewer',
    ]);
    const readerAgent = await signIn(t.request(), reader.email);
    const png = await pngImage(16, 16);
    const filesBefore = listFiles(storageDir);

    const foreign = await stranger.agent.post(owner.base).attach('file', png, 'a.png');
    const missing = await stranger.agent
      .post('/api/organizations/00000000-0000-4000-8000-000000000000/attachments')
      .attach('file', png, 'a.png');
    expect(foreign.status).toBe(404);
    expect(foreign.body).toEqual(missing.body);

    const readOnly = await readerAgent
      .post(`/api/organizations/${reader.organizationId}/attachments`)
      .attach('file', png, 'a.png');
    expect(readOnly.status).toBe(403);
    expect((await readerAgent.get(`/api/organizations/${reader.organizationId}/attachments`)).body).toEqual({
      items: [],
    });

    expect(listFiles(storageDir)).toEqual(filesBefore);
    expect(await rowsOf(owner.org.id)).toHaveLength(0);
    expect((await t.request().post(owner.base).attach('file', png, 'a.png')).status).toBe(401);
  });
});

/** A supertest parser that keeps the body as bytes. */
const binary = ((res: NodeJS.ReadableStream, cb: (err: Error | null, body: Buffer) => void) => {
  const parts: Buffer[] = [];
  res.on('data', (c: Buffer) => parts.push(c));
  res.on('end', () => cb(null, Buffer.concat(parts)));
}) as unknown as Parameters<Test['parse']>[0];

describe('downloading', () => {
  it('sends the file with its detected type, nosniff, a safe Content-Disposition, no caching and a sandbox CSP', async () => {
    const who = await member();
    const up = await who.agent
      .post(who.base)
      .attach('file', await photoWithExif(), 'Überprüfung "Typenschild"\u202E.jpg');
    expect(up.status).toBe(201);
    const { id, name } = up.body.attachment;
    expect(name).toBe('Überprüfung _Typenschild_.jpg');
    const row = await t.ds.getRepository(Attachment).findOneByOrFail({ id });

    const res = await who.agent.get(`${who.base}/${id}/content`).buffer(true).parse(binary);
    expect(res.status).toBe(200);
    expect(res.headers['content-type']).toBe('image/jpeg');
    expect(res.headers['x-content-type-options']).toBe('nosniff');
    expect(res.headers['content-disposition']).toBe(
      `attachment; filename="Uberprufung _Typenschild_.jpg"; filename*=UTF-8''%C3%9Cberpr%C3%BCfung%20_Typenschild_.jpg`,
    );
    expect(res.headers['cache-control']).toBe('private, no-store');
    expect(res.headers['content-security-policy']).toBe("sandbox; default-src 'none'");
    expect(sha256(res.body as Buffer)).toBe(row.sha256);

    const thumb = await who.agent.get(`${who.base}/${id}/thumbnail`).buffer(true).parse(binary);
    expect(thumb.status).toBe(200);
    expect(thumb.headers['content-type']).toBe('image/webp');
    expect(thumb.headers['x-content-type-options']).toBe('nosniff');
    expect((await sharp(thumb.body as Buffer).metadata()).width).toBe(320);

    const meta = await who.agent.get(`${who.base}/${id}`);
    expect(meta.body.attachment.id).toBe(id);
    const list = await who.agent.get(who.base);
    expect(list.body.items.map((i: { id: string }) => i.id)).toEqual([id]);
  });

  it('answers 404 to another organisation exactly like a missing attachment, for the file, the thumbnail and the list', async () => {
    const who = await member();
    const stranger = await member();
    const up = await who.agent.post(who.base).attach('file', await pngImage(), 'site.png');
    const id = up.body.attachment.id;
    const missingId = '00000000-0000-4000-8000-000000000000';

    for (const suffix of ['/content', '/thumbnail', '']) {
      const foreign = await stranger.agent.get(`${who.base}/${id}${suffix}`);
      const missingOwner = await stranger.agent.get(
        `/api/organizations/${missingId}/attachments/${id}${suffix}`,
      );
      expect(foreign.status).toBe(404);
      expect(foreign.body).toEqual(missingOwner.body);
      // Under their own owner, someone else's attachment id is as missing as a made-up one.
      const crossed = await stranger.agent.get(`${stranger.base}/${id}${suffix}`);
      const madeUp = await stranger.agent.get(`${stranger.base}/${missingId}${suffix}`);
      expect(crossed.status).toBe(404);
      expect(crossed.body).toEqual(madeUp.body);
    }
    expect((await stranger.agent.get(who.base)).status).toBe(404);
    expect((await stranger.agent.delete(`${who.base}/${id}`)).status).toBe(404);
    expect(await t.ds.getRepository(Attachment).findOneByOrFail({ id })).toMatchObject({ deletedAt: null });
  });

  it('a PDF has no thumbnail: 404', async () => {
    const who = await member();
    const up = await who.agent.post(who.base).attach('file', plainPdf(), 'p.pdf');
    expect((await who.agent.get(`${who.base}/${up.body.attachment.id}/thumbnail`)).status).toBe(404);
    const res = await who.agent
      .get(`${who.base}/${up.body.attachment.id}/content`)
      .buffer(true)
      .parse(binary);
    expect(res.headers['content-type']).toBe('application/pdf');
    expect(res.headers['content-disposition']).toBe(`attachment; filename="p.pdf"; filename*=UTF-8''p.pdf`);
  });
});

describe('removing', () => {
  it('marks the attachment removed (kept as evidence, with an audit row) and it is no longer listed or served', async () => {
    const who = await member();
    const up = await who.agent.post(who.base).attach('file', await pngImage(), 'wrong.png');
    const id = up.body.attachment.id;
    expect((await who.agent.delete(`${who.base}/${id}`)).status).toBe(204);
    expect((await who.agent.get(who.base)).body.items).toEqual([]);
    expect((await who.agent.get(`${who.base}/${id}/content`)).status).toBe(404);
    expect((await who.agent.delete(`${who.base}/${id}`)).status).toBe(404);
    const row = await t.ds.getRepository(Attachment).findOneOrFail({ where: { id }, withDeleted: true });
    expect(row.deletedAt).toBeInstanceOf(Date);
    expect(fs.existsSync(path.join(storageDir, row.storageKey))).toBe(true);
    expect(
      await t.ds.getRepository(AuditEvent).findOneBy({ entityId: id, action: 'attachment.removed' }),
    ).not.toBeNull();
  });
});

describe('the service on its own', () => {
  // The same disk folder the app writes to.
  const svc = () => ({ ds: t.ds, storage: createDiskStorage(storageDir), logger: createLogger('silent') });

  it('deletes the stored files again when the database refuses the row', async () => {
    const org = await createOrganization(t.ds, 'contractor');
    const before = listFiles(storageDir);
    // An uploader who does not exist: the row's foreign key fails after both objects were written.
    const ghost = { id: crypto.randomUUID(), organizationId: org.id };
    await expect(
      saveAttachment(svc(), {
        owner: { type: OWNER_TYPE, id: org.id },
        uploader: ghost,
        purpose: 'site',
        file: { buffer: await photoWithExif(), originalname: 'site.jpg' },
      }),
    ).rejects.toThrow();
    expect(listFiles(storageDir)).toEqual(before);
    expect(await rowsOf(org.id)).toHaveLength(0);
  });

  it('lets exactly as many simultaneous uploads through as the limit has room for', async () => {
    const org = await createOrganization(t.ds, 'contractor');
    const user = await createUser(t.ds, org, ['installer']);
    const owner = { type: OWNER_TYPE, id: org.id };
    const png = await pngImage(16, 16);
    const one = (i: number) =>
      saveAttachment(svc(), {
        owner,
        uploader: user,
        purpose: 'site',
        file: { buffer: png, originalname: `p${i}.png` },
      });
    for (let i = 0; i < 18; i++) await one(i);
    const before = listFiles(storageDir).length;
    const results = await Promise.allSettled([18, 19, 20, 21].map(one));
    expect(results.filter((r) => r.status === 'fulfilled')).toHaveLength(2);
    const refusals = results.filter((r): r is PromiseRejectedResult => r.status === 'rejected');
    expect(refusals.map((r) => r.reason.code)).toEqual([
      'attachment.limit_reached',
      'attachment.limit_reached',
    ]);
    expect(await rowsOf(org.id)).toHaveLength(20);
    // Two new photos, each with its thumbnail; the refused ones left nothing.
    expect(listFiles(storageDir).length).toBe(before + 4);
  });

  it("keeps a draft's files apart per uploader and hands them to the owner once it exists", async () => {
    const org = await createOrganization(t.ds, 'contractor');
    const a = await createUser(t.ds, org, ['installer']);
    const b = await createUser(t.ds, org, ['installer']);
    const draft = { type: OWNER_TYPE, id: null };
    const png = await pngImage(16, 16);
    const mine = await saveAttachment(svc(), {
      owner: draft,
      uploader: a,
      purpose: 'failure',
      file: { buffer: png, originalname: 'a.png' },
    });
    const theirs = await saveAttachment(svc(), {
      owner: draft,
      uploader: b,
      purpose: 'failure',
      file: { buffer: png, originalname: 'b.png' },
    });

    await expect(
      t.ds.transaction((m) =>
        adoptDraftAttachments(m, {
          ownerType: OWNER_TYPE,
          ownerId: org.id,
          uploaderId: a.id,
          ids: [mine.id, theirs.id],
        }),
      ),
    ).rejects.toMatchObject({ status: 400 });
    expect(await rowsOf(org.id)).toHaveLength(0);

    const moved = await t.ds.transaction((m) =>
      adoptDraftAttachments(m, { ownerType: OWNER_TYPE, ownerId: org.id, uploaderId: a.id, ids: [mine.id] }),
    );
    expect(moved).toBe(1);
    expect((await rowsOf(org.id)).map((r) => r.id)).toEqual([mine.id]);
  });
});

describe('on S3-compatible storage (s3rver)', () => {
  let s3: Awaited<ReturnType<typeof startFakeS3>>;
  let s3app: TestContext;
  beforeAll(async () => {
    s3 = await startFakeS3('lumenproof-attachments');
    s3app = await createTestApp({}, { storage: s3.storage, mountApi: mountOrganizationAttachments });
  });
  afterAll(async () => {
    await closeTestApp(s3app);
    await s3?.stop();
  });

  it('stores, serves and refuses exactly as on disk', async () => {
    const org = await createOrganization(s3app.ds, 'contractor');
    const user = await createUser(s3app.ds, org, ['installer']);
    const agent = await signIn(s3app.request(), user.email);
    const base = `/api/organizations/${org.id}/attachments`;

    const up = await agent
      .post(base)
      .field('purpose', 'failure')
      .attach('file', await photoWithExif(), 'dark-segments.jpg');
    expect(up.status).toBe(201);
    const row = await s3app.ds.getRepository(Attachment).findOneByOrFail({ id: up.body.attachment.id });
    expect(await s3.keys()).toEqual([row.storageKey, row.thumbnailKey].sort());

    const down = await agent.get(`${base}/${row.id}/content`).buffer(true).parse(binary);
    expect(down.status).toBe(200);
    expect(sha256(down.body as Buffer)).toBe(row.sha256);
    expect(down.headers['x-content-type-options']).toBe('nosniff');

    const bad = await agent.post(base).attach('file', pdfWithLaunch(), 'invoice.pdf');
    expect(bad.status).toBe(422);
    expect(await s3.keys()).toEqual([row.storageKey, row.thumbnailKey].sort());
    expect(await s3app.ds.getRepository(Attachment).countBy({ ownerId: org.id })).toBe(1);
  });
});
