import crypto from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { In } from 'typeorm';
import { isValidClaimNumber } from '../../shared/claims/claim-number';
import { CLAIM_STAGES } from '../../shared/schemas/claims';
import { ENGINE_VERSION } from '../../shared/engine';
import { seedDemo } from '../../server/db/seed/demo';
import { createStorage, type Storage } from '../../server/lib/storage';
import { Attachment } from '../../server/db/entities/attachment.entity';
import { AuditEvent } from '../../server/db/entities/audit-event.entity';
import { Claim } from '../../server/db/entities/claim.entity';
import { Organization } from '../../server/db/entities/organization.entity';
import { BenchTest } from '../../server/db/entities/bench-test.entity';
import { ClaimDocument } from '../../server/db/entities/claim-document.entity';
import { ClaimMessage } from '../../server/db/entities/claim-message.entity';
import { CreditMemo } from '../../server/db/entities/credit-memo.entity';
import { Decision } from '../../server/db/entities/decision.entity';
import { LedgerEntry } from '../../server/db/entities/ledger-entry.entity';
import { ReturnAuthorization } from '../../server/db/entities/return-authorization.entity';
import { DEMO_PASSWORD } from '../../server/db/seed/demo-accounts';
import { signIn } from '../support/factories';
import { closeTestApp, createTestApp, type TestContext } from '../support/test-app';

let t: TestContext;
let claims: Claim[];
let names: Map<string, string>;
let storage: Storage;
beforeAll(async () => {
  t = await createTestApp();
  storage = createStorage(t.config);
  await seedDemo(t.ds, { onlyIfEmpty: false, credits: { storage, config: t.config } });
  const orgs = await t.ds.getRepository(Organization).findBy({
    name: In(['Aldercrest Lighting', 'Veltra Luminaires', 'Harborview Electric', 'Copperline Electrical']),
  });
  names = new Map(orgs.map((o) => [o.id, o.name]));
  claims = await t.ds.getRepository(Claim).findBy({ contractorId: In(orgs.map((o) => o.id)) });
});
afterAll(() => closeTestApp(t));

/** The claims demo's own claims (the reliability history's have no filing in the audit trail). */
async function claimsDemo() {
  const filed = await t.ds
    .getRepository(AuditEvent)
    .findBy({ entityType: 'Claim', action: 'claim.filed', entityId: In(claims.map((c) => c.id)) });
  const ids = new Set(filed.map((a) => a.entityId));
  return claims.filter((c) => ids.has(c.id));
}

