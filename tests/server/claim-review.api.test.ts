import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import {
  BarcodeFormat,
  BinaryBitmap,
  DecodeHintType,
  HybridBinarizer,
  MultiFormatReader,
  RGBLuminanceSource,
} from '@zxing/library';
import { PDFParse } from 'pdf-parse';
import sharp from 'sharp';
import type supertest from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { RETURN_NUMBER_PATTERN } from '../../shared/claims/workflow';
import { Attachment } from '../../server/db/entities/attachment.entity';
import { AuditEvent } from '../../server/db/entities/audit-event.entity';
import { BenchTest } from '../../server/db/entities/bench-test.entity';
import { ClaimDocument } from '../../server/db/entities/claim-document.entity';
import { Claim } from '../../server/db/entities/claim.entity';
import { Decision } from '../../server/db/entities/decision.entity';
import type { Organization } from '../../server/db/entities/organization.entity';
import { OutboxMessage } from '../../server/db/entities/outbox-message.entity';
import type { User } from '../../server/db/entities/user.entity';
import { createStorage } from '../../server/lib/storage';
import { createClaimActionsService } from '../../server/modules/claim-actions/claim-actions.service';
import { createLogger } from '../../server/lib/logger';
import { createOrganization, createUser, signIn } from '../support/factories';
import {
  createClaimAt,
  createReviewWorld,
  outboxCount,
  snapshotClaim,
  type ReviewWorld,
} from '../support/review-factories';
import { closeTestApp, createTestApp, type TestContext } from '../support/test-app';
import {
  HTML_PAGE,
  MiB,
  pdfWithJavaScript,
  pixelFloodPng,
  pngImage,
  SVG_WITH_SCRIPT,
} from '../support/upload-fixtures';

let t: TestContext;
let w: ReviewWorld;
let contractor: Organization;
let manufacturer: Organization;
let installer: User;
let reviewer: User;
let reviewer2: User;
let accountant: User;
let asInstaller: supertest.Agent;
let asReviewer: supertest.Agent;
let asReviewer2: supertest.Agent;
let asForeign: supertest.Agent;

let storageDir: string;

beforeAll(async () => {
  // Its own storage folder, so that "nothing stored" is this file's to count.
  storageDir = fs.mkdtempSync(path.join(os.tmpdir(), 'lumenproof-review-files-'));
  t = await createTestApp({ STORAGE_DIR: storageDir });
  contractor = await createOrganization(t.ds, 'contractor');
  manufacturer = await createOrganization(t.ds, 'manufacturer');
  w = await createReviewWorld(t.ds, contractor, manufacturer);
  installer = await createUser(t.ds, contractor, ['installer']);
  reviewer = await createUser(t.ds, manufacturer, ['reviewer'], { name: 'Rowan Reviewer' });
  reviewer2 = await createUser(t.ds, manufacturer, ['reviewer']);
  accountant = await createUser(t.ds, manufacturer, ['accountant']);
  const foreign = await createUser(t.ds, await createOrganization(t.ds, 'contractor'), ['installer']);
  asInstaller = await signIn(t.request(), installer.email);
  asReviewer = await signIn(t.request(), reviewer.email);
  asReviewer2 = await signIn(t.request(), reviewer2.email);
  asForeign = await signIn(t.request(), foreign.email);
}, 120_000);

afterAll(async () => {
  await closeTestApp(t);
  fs.rmSync(storageDir, { recursive: true, force: true });
});

async function textOf(pdf: Buffer): Promise<string> {
  const parser = new PDFParse({ data: new Uint8Array(pdf) });
  try {
    return (await parser.getText()).text.replace(/\s+/g, ' ');
  } finally {
    await parser.destroy();
  }
}

async function download(agent: supertest.Agent, url: string) {
  const res = await agent
    .get(url)
    .buffer(true)
    .parse((r, cb) => {
      const chunks: Buffer[] = [];
      r.on('data', (c: Buffer) => chunks.push(c));
      r.on('end', () => cb(null, Buffer.concat(chunks)));
    });
  return res as supertest.Response & { body: Buffer };
}

