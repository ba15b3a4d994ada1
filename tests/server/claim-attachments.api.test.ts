import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import exifr from 'exifr';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Attachment } from '../../server/db/entities/attachment.entity';
import { Claim } from '../../server/db/entities/claim.entity';
import { claimWorld, createDraft, goodClaimFields } from '../support/claim-factories';
import { closeTestApp, createTestApp, type TestContext } from '../support/test-app';
import { HTML_PAGE, photoWithExif, pngImage, receiptPdf } from '../support/upload-fixtures';

let t: TestContext;
let storageDir: string;
beforeAll(async () => {
  storageDir = fs.mkdtempSync(path.join(os.tmpdir(), 'lumenproof-claim-files-'));
  t = await createTestApp({ STORAGE_DIR: storageDir });
});
afterAll(async () => {
  await closeTestApp(t);
  fs.rmSync(storageDir, { recursive: true, force: true });
});

const rows = (claimId: string) =>
  t.ds.getRepository(Attachment).find({ where: { ownerType: 'claim', ownerId: claimId } });

function binary(
  res: NodeJS.ReadableStream & { setEncoding: (e: string) => void },
  cb: (err: Error | null, body: Buffer) => void,
) {
  const chunks: Buffer[] = [];
  res.on('data', (c: Buffer) => chunks.push(c));
  res.on('end', () => cb(null, Buffer.concat(chunks)));
}

describe('claim attachments', () => {
  it('photos and proof of purchase count as the engine’s evidence when filing; the stored photo carries no location', async () => {
    const w = await claimWorld(t);
    // The driver cycles: a failure that qualifies (ENGINE.md), with readings in range.
    const draft = await createDraft(
      w.installer.agent,
      w.installation.id,
      goodClaimFields(w.installation.serials[0], { symptoms: ['cycling'] }),
    );
    const base = `/api/claims/${draft.id}/attachments`;
    const nameplate = await w.installer.agent
      .post(base)
      .field('purpose', 'nameplate')
      .attach('file', await photoWithExif(), 'nameplate.jpg');
    expect(nameplate.status).toBe(201);
    expect(
      (
        await w.installer.agent
          .post(base)
          .field('purpose', 'failure')
          .attach('file', await pngImage(), 'dark-strings.png')
      ).status,
    ).toBe(201);
    expect(
      (
        await w.installer.agent
          .post(base)
          .field('purpose', 'proof_of_purchase')
          .attach('file', await receiptPdf(), 'invoice.pdf')
      ).status,
    ).toBe(201);

    const content = await w.installer.agent
      .get(nameplate.body.attachment.contentUrl)
      .buffer(true)
      .parse(binary as never);
    expect(content.status).toBe(200);
    expect(await exifr.gps(content.body as Buffer).catch(() => undefined)).toBeUndefined();

    const detail = await w.installer.agent.get(`/api/claims/${draft.id}`);
    expect(detail.body.claim.attachments.map((a: { purpose: string }) => a.purpose)).toEqual([
      'nameplate',
      'failure',
      'proof_of_purchase',
    ]);
    const filed = await w.installer.agent.post(`/api/claims/${draft.id}/file`).send({});
    // Two photos (the policy asks for 2) and proof of purchase: nothing left for a person to chase.
    expect(
      filed.body.claim.evaluation.findings.filter(
        (f: { category: string; effect: string }) => f.category === 'evidence' && f.effect !== 'none',
      ),
    ).toEqual([]);
    expect(
      filed.body.claim.evaluation.findings.filter((f: { effect: string }) => f.effect !== 'none'),
    ).toEqual([]);
    expect(filed.body.claim.evaluation.verdict).toBe('covered');
    // After filing, files are not removed any more.
    expect((await w.installer.agent.delete(`${base}/${nameplate.body.attachment.id}`)).status).toBe(403);
  });

  it('takes at most 20 files on one claim: the 21st is refused and nothing of it is kept', async () => {
    const w = await claimWorld(t);
    const draft = await createDraft(w.installer.agent, w.installation.id);
    const base = `/api/claims/${draft.id}/attachments`;
    const png = await pngImage(40, 30);
    for (let i = 0; i < 20; i++) {
      expect(
        (await w.installer.agent.post(base).field('purpose', 'site').attach('file', png, `site-${i}.png`))
          .status,
      ).toBe(201);
    }
    const filesBefore = fs.readdirSync(storageDir, { recursive: true }).length;
    const r = await w.installer.agent.post(base).field('purpose', 'site').attach('file', png, 'site-21.png');
    expect(r.status).toBe(409);
    expect(r.body.error.code).toBe('attachment.limit_reached');
    expect(await rows(draft.id)).toHaveLength(20);
    expect(fs.readdirSync(storageDir, { recursive: true }).length).toBe(filesBefore);
  });

  it('refuses a hostile file on a claim and keeps nothing', async () => {
    const w = await claimWorld(t);
    const draft = await createDraft(w.installer.agent, w.installation.id);
    const r = await w.installer.agent
      .post(`/api/claims/${draft.id}/attachments`)
      .attach('file', HTML_PAGE, 'photo.jpg');
    expect(r.status).toBe(415);
    expect(await rows(draft.id)).toHaveLength(0);
  });

  it('downloads only for users allowed to see the claim: another contractor or manufacturer gets 404, the claim’s manufacturer once filed', async () => {
    const w = await claimWorld(t);
    const draft = await createDraft(
      w.installer.agent,
      w.installation.id,
      goodClaimFields(w.installation.serials[0]),
    );
    const base = `/api/claims/${draft.id}/attachments`;
    const up = await w.installer.agent
      .post(base)
      .field('purpose', 'failure')
      .attach('file', await pngImage(), 'failure.png');
    const url = up.body.attachment.contentUrl as string;
    for (const outsider of [w.otherInstaller, w.otherReviewer, w.reviewer]) {
      expect((await outsider.agent.get(url)).status).toBe(404);
      expect((await outsider.agent.get(base)).status).toBe(404);
      expect((await outsider.agent.post(base).attach('file', await pngImage(), 'x.png')).status).toBe(404);
    }
    await w.installer.agent.post(`/api/claims/${draft.id}/file`).send({});
    expect((await w.reviewer.agent.get(url)).status).toBe(200);
    expect((await w.reviewer.agent.post(base).attach('file', await pngImage(), 'x.png')).status).toBe(403);
    for (const outsider of [w.otherInstaller, w.otherReviewer])
      expect((await outsider.agent.get(url)).status).toBe(404);
    expect(await rows(draft.id)).toHaveLength(1);
  });

  it('a deleted draft takes its files with it', async () => {
    const w = await claimWorld(t);
    const draft = await createDraft(w.installer.agent, w.installation.id);
    await w.installer.agent
      .post(`/api/claims/${draft.id}/attachments`)
      .attach('file', await pngImage(), 'x.png');
    expect((await w.installer.agent.delete(`/api/claims/${draft.id}`)).status).toBe(204);
    expect(await t.ds.getRepository(Claim).countBy({ id: draft.id })).toBe(0);
    expect(await rows(draft.id)).toHaveLength(0);
  });
});