describe('the demo claims (API.md demo data)', () => {
  it('hold at least 60 claims over every stage, both manufacturers and both contractors', () => {
    expect(claims.length).toBeGreaterThanOrEqual(60);
    expect(new Set(claims.map((c) => c.stage))).toEqual(new Set(CLAIM_STAGES));
    expect(new Set(claims.map((c) => names.get(c.manufacturerId)))).toEqual(
      new Set(['Aldercrest Lighting', 'Veltra Luminaires']),
    );
    expect(new Set(claims.map((c) => names.get(c.contractorId)))).toEqual(
      new Set(['Harborview Electric', 'Copperline Electrical']),
    );
    for (const pair of [
      'Harborview Electric|Aldercrest Lighting',
      'Harborview Electric|Veltra Luminaires',
      'Copperline Electrical|Aldercrest Lighting',
      'Copperline Electrical|Veltra Luminaires',
    ]) {
      expect(claims.some((c) => `${names.get(c.contractorId)}|${names.get(c.manufacturerId)}` === pair)).toBe(
        true,
      );
    }
  });

  it('read like their story in time: started before filing, last changed at their last stage move', async () => {
    // `claims` was read before this ran; read the times again (the seed settles them at its end).
    const rows = await t.ds.getRepository(Claim).findBy({ id: In(claims.map((c) => c.id)) });
    for (const c of rows) {
      if (c.filedAt) expect(c.createdAt.getTime(), c.id).toBeLessThanOrEqual(c.filedAt.getTime());
      expect(c.updatedAt.getTime(), c.id).toBe(
        Math.max(c.stageChangedAt.getTime(), c.filedAt?.getTime() ?? 0),
      );
    }
    // So an installer's "newest change first" begins with claims that moved lately, not three-year-old history.
    const ines = await signIn(t.request(), 'ines@harborview.test', DEMO_PASSWORD);
    const first = (await ines.get('/api/claims?pageSize=10&sort=-updatedAt')).body.items as {
      updatedAt: string;
    }[];
    const oldest = rows.map((c) => c.updatedAt.getTime()).sort((a, b) => b - a)[
      Math.min(40, rows.length - 1)
    ];
    for (const c of first) expect(new Date(c.updatedAt).getTime()).toBeGreaterThanOrEqual(oldest);
  });

  it('have at least 5 approved and not yet credited claims for each manufacturer', () => {
    for (const m of ['Aldercrest Lighting', 'Veltra Luminaires']) {
      expect(
        claims.filter((c) => c.stage === 'approved' && names.get(c.manufacturerId) === m).length,
      ).toBeGreaterThanOrEqual(5);
    }
  });

  it('every filed claim has a valid number, the engine’s evaluation with its version, and an audit trail to its stage', async () => {
    const filed = claims.filter((c) => c.stage !== 'draft');
    for (const c of filed) {
      expect(isValidClaimNumber(c.number!)).toBe(true);
      expect(c.evaluation?.engineVersion).toBe(ENGINE_VERSION);
      expect(c.verdict).toBe(c.evaluation!.verdict);
    }
    expect(new Set(filed.map((c) => c.verdict)).size).toBeGreaterThanOrEqual(2);
    const credited = (await claimsDemo()).find((c) => c.stage === 'credited')!; // credited through the credits service
    const trail = (
      await t.ds
        .getRepository(AuditEvent)
        .find({ where: { entityType: 'Claim', entityId: credited.id }, order: { id: 'ASC' } })
    ).map((a) => a.action);
    expect(trail).toEqual([
      'claim.created',
      'claim.filed',
      'claim.review_started',
      'claim.approved',
      'claim.credited',
    ]);
  });

  it('decided claims carry their decision in force and a stored letter; questions, returns and credits their rows', async () => {
    const claims = await claimsDemo();
    const decided = claims.filter((c) => ['approved', 'denied', 'credited', 'closed'].includes(c.stage));
    const decisions = await t.ds
      .getRepository(Decision)
      .findBy({ currentClaimId: In(decided.map((c) => c.id)) });
    expect(decisions).toHaveLength(decided.length);
    const letters = await t.ds
      .getRepository(ClaimDocument)
      .findBy({ id: In(decisions.map((d) => d.letterId!)), kind: 'letter' });
    expect(letters).toHaveLength(decided.length);
    for (const d of decisions) {
      const c = decided.find((x) => x.id === d.claimId)!;
      expect(d.outcome).toBe(c.stage === 'approved' || c.stage === 'credited' ? 'approved' : 'denied');
    }
    for (const c of claims.filter((x) => x.stage === 'needs_info')) {
      const open = await t.ds.getRepository(ClaimMessage).findBy({ claimId: c.id, kind: 'info_request' });
      expect(open).toHaveLength(1);
      expect(open[0].answeredAt).toBeNull();
    }
    const returning = claims.filter((x) => x.stage === 'return_requested' || x.stage === 'unit_received');
    const ras = await t.ds
      .getRepository(ReturnAuthorization)
      .findBy({ claimId: In(returning.map((c) => c.id)) });
    expect(ras).toHaveLength(returning.length);
    for (const ra of ras) expect(ra.packingSlipId).toBeTruthy();
    const received = claims.filter((x) => x.stage === 'unit_received');
    const benches = await t.ds.getRepository(BenchTest).findBy({ claimId: In(received.map((c) => c.id)) });
    expect(benches.length).toBeGreaterThan(0);
    for (const c of claims.filter((x) => x.stage === 'credited')) {
      expect(await t.ds.getRepository(CreditMemo).countBy({ creditedClaimId: c.id })).toBe(1);
      const memo = await t.ds.getRepository(CreditMemo).findOneByOrFail({ creditedClaimId: c.id });
      expect(await t.ds.getRepository(LedgerEntry).countBy({ memoId: memo.id })).toBe(1);
      expect(await t.ds.getRepository(AuditEvent).countBy({ entityId: c.id, action: 'claim.credited' })).toBe(
        1,
      );
    }
  });

  it('a demo letter downloads as a PDF for the reviewer and the installer', async () => {
    const claims = await claimsDemo();
    const c = claims.find(
      (x) => x.stage === 'approved' && names.get(x.manufacturerId) === 'Aldercrest Lighting',
    )!;
    const d = await t.ds.getRepository(Decision).findOneByOrFail({ currentClaimId: c.id });
    const installer =
      names.get(c.contractorId) === 'Harborview Electric' ? 'ines@harborview.test' : 'omar@copperline.test';
    for (const email of ['rhea@aldercrest.test', installer]) {
      const agent = await signIn(t.request(), email, DEMO_PASSWORD);
      const wf = await agent.get(`/api/claims/${c.id}/workflow`);
      expect(wf.status).toBe(200);
      const res = await agent.get(`/api/claims/${c.id}/documents/${d.letterId}`).buffer(true);
      expect(res.status).toBe(200);
      expect(res.headers['content-type']).toContain('application/pdf');
    }
  });
});