describe('two reviewers deciding at once', () => {
  it('gives exactly one decision: one 200, one 409 claim.changed, one letter, one audit row', async () => {
    const claim = await createClaimAt(t.ds, w, 'in_review', { filedById: installer.id });
    const credit = claim.evaluation!.computed.credit;
    const [a, b] = await Promise.all([
      asReviewer
        .post(`/api/claims/${claim.id}/actions/approve`)
        .send({ resolution: 'credit', amount: credit }),
      asReviewer2
        .post(`/api/claims/${claim.id}/actions/deny`)
        .send({ reasonCodes: ['physical_damage'], note: 'Cracked.', overrideReason: 'Seen on the photos.' }),
    ]);
    const statuses = [a.status, b.status].sort();
    expect(statuses).toEqual([200, 409]);
    const loser = a.status === 409 ? a : b;
    expect(['claim.changed', 'claim.invalid_transition']).toContain(loser.body.error.code);
    expect(await t.ds.getRepository(Decision).count({ where: { claimId: claim.id } })).toBe(1);
    expect(
      await t.ds.getRepository(ClaimDocument).count({ where: { claimId: claim.id, kind: 'letter' } }),
    ).toBe(1);
    const audit = await t.ds
      .getRepository(AuditEvent)
      .find({ where: { entityType: 'Claim', entityId: claim.id } });
    expect(audit).toHaveLength(1);
    const after = await t.ds.getRepository(Claim).findOneByOrFail({ id: claim.id });
    expect(after.version).toBe(claim.version + 1);
  });

  it('the same decision twice at once: one approval', async () => {
    const claim = await createClaimAt(t.ds, w, 'in_review', { filedById: installer.id });
    const body = { resolution: 'replace', amount: claim.evaluation!.computed.credit };
    const res = await Promise.all([
      asReviewer.post(`/api/claims/${claim.id}/actions/approve`).send(body),
      asReviewer2.post(`/api/claims/${claim.id}/actions/approve`).send(body),
    ]);
    expect(res.map((r) => r.status).sort()).toEqual([200, 409]);
    expect(await t.ds.getRepository(Decision).count({ where: { claimId: claim.id } })).toBe(1);
  });
});

describe('deciding', () => {
  it('approving against the engine needs a written reason; a changed amount too; refused requests change nothing', async () => {
    const claim = await createClaimAt(t.ds, w, 'in_review', { filedById: installer.id, verdict: 'excluded' });
    const before = await snapshotClaim(t.ds, claim.id);
    const noReason = await asReviewer
      .post(`/api/claims/${claim.id}/actions/approve`)
      .send({ resolution: 'credit', amount: '96.00' });
    expect(noReason.status).toBe(400);
    expect(noReason.body.error.code).toBe('claim.invalid_payload');
    expect(noReason.body.error.details[0].path).toBe('overrideReason');
    expect(noReason.body.error.details[0].message).toMatch(/likely excluded/);
    expect(await snapshotClaim(t.ds, claim.id)).toEqual(before);

    const ok = await asReviewer.post(`/api/claims/${claim.id}/actions/approve`).send({
      resolution: 'repair_allowance',
      amount: '35.00',
      overrideReason: 'The wet-location finding rests on a misread label.',
    });
    expect(ok.status).toBe(200);
    const d = ok.body.workflow.decision;
    expect(d).toMatchObject({
      outcome: 'approved',
      resolution: 'repair_allowance',
      amount: '35.00',
      againstEngine: true,
    });
    expect(d.letter.sha256).toMatch(/^[0-9a-f]{64}$/);
  });

  it('the letter holds the claim number, the decision and the findings; a second download, by either party, is byte-identical', async () => {
    const claim = await createClaimAt(t.ds, w, 'in_review', { filedById: installer.id });
    const res = await asReviewer.post(`/api/claims/${claim.id}/actions/deny`).send({
      reasonCodes: ['physical_damage', 'ingress'],
      note: 'Water marks inside the driver compartment.',
      overrideReason: 'Bench photos show ingress.',
    });
    expect(res.status).toBe(200);
    const letter = res.body.workflow.decision.letter;
    const first = await download(asReviewer, letter.url);
    expect(first.status).toBe(200);
    expect(first.headers['content-type']).toBe('application/pdf');
    expect(first.headers['x-content-type-options']).toBe('nosniff');
    expect(first.headers['content-disposition']).toContain(`${claim.number}-determination.pdf`);
    const second = await download(asInstaller, letter.url);
    expect(second.status).toBe(200);
    expect(Buffer.compare(first.body, second.body)).toBe(0);
    expect(second.headers['x-content-sha256']).toBe(letter.sha256);
    const text = await textOf(first.body);
    expect(text).toContain(claim.number!);
    expect(text).toMatch(/Denied/i);
    expect(text).toContain('Water marks inside the driver compartment.');
    // Every finding of the engine's evaluation is in the letter (messages wrap, so compare folded).
    for (const f of claim.evaluation!.findings)
      expect(text).toContain(f.message.replace(/\s+/g, ' ').slice(0, 40));
    // The other organisation's outsider sees nothing, exactly like a missing document.
    expect((await asForeign.get(letter.url)).status).toBe(404);
    // Told to the installer with the letter attached, in the same transaction.
    const mail = await t.ds
      .getRepository(OutboxMessage)
      .find({ where: { to: installer.email }, order: { id: 'DESC' }, take: 1 });
    expect(mail[0].attachments?.[0]?.filename).toBe(`${claim.number}-determination.pdf`);
  });

  it('a repair allowance letter carries the listing caution (PRODUCT.md, Safety)', async () => {
    const claim = await createClaimAt(t.ds, w, 'in_review', { filedById: installer.id });
    const res = await asReviewer
      .post(`/api/claims/${claim.id}/actions/approve`)
      .send({ resolution: 'repair_allowance', amount: claim.evaluation!.computed.credit });
    expect(res.status).toBe(200);
    const text = await textOf((await download(asInstaller, res.body.workflow.decision.letter.url)).body);
    expect(text).toMatch(/void its safety listing/);
    expect(text).toMatch(/local electrical codes/);
  });
});

