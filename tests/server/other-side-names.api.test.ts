import crypto from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createApprovedClaim } from '../support/credit-factories';
import { creditWorld } from '../support/credit-world';
import { claimWorld, createDraft, goodClaimFields } from '../support/claim-factories';
import { closeTestApp, createTestApp, type TestContext } from '../support/test-app';

// Issue 13, item 6: each side sees its own people by name and the other side's people only as their organisation
// (claim history already did; the credits and the claim's creator did not).
let t: TestContext;
beforeAll(async () => {
  t = await createTestApp();
});
afterAll(() => closeTestApp(t));

describe("the other side's people", () => {
  it("shows a contractor the manufacturer, never its accountant's name, on credit memos", async () => {
    const w = await creditWorld(t);
    const claim = await createApprovedClaim(t.ds, { manufacturer: w.mfr, contractor: w.contractor });
    const issued = await w.accountant.agent
      .post(`/api/claims/${claim.id}/credits`)
      .set('Idempotency-Key', crypto.randomUUID())
      .send({});
    expect(issued.status).toBe(201);
    const memoId = issued.body.creditMemo.id as string;
    const accountantName = w.accountant.user.name;

    const list = await w.installer.agent.get('/api/credits');
    expect(list.status).toBe(200);
    const mine = list.body.items.find((m: { id: string }) => m.id === memoId);
    expect(mine.issuedBy).toEqual({ id: null, name: w.mfr.name });
    expect(JSON.stringify(list.body)).not.toContain(accountantName);
    expect(JSON.stringify(list.body)).not.toContain(w.accountant.user.id);

    const one = await w.contractorAdmin.agent.get(`/api/credits/${memoId}`);
    expect(one.status).toBe(200);
    expect(one.body.creditMemo.issuedBy).toEqual({ id: null, name: w.mfr.name });
    expect(JSON.stringify(one.body)).not.toContain(accountantName);

    // The manufacturer's own people see who issued it.
    const own = await w.accountant.agent.get(`/api/credits/${memoId}`);
    expect(own.body.creditMemo.issuedBy).toEqual({ id: w.accountant.user.id, name: accountantName });
  });

  it("shows the manufacturer the contractor, never the installer, as a claim's creator", async () => {
    const w = await claimWorld(t);
    const draft = await createDraft(
      w.installer.agent,
      w.installation.id,
      goodClaimFields(w.installation.serials[0]),
    );
    const filed = await w.installer.agent.post(`/api/claims/${draft.id}/file`).send({});
    expect(filed.status).toBeLessThan(300);
    const own = await w.installer.agent.get(`/api/claims/${draft.id}`);
    expect(own.body.claim.createdBy).toEqual({ id: w.installer.user.id, name: w.installer.user.name });
    const theirs = await w.reviewer.agent.get(`/api/claims/${draft.id}`);
    expect(theirs.status).toBe(200);
    expect(theirs.body.claim.createdBy).toEqual({ id: null, name: w.conX.name });
    expect(JSON.stringify(theirs.body)).not.toContain(w.installer.user.name);
    expect(JSON.stringify(theirs.body)).not.toContain(w.installer.user.id);
  });
});