describe('the demo claims’ photos and invoices (issue 5, demo scenario)', () => {
  const INSTALLER: Record<string, string> = {
    'Harborview Electric': 'ines@harborview.test',
    'Copperline Electrical': 'omar@copperline.test',
  };
  const REVIEWER: Record<string, string> = {
    'Aldercrest Lighting': 'rhea@aldercrest.test',
    'Veltra Luminaires': 'theo@veltra.test',
  };
  const other = (m: Record<string, string>, name: string) => Object.entries(m).find(([k]) => k !== name)![1];
  const filesOf = async (ids: string[]) => {
    const rows = await t.ds.getRepository(Attachment).findBy({ ownerType: 'claim', ownerId: In(ids) });
    const by = new Map<string, Attachment[]>();
    for (const a of rows) by.set(a.ownerId!, [...(by.get(a.ownerId!) ?? []), a]);
    return by;
  };

  it('every filed demo claim has its nameplate, failure and site photos, most an invoice, as its engine counted them', async () => {
    const filed = (await claimsDemo()).filter((c) => c.stage !== 'draft');
    const files = await filesOf(filed.map((c) => c.id));
    let withInvoice = 0;
    for (const c of filed) {
      const list = files.get(c.id) ?? [];
      const photos = list.filter((a) => a.kind === 'photo');
      expect(new Set(photos.map((a) => a.purpose))).toEqual(new Set(['nameplate', 'failure', 'site']));
      for (const p of photos)
        expect([p.contentType, p.width, p.height, p.thumbnailKey !== null]).toEqual([
          'image/jpeg',
          800,
          600,
          true,
        ]);
      const invoices = list.filter((a) => a.purpose === 'proof_of_purchase');
      for (const d of invoices)
        expect([d.kind, d.contentType, d.thumbnailKey]).toEqual(['document', 'application/pdf', null]);
      if (invoices.length) withInvoice++;
      // The evaluation stored at filing counted exactly these files.
      for (const f of c.evaluation!.findings) {
        const v = f.values as Record<string, unknown>;
        if (typeof v.photos === 'number') expect(v.photos).toBe(photos.length);
        if (typeof v.proofOfPurchase === 'boolean') expect(v.proofOfPurchase).toBe(invoices.length > 0);
      }
      // Uploaded by the claim's installer, before it was filed.
      for (const a of list) {
        expect(a.uploadedById).toBe(c.createdById);
        expect(a.organizationId).toBe(c.contractorId);
        expect(a.createdAt.getTime()).toBeLessThan(c.filedAt!.getTime());
      }
    }
    expect(withInvoice).toBeGreaterThan(filed.length / 2);
    expect(withInvoice).toBeLessThan(filed.length);
    // The reliability history's claims still in review carry theirs too.
    const open = claims.filter(
      (c) => ['filed', 'in_review', 'needs_info'].includes(c.stage) && !filed.some((f) => f.id === c.id),
    );
    expect(open.length).toBeGreaterThan(0);
    const openFiles = await filesOf(open.map((c) => c.id));
    for (const c of open)
      expect((openFiles.get(c.id) ?? []).map((a) => a.purpose).sort()).toEqual([
        'failure',
        'nameplate',
        'proof_of_purchase',
      ]);
  });

  it('each claim has its own rows and stored objects (original and thumbnail), each with its audit row', async () => {
    const all = await t.ds
      .getRepository(Attachment)
      .findBy({ ownerType: 'claim', ownerId: In(claims.map((c) => c.id)) });
    expect(all.length).toBeGreaterThan(150);
    const keys = all.flatMap((a) => [a.storageKey, a.thumbnailKey].filter((k): k is string => !!k));
    expect(new Set(keys).size).toBe(keys.length);
    for (const key of keys) expect(await storage.exists(key), key).toBe(true);
    // The bytes are the re-encoded ones the row describes.
    const sample = all.filter((_, i) => i % 37 === 0);
    for (const a of sample) {
      const body = await storage.getBuffer(a.storageKey);
      expect(body.length).toBe(a.byteSize);
      expect(crypto.createHash('sha256').update(body).digest('hex')).toBe(a.sha256);
    }
    const audited = await t.ds
      .getRepository(AuditEvent)
      .findBy({ entityType: 'Attachment', action: 'attachment.added', entityId: In(all.map((a) => a.id)) });
    expect(audited).toHaveLength(all.length);
  });

  it('a demo photo and invoice download for the claim’s installer and reviewer, and are a 404 for the other contractor and manufacturer', async () => {
    const c =
      (await claimsDemo()).find(
        (x) => x.stage === 'in_review' && names.get(x.manufacturerId) === 'Veltra Luminaires',
      ) ?? (await claimsDemo()).find((x) => x.stage === 'in_review')!;
    const list = (await filesOf([c.id])).get(c.id)!;
    const photo = list.find((a) => a.purpose === 'failure')!;
    const contractor = names.get(c.contractorId)!;
    const manufacturer = names.get(c.manufacturerId)!;
    for (const email of [INSTALLER[contractor], REVIEWER[manufacturer]]) {
      const agent = await signIn(t.request(), email, DEMO_PASSWORD);
      const detail = await agent.get(`/api/claims/${c.id}`);
      expect(detail.status).toBe(200);
      expect(detail.body.claim.attachments.map((a: { id: string }) => a.id).sort()).toEqual(
        list.map((a) => a.id).sort(),
      );
      const res = await agent.get(`/api/claims/${c.id}/attachments/${photo.id}/content`).buffer(true);
      expect([res.status, res.headers['content-type'], res.headers['x-content-type-options']]).toEqual([
        200,
        'image/jpeg',
        'nosniff',
      ]);
      expect(res.headers['content-disposition']).toMatch(/^attachment;/);
      expect(Buffer.compare(res.body as Buffer, await storage.getBuffer(photo.storageKey))).toBe(0);
      const thumb = await agent.get(`/api/claims/${c.id}/attachments/${photo.id}/thumbnail`).buffer(true);
      expect([thumb.status, thumb.headers['content-type']]).toEqual([200, 'image/webp']);
      const invoice = list.find((a) => a.purpose === 'proof_of_purchase');
      if (invoice) {
        const pdf = await agent.get(`/api/claims/${c.id}/attachments/${invoice.id}/content`).buffer(true);
        expect([pdf.status, pdf.headers['content-type']]).toEqual([200, 'application/pdf']);
      }
    }
    for (const email of [other(INSTALLER, contractor), other(REVIEWER, manufacturer)]) {
      const agent = await signIn(t.request(), email, DEMO_PASSWORD);
      expect((await agent.get(`/api/claims/${c.id}/attachments/${photo.id}/content`)).status).toBe(404);
      expect((await agent.get(`/api/claims/${c.id}/attachments`)).status).toBe(404);
    }
  });

  it('a demo draft has its nameplate photo so far', async () => {
    const drafts = claims.filter((c) => c.stage === 'draft');
    expect(drafts.length).toBeGreaterThan(0);
    const files = await filesOf(drafts.map((c) => c.id));
    for (const d of drafts) expect((files.get(d.id) ?? []).map((a) => a.purpose)).toEqual(['nameplate']);
  });
});