describe('returns', () => {
  it('a return authorisation has our number; the packing slip’s Code 128 decodes to it; shipment and receipt are recorded', async () => {
    const claim = await createClaimAt(t.ds, w, 'in_review', {
      filedById: installer.id,
      assigneeId: reviewer.id,
    });
    const res = await asReviewer.post(`/api/claims/${claim.id}/actions/request_return`).send({
      shipTo: {
        name: 'Returns bench',
        attention: 'Lab',
        line1: '400 Foundry Way',
        city: 'Millbrook',
        region: 'OH',
        postalCode: '45402',
        country: 'US',
      },
      instructions: 'Ship the whole fixture with its driver.',
    });
    expect(res.status).toBe(200);
    const ra = res.body.workflow.returns[0];
    expect(ra.number).toMatch(RETURN_NUMBER_PATTERN);
    const slip = await download(asInstaller, ra.packingSlip.url);
    expect(slip.status).toBe(200);
    const text = await textOf(slip.body);
    expect(text).toContain(ra.number);
    expect(text).toContain('400 Foundry Way');
    const parser = new PDFParse({ data: new Uint8Array(slip.body) });
    try {
      const shot = await parser.getScreenshot({ scale: 3, imageBuffer: true, imageDataUrl: false });
      const { data, info } = await sharp(shot.pages[0].data)
        .greyscale()
        .raw()
        .toBuffer({ resolveWithObject: true });
      const lum = new Uint8ClampedArray(info.width * info.height);
      for (let i = 0; i < lum.length; i++) lum[i] = data[i * info.channels];
      const hints = new Map<DecodeHintType, unknown>([
        [DecodeHintType.POSSIBLE_FORMATS, [BarcodeFormat.CODE_128]],
        [DecodeHintType.TRY_HARDER, true],
      ]);
      const decoded = new MultiFormatReader().decode(
        new BinaryBitmap(new HybridBinarizer(new RGBLuminanceSource(lum, info.width, info.height))),
        hints,
      );
      expect(decoded.getBarcodeFormat()).toBe(BarcodeFormat.CODE_128);
      expect(decoded.getText()).toBe(ra.number);
    } finally {
      await parser.destroy();
    }

    const shipped = await asInstaller
      .post(`/api/claims/${claim.id}/actions/record_shipment`)
      .send({ carrier: 'Parcel Co', trackingNumber: '1Z 999 AA1', shippedOn: '2025-06-05' });
    expect(shipped.status).toBe(200);
    expect(shipped.body.claim).toMatchObject({ stage: 'return_requested', waitingOn: 'manufacturer' });
    const received = await asReviewer
      .post(`/api/claims/${claim.id}/actions/receive_unit`)
      .send({ receivedOn: '2025-06-09', condition: 'as_described' });
    expect(received.status).toBe(200);
    expect(received.body.workflow.returns[0]).toMatchObject({
      carrier: 'Parcel Co',
      trackingNumber: '1Z 999 AA1',
      receivedOn: '2025-06-09',
    });

    // The bench test re-runs the engine on the lab's readings and keeps both evaluations.
    const bench = await asReviewer.post(`/api/claims/${claim.id}/actions/record_bench_test`).send({
      testedOn: '2025-06-10',
      result: 'failure_confirmed',
      readings: {
        supplyVolts: 277,
        inputWatts: 19.8,
        driverOutputVolts: 48,
        driverOutputAmps: 0.44,
        strings: [{ volts: 48, darkLeds: 16 }],
      },
    });
    expect(bench.status).toBe(200);
    expect(bench.body.claim.stage).toBe('unit_received');
    const stored = await t.ds.getRepository(BenchTest).findOneByOrFail({ claimId: claim.id });
    expect(stored.evaluation.engineVersion).toBeTruthy();
    const after = await t.ds.getRepository(Claim).findOneByOrFail({ id: claim.id });
    // The filing evaluation is kept as it was (compared as stored JSON: -0 reads back as 0).
    expect(after.evaluation).toEqual(JSON.parse(JSON.stringify(claim.evaluation)));
    expect(stored.evaluation).not.toBe(null);
  });
});

describe('asking the installer', () => {
  it('the installer answers with a photo; the claim returns to review; the reviewer sees the file', async () => {
    const claim = await createClaimAt(t.ds, w, 'in_review', {
      filedById: installer.id,
      assigneeId: reviewer.id,
    });
    const asked = await asReviewer
      .post(`/api/claims/${claim.id}/actions/request_info`)
      .send({ message: 'Send a photo of the nameplate, please.' });
    expect(asked.status).toBe(200);
    expect(asked.body.workflow.openRequest.dueOn).toMatch(/^\d{4}-\d{2}-\d{2}$/);
    const png = await sharp({ create: { width: 40, height: 30, channels: 3, background: '#c0ffee' } })
      .png()
      .toBuffer();
    const uploads = `/api/claims/${claim.id}/conversation/uploads`;
    const up = await asInstaller
      .post(uploads)
      .field('purpose', 'nameplate')
      .attach('file', png, 'nameplate.png');
    expect(up.status).toBe(201);
    expect(up.body.attachment).toMatchObject({
      kind: 'photo',
      purpose: 'nameplate',
      contentType: 'image/png',
      name: 'nameplate.png',
    });
    // The unsent file is the installer's own: the reviewer sees no such collection, another organisation no claim.
    expect((await asInstaller.get(uploads)).body.items.map((a: { id: string }) => a.id)).toEqual([
      up.body.attachment.id,
    ]);
    expect((await asReviewer.get(uploads)).status).toBe(404);
    expect((await asReviewer.post(uploads).attach('file', png, 'x.png')).status).toBe(404);
    expect((await asForeign.post(uploads).attach('file', png, 'x.png')).status).toBe(404);
    // The old base64-in-JSON upload is gone.
    expect(
      (
        await asInstaller
          .post(`/api/claims/${claim.id}/conversation/files`)
          .send({ name: 'x.png', dataBase64: png.toString('base64') })
      ).status,
    ).toBe(404);
    const answered = await asInstaller
      .post(`/api/claims/${claim.id}/actions/answer_info`)
      .send({ message: 'Here it is.', attachmentIds: [up.body.attachment.id] });
    expect(answered.status).toBe(200);
    expect(answered.body.claim.stage).toBe('in_review');
    const wf = (await asReviewer.get(`/api/claims/${claim.id}/workflow`)).body;
    const answer = wf.messages.find((m: { kind: string }) => m.kind === 'info_answer');
    expect(answer.attachments).toHaveLength(1);
    const file = await download(asReviewer, answer.attachments[0].url);
    expect(file.status).toBe(200);
    expect(file.headers['content-type']).toBe('image/png');
    expect(file.headers['content-disposition']).toMatch(/^attachment/);
    expect((await download(asReviewer, answer.attachments[0].thumbnailUrl)).headers['content-type']).toBe(
      'image/webp',
    );
    expect((await asForeign.get(answer.attachments[0].url)).status).toBe(404);
    expect(wf.messages[0].answeredAt).toBeTruthy();
    const att = await t.ds.getRepository(Attachment).findOneByOrFail({ id: up.body.attachment.id });
    expect(att.ownerType).toBe('claim_message');
    expect(att.ownerId).toBe(answer.id);
    // Sent, it has left the pending uploads; once back in review, no more uploads.
    expect((await asInstaller.get(uploads)).body.items).toEqual([]);
    expect((await asInstaller.post(uploads).attach('file', png, 'late.png')).status).toBe(403);
  });

  it('a hostile file on an answer is refused and nothing is written: no row, no stored object, no audit, no move', async () => {
    const claim = await createClaimAt(t.ds, w, 'needs_info', {
      filedById: installer.id,
      assigneeId: reviewer.id,
    });
    const uploads = `/api/claims/${claim.id}/conversation/uploads`;
    const attachments = () =>
      t.ds
        .getRepository(Attachment)
        .count({ where: { ownerType: 'claim_message_draft', ownerId: claim.id } });
    const storedObjects = () => fs.readdirSync(storageDir, { recursive: true }).length;
    const audit = () => t.ds.getRepository(AuditEvent).count({ where: { actorUserId: installer.id } });
    const before = {
      claim: await snapshotClaim(t.ds, claim.id),
      audit: await audit(),
      objects: storedObjects(),
    };
    const refusals: [Buffer, string, number, string][] = [
      // An HTML page named like a photo: the bytes decide, not the name.
      [HTML_PAGE, 'nameplate.jpg', 415, 'attachment.unsupported_type'],
      // An SVG with a script: not an accepted type.
      [SVG_WITH_SCRIPT, 'label.svg', 415, 'attachment.unsupported_type'],
      // A PDF that runs JavaScript when opened.
      [pdfWithJavaScript(), 'invoice.pdf', 422, 'attachment.pdf_active_content'],
      // A decompression bomb: 900 megapixels in about 100 KB.
      [pixelFloodPng(), 'strings.png', 422, 'attachment.too_many_pixels'],
    ];
    for (const [bytes, name, status, code] of refusals) {
      const r = await asInstaller.post(uploads).attach('file', bytes, name);
      expect({ name, status: r.status, code: r.body.error?.code }).toEqual({ name, status, code });
    }
    // Base64 in JSON is no longer a way in.
    expect(
      (await asInstaller.post(uploads).send({ name: 'x.png', dataBase64: HTML_PAGE.toString('base64') }))
        .status,
    ).toBe(415);
    // One file per request, and no more than 15 MB.
    const two = await asInstaller
      .post(uploads)
      .attach('file', await pngImage(40, 30), 'a.png')
      .attach('file', await pngImage(40, 30), 'b.png');
    expect(two.status).toBe(413);
    const huge = await asInstaller.post(uploads).attach('file', Buffer.alloc(16 * MiB, 0xff), 'huge.jpg');
    expect(huge.status).toBe(413);
    expect(await attachments()).toBe(0);
    expect(storedObjects()).toBe(before.objects);
    expect(await audit()).toBe(before.audit);
    expect(await snapshotClaim(t.ds, claim.id)).toEqual(before.claim);
  });

  it('an answer takes only the sender’s own pending files of this claim, and at most 20 wait at once', async () => {
    const claim = await createClaimAt(t.ds, w, 'needs_info', {
      filedById: installer.id,
      assigneeId: reviewer.id,
    });
    const other = await createClaimAt(t.ds, w, 'needs_info', {
      filedById: installer.id,
      assigneeId: reviewer.id,
    });
    const png = await pngImage(40, 30);
    const elsewhere = await asInstaller
      .post(`/api/claims/${other.id}/conversation/uploads`)
      .attach('file', png, 'other.png');
    expect(elsewhere.status).toBe(201);
    const before = await snapshotClaim(t.ds, claim.id);
    const wrong = await asInstaller
      .post(`/api/claims/${claim.id}/actions/answer_info`)
      .send({ message: 'See the file.', attachmentIds: [elsewhere.body.attachment.id] });
    expect(wrong.status).toBe(400);
    expect(await snapshotClaim(t.ds, claim.id)).toEqual(before);
    const uploads = `/api/claims/${claim.id}/conversation/uploads`;
    for (let i = 0; i < 20; i++)
      expect((await asInstaller.post(uploads).attach('file', png, `p${i}.png`)).status).toBe(201);
    const full = await asInstaller.post(uploads).attach('file', png, 'p20.png');
    expect(full.status).toBe(409);
    expect(full.body.error.code).toBe('attachment.limit_reached');
    // A pending file can be taken back before the answer goes.
    const [first] = (await asInstaller.get(uploads)).body.items;
    expect((await asInstaller.delete(`${uploads}/${first.id}`)).status).toBe(204);
    expect((await asInstaller.get(uploads)).body.items).toHaveLength(19);
  });
});

describe('the outbox', () => {
  it('a rolled-back move sends nothing: no outbox row, no stage change, no decision', async () => {
    const claim = await createClaimAt(t.ds, w, 'in_review', { filedById: installer.id });
    const before = await snapshotClaim(t.ds, claim.id);
    const outbox = await outboxCount(t.ds);
    const service = createClaimActionsService({
      config: t.config,
      ds: t.ds,
      logger: createLogger('silent'),
      storage: createStorage(t.config),
      publicUrl: (p) => p,
    });
    const user = await t.ds
      .getRepository(Claim)
      .manager.findOneOrFail(await import('../../server/db/entities/user.entity').then((m) => m.User), {
        where: { id: reviewer.id },
        relations: { organization: true },
      });
    // The audit row is written last, after the e-mails were queued; an over-long request id makes it fail.
    await expect(
      service.perform(
        claim,
        user as never,
        'approve',
        { resolution: 'credit', amount: claim.evaluation!.computed.credit },
        { userId: reviewer.id, organizationId: manufacturer.id, requestId: 'x'.repeat(200) },
      ),
    ).rejects.toThrow();
    expect(await outboxCount(t.ds)).toBe(outbox);
    expect(await snapshotClaim(t.ds, claim.id)).toEqual(before);
  });

  it('every move tells the side that acts next; approval also tells the accountants', async () => {
    const claim = await createClaimAt(t.ds, w, 'in_review', { filedById: installer.id });
    await asReviewer
      .post(`/api/claims/${claim.id}/actions/approve`)
      .send({ resolution: 'credit', amount: claim.evaluation!.computed.credit })
      .expect(200);
    const rows = await t.ds.getRepository(OutboxMessage).find({ order: { id: 'DESC' }, take: 2 });
    const recipients = rows.map((r) => r.to).sort();
    expect(recipients).toEqual([accountant.email, installer.email].sort());
    expect(rows.every((r) => r.subject.includes(claim.number!))).toBe(true);
  });
});

describe('assigning', () => {
  it('a reviewer takes a claim, hands it on; an installer cannot; a stale version is a 409; refused changes nothing', async () => {
    const claim = await createClaimAt(t.ds, w, 'filed', { filedById: installer.id });
    const took = await asReviewer.post(`/api/claims/${claim.id}/assign`).send({ assigneeId: reviewer.id });
    expect(took.status).toBe(200);
    expect(took.body.claim.assigneeId).toBe(reviewer.id);
    const handed = await asReviewer
      .post(`/api/claims/${claim.id}/assign`)
      .set('If-Match', String(took.body.claim.version))
      .send({ assigneeId: reviewer2.id });
    expect(handed.status).toBe(200);
    const before = await snapshotClaim(t.ds, claim.id);
    const stale = await asReviewer
      .post(`/api/claims/${claim.id}/assign`)
      .set('If-Match', String(took.body.claim.version))
      .send({ assigneeId: null });
    expect([stale.status, stale.body.error.code]).toEqual([409, 'claim.changed']);
    const byInstaller = await asInstaller.post(`/api/claims/${claim.id}/assign`).send({ assigneeId: null });
    expect(byInstaller.status).toBe(403);
    const notAReviewer = await asReviewer
      .post(`/api/claims/${claim.id}/assign`)
      .send({ assigneeId: installer.id });
    expect(notAReviewer.status).toBe(400);
    expect(await snapshotClaim(t.ds, claim.id)).toEqual(before);
  });
});

describe('the reviewer’s queue', () => {
  it('filters by stage, verdict, assignee, search and amount; sorts; never shows drafts or other manufacturers’ claims', async () => {
    const m2 = await createOrganization(t.ds, 'manufacturer');
    const w2 = await createReviewWorld(t.ds, contractor, m2);
    const a = await createClaimAt(t.ds, w, 'filed', { filedAt: new Date(Date.now() - 20 * 86_400_000) });
    const b = await createClaimAt(t.ds, w, 'in_review', {
      verdict: 'excluded',
      assigneeId: reviewer.id,
      filedAt: new Date(Date.now() - 2 * 86_400_000),
    });
    const draft = await createClaimAt(t.ds, w, 'draft');
    const other = await createClaimAt(t.ds, w2, 'filed');
    const all = (await asReviewer.get('/api/review/queue?pageSize=200')).body;
    const ids = all.items.map((i: { id: string }) => i.id);
    expect(ids).toContain(a.id);
    expect(ids).toContain(b.id);
    expect(ids).not.toContain(draft.id);
    expect(ids).not.toContain(other.id);
    const byStage = (await asReviewer.get('/api/review/queue?stage=filed&pageSize=200')).body.items;
    expect(byStage.every((i: { stage: string }) => i.stage === 'filed')).toBe(true);
    const mine = (await asReviewer.get('/api/review/queue?assignee=me&verdict=excluded')).body.items;
    expect(mine.map((i: { id: string }) => i.id)).toContain(b.id);
    expect(mine.every((i: { verdict: string }) => i.verdict === 'excluded')).toBe(true);
    const found = (await asReviewer.get(`/api/review/queue?q=${encodeURIComponent(a.number!.slice(0, 12))}`))
      .body.items;
    expect(found.map((i: { id: string }) => i.id)).toContain(a.id);
    // A whole number as read over the phone (any case, spaces for dashes) is exactly that claim, counted alone.
    const spoken = a.number!.toLowerCase().replace(/-/g, ' ');
    const one = (await asReviewer.get(`/api/review/queue?q=${encodeURIComponent(spoken)}`)).body;
    expect(one.items.map((i: { id: string }) => i.id)).toEqual([a.id]);
    expect(one.total).toBe(1);
    const old = (await asReviewer.get('/api/review/queue?minAgeDays=10&pageSize=200')).body.items;
    expect(old.map((i: { id: string }) => i.id)).toContain(a.id);
    expect(old.map((i: { id: string }) => i.id)).not.toContain(b.id);
    const item = all.items.find((i: { id: string }) => i.id === a.id);
    expect(item).toMatchObject({ waitingOn: 'manufacturer', daysSinceFiling: 20 });
    const sorted = (await asReviewer.get('/api/review/queue?sort=-amount&pageSize=200')).body.items.map(
      (i: { expectedCredit: string }) => Number(i.expectedCredit),
    );
    expect(sorted).toEqual([...sorted].sort((x, y) => y - x));
    expect((await asReviewer.get('/api/review/queue?sort=bogus')).status).toBe(400);
    expect((await asInstaller.get('/api/review/queue')).status).toBe(403);
    const summary = (await asReviewer.get('/api/review/summary')).body;
    expect(summary.counts.filed).toBeGreaterThan(0);
    expect(summary.mine).toBeGreaterThan(0);
  });
});
