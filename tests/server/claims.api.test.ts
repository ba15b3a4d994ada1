import crypto from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { In } from 'typeorm';
import { CLAIM_NUMBER_PATTERN, isValidClaimNumber } from '../../shared/claims/claim-number';
import { ENGINE_VERSION } from '../../shared/engine';
import { AuditEvent } from '../../server/db/entities/audit-event.entity';
import { Claim } from '../../server/db/entities/claim.entity';
import { IdempotencyKey } from '../../server/db/entities/idempotency-key.entity';
import { OutboxMessage } from '../../server/db/entities/outbox-message.entity';
import { claimWorld, createDraft, daysAgo, goodClaimFields, member } from '../support/claim-factories';
import { closeTestApp, createTestApp, type TestContext } from '../support/test-app';

let t: TestContext;
beforeAll(async () => {
  t = await createTestApp();
});
afterAll(() => closeTestApp(t));

const claimRow = (id: string) => t.ds.getRepository(Claim).findOneByOrFail({ id });
const auditActions = async (id: string) =>
  (
    await t.ds
      .getRepository(AuditEvent)
      .find({ where: { entityType: 'Claim', entityId: id }, order: { id: 'ASC' } })
  ).map((a) => a.action);
const outboxTo = (emails: string[]) => t.ds.getRepository(OutboxMessage).find({ where: { to: In(emails) } });

const newKey = () => `form-${crypto.randomUUID()}`;
const keysOf = (userId: string, key: string) => t.ds.getRepository(IdempotencyKey).findBy({ userId, key });
const draftsOn = (installationId: string) => t.ds.getRepository(Claim).findBy({ installationId });

describe('starting a draft with an Idempotency-Key (a double tap on “File a claim”)', () => {
  it('two requests at once with one key make one draft; both answer it, the second replayed', async () => {
    const w = await claimWorld(t);
    const key = newKey();
    const send = () =>
      w.installer.agent
        .post('/api/claims')
        .set('Idempotency-Key', key)
        .send({ installationId: w.installation.id });
    const [a, b] = await Promise.all([send(), send()]);
    expect([a.status, b.status]).toEqual([201, 201]);
    expect(a.body.claim.id).toBe(b.body.claim.id);
    expect([a.headers['idempotent-replayed'], b.headers['idempotent-replayed']].sort()).toEqual([
      'true',
      undefined,
    ]);
    expect(await draftsOn(w.installation.id)).toHaveLength(1);
    expect(await auditActions(a.body.claim.id)).toEqual(['claim.created']);
    const [row] = await keysOf(w.installer.user.id, key);
    expect(row).toMatchObject({
      route: 'POST /claims',
      status: 'done',
      responseStatus: 201,
      responseBody: { claimId: a.body.claim.id },
    });
    // A later retry (the answer lost on a bad connection) still answers the same draft, as it is now.
    await w.installer.agent
      .patch(`/api/claims/${a.body.claim.id}`)
      .send({ version: 1, narrative: 'Typed on the lift before the retry.' });
    const later = await send();
    expect(later.status).toBe(201);
    expect(later.body.claim).toMatchObject({
      id: a.body.claim.id,
      version: 2,
      narrative: 'Typed on the lift before the retry.',
    });
    expect(await draftsOn(w.installation.id)).toHaveLength(1);
  });

  it('the same key with another body is a 422 with a clear message, and writes nothing', async () => {
    const w = await claimWorld(t);
    const key = newKey();
    const first = await w.installer.agent
      .post('/api/claims')
      .set('Idempotency-Key', key)
      .send({ installationId: w.installation.id });
    expect(first.status).toBe(201);
    const audits = () => t.ds.getRepository(AuditEvent).countBy({ actorUserId: w.installer.user.id });
    const before = await audits();
    const other = await w.installer.agent
      .post('/api/claims')
      .set('Idempotency-Key', key)
      .send({ installationId: w.installation.id, narrative: 'A different claim under the same key.' });
    expect(other.status).toBe(422);
    expect(other.body.error).toMatchObject({
      code: 'idempotency.key_reused',
      message:
        'This Idempotency-Key was already used for a different request. Use a new key for a new request.',
    });
    expect(await draftsOn(w.installation.id)).toHaveLength(1);
    expect((await claimRow(first.body.claim.id)).narrative).toBe('');
    expect(await audits()).toBe(before);
    expect(await keysOf(w.installer.user.id, key)).toHaveLength(1);
  });

  it('a key is the user’s own: another user sending it starts a draft of their own, never sees the first', async () => {
    const w = await claimWorld(t);
    const colleague = await member(t, w.conX, ['installer']);
    const key = newKey();
    const mine = await w.installer.agent
      .post('/api/claims')
      .set('Idempotency-Key', key)
      .send({ installationId: w.installation.id });
    const theirs = await colleague.agent
      .post('/api/claims')
      .set('Idempotency-Key', key)
      .send({ installationId: w.installation.id });
    expect([mine.status, theirs.status]).toEqual([201, 201]);
    expect(theirs.body.claim.id).not.toBe(mine.body.claim.id);
    expect(theirs.headers['idempotent-replayed']).toBeUndefined();
    expect(await draftsOn(w.installation.id)).toHaveLength(2);
    // Another contractor's installer with the key: the installation is not theirs, a 404 like a missing one.
    const stranger = await w.otherInstaller.agent
      .post('/api/claims')
      .set('Idempotency-Key', key)
      .send({ installationId: w.installation.id });
    expect(stranger.status).toBe(404);
    expect(await keysOf(w.otherInstaller.user.id, key)).toHaveLength(0);
  });

  it('a malformed key is a 400 naming the header, and nothing is written; without a key each request starts a draft', async () => {
    const w = await claimWorld(t);
    const bad = await w.installer.agent
      .post('/api/claims')
      .set('Idempotency-Key', 'short')
      .send({ installationId: w.installation.id });
    expect(bad.status).toBe(400);
    expect(bad.body.error.details).toEqual([
      {
        path: 'idempotency-key',
        message: 'The Idempotency-Key header must be 8 to 255 printable characters.',
      },
    ]);
    expect(await draftsOn(w.installation.id)).toHaveLength(0);
    await createDraft(w.installer.agent, w.installation.id);
    await createDraft(w.installer.agent, w.installation.id);
    expect(await draftsOn(w.installation.id)).toHaveLength(2);
  });

  it('a refused request keeps no key: after the refusal the same key can still start the draft', async () => {
    const w = await claimWorld(t);
    const key = newKey();
    const refused = await w.installer.agent
      .post('/api/claims')
      .set('Idempotency-Key', key)
      .send({ installationId: w.installation.id, units: 0 });
    expect(refused.status).toBe(400);
    expect(await keysOf(w.installer.user.id, key)).toHaveLength(0);
    const ok = await w.installer.agent
      .post('/api/claims')
      .set('Idempotency-Key', key)
      .send({ installationId: w.installation.id });
    expect(ok.status).toBe(201);
  });
});

describe('filing with an Idempotency-Key', () => {
  it('keeps the key with the answer: the same key replays it, another body under it is a 422 and files nothing twice', async () => {
    const w = await claimWorld(t);
    const draft = await createDraft(
      w.installer.agent,
      w.installation.id,
      goodClaimFields(w.installation.serials[0]),
    );
    const key = newKey();
    const file = (body: object) =>
      w.installer.agent.post(`/api/claims/${draft.id}/file`).set('Idempotency-Key', key).send(body);
    const [a, b] = await Promise.all([file({ version: draft.version }), file({ version: draft.version })]);
    expect([a.status, b.status]).toEqual([200, 200]);
    expect([a.body.replayed, b.body.replayed].sort()).toEqual([false, true]);
    expect(a.body.claim.number).toBe(b.body.claim.number);
    const [row] = await keysOf(w.installer.user.id, key);
    expect(row).toMatchObject({
      route: 'POST /claims/:id/file',
      status: 'done',
      responseStatus: 200,
      responseBody: { claimId: draft.id, replayed: false },
    });
    const again = await file({ version: draft.version });
    expect([again.status, again.headers['idempotent-replayed'], again.body.replayed]).toEqual([
      200,
      'true',
      true,
    ]);
    const other = await file({});
    expect(other.status).toBe(422);
    expect(other.body.error.code).toBe('idempotency.key_reused');
    expect((await auditActions(draft.id)).filter((x) => x === 'claim.filed')).toHaveLength(1);
    expect(await outboxTo([w.installer.user.email])).toHaveLength(1);
  });

  it('a refused filing keeps no key, so the same key files once the draft is complete', async () => {
    const w = await claimWorld(t);
    const draft = await createDraft(w.installer.agent, w.installation.id);
    const key = newKey();
    const refused = await w.installer.agent
      .post(`/api/claims/${draft.id}/file`)
      .set('Idempotency-Key', key)
      .send({});
    expect(refused.status).toBe(422);
    expect(await keysOf(w.installer.user.id, key)).toHaveLength(0);
    await w.installer.agent
      .patch(`/api/claims/${draft.id}`)
      .send({ version: draft.version, ...goodClaimFields(w.installation.serials[0]) });
    const filed = await w.installer.agent
      .post(`/api/claims/${draft.id}/file`)
      .set('Idempotency-Key', key)
      .send({});
    expect([filed.status, filed.body.replayed, filed.body.claim.stage]).toEqual([200, false, 'filed']);
  });
});

describe('drafts', () => {
  it('an installer starts a draft from an installation; it carries the installation, product and policy version in force', async () => {
    const w = await claimWorld(t);
    const r = await w.installer.agent.post('/api/claims').send({ installationId: w.installation.id });
    expect(r.status).toBe(201);
    expect(r.body.claim).toMatchObject({
      stage: 'draft',
      number: null,
      contractor: { id: w.conX.id },
      manufacturer: { id: w.mfrA.id },
      product: { id: w.product.id },
      installation: { id: w.installation.id },
      version: 1,
      evaluation: null,
    });
    expect(r.body.claim.engineContext.product).toMatchObject({
      ledStrings: 12,
      ledsPerString: 16,
      inputVoltage: { min: 120, max: 277 },
      dimmable: true,
    });
    expect(r.body.claim.engineContext.policy).toMatchObject({
      termMonths: 60,
      unitCredit: '96.00',
      darkLedFailurePercent: 10,
    });
    expect(r.body.claim.filingIssues.map((i: { path: string }) => i.path)).toEqual(
      expect.arrayContaining(['serials', 'failedOn', 'symptoms', 'narrative']),
    );
    const row = await claimRow(r.body.claim.id);
    expect(row.policyVersionId).toBe(w.policyVersion.id);
    expect(await auditActions(row.id)).toEqual(['claim.created']);
  });

  it('refuses a draft on another contractor’s installation as if it did not exist, and a manufacturer with 403', async () => {
    const w = await claimWorld(t);
    const other = await w.otherInstaller.agent
      .post('/api/claims')
      .send({ installationId: w.installation.id });
    expect(other.status).toBe(404);
    const missing = await w.installer.agent
      .post('/api/claims')
      .send({ installationId: '00000000-0000-4000-8000-000000000000' });
    expect(missing.status).toBe(404);
    expect(other.body.error.message).toBe(missing.body.error.message);
    const mfr = await w.reviewer.agent.post('/api/claims').send({ installationId: w.installation.id });
    expect(mfr.status).toBe(403);
    expect(await t.ds.getRepository(Claim).countBy({ installationId: w.installation.id })).toBe(0);
  });

  it('validates every field with a clear message and changes nothing', async () => {
    const w = await claimWorld(t);
    const draft = await createDraft(w.installer.agent, w.installation.id);
    const before = await claimRow(draft.id);
    const r = await w.installer.agent.patch(`/api/claims/${draft.id}`).send({
      version: draft.version,
      units: 0,
      failedOn: '2025-02-30',
      symptoms: ['dark', 'smoking'],
      serials: ['A1', 'a1'],
      measurements: {
        supplyVolts: -3,
        inputWatts: 'lots',
        powerFactor: 93,
        driverOutputVolts: 5000,
        driverOutputAmps: 101,
        strings: [{ volts: 45, amps: 0.037, darkLeds: 1.5 }],
      },
      observations: { debrisIngress: 'yes' },
      narrative: 'x'.repeat(5001),
      colour: 'red',
    });
    expect(r.status).toBe(400);
    expect(r.body.error.code).toBe('validation.failed');
    const byPath = Object.fromEntries(
      r.body.error.details.map((d: { path: string; message: string }) => [d.path, d.message]),
    );
    expect(byPath).toMatchObject({
      units: 'At least one unit failed.',
      failedOn: 'The failure date is not a calendar date.',
      'symptoms.1': 'Pick a listed symptom.',
      serials: 'Each serial number once.',
      'measurements.supplyVolts': 'The supply voltage cannot be negative.',
      'measurements.inputWatts': 'Enter the input power as a number of W.',
      'measurements.powerFactor': 'The power factor is at most 1 (a reading like 93 % is 0.93).',
      'measurements.driverOutputVolts':
        "The driver output voltage must be at most 2,000 V: check the meter's range.",
      'measurements.driverOutputAmps':
        "The driver output current must be at most 100 A: check the meter's range.",
      'measurements.strings.0.darkLeds': 'Enter the dark LEDs as a whole number.',
      'observations.debrisIngress': 'Say yes or no: debris or insects inside.',
      narrative: 'The narrative has at most 5,000 characters.',
    });
    expect(r.body.error.details.some((d: { message: string }) => /colour/.test(d.message))).toBe(true);
    const after = await claimRow(draft.id);
    expect(after.version).toBe(before.version);
    expect(after.updatedAt.getTime()).toBe(before.updatedAt.getTime());
  });

  it('saves as the user goes: each autosave bumps the version; a stale version is a 409 that changes nothing', async () => {
    const w = await claimWorld(t);
    const draft = await createDraft(w.installer.agent, w.installation.id);
    const a = await w.installer.agent
      .patch(`/api/claims/${draft.id}`)
      .send({ version: 1, narrative: 'Started on the lift' });
    expect(a.status).toBe(200);
    expect(a.body.claim).toMatchObject({ version: 2, narrative: 'Started on the lift' });
    // Another device still holding version 1.
    const stale = await w.installer.agent
      .patch(`/api/claims/${draft.id}`)
      .send({ version: 1, narrative: 'From the phone' });
    expect(stale.status).toBe(409);
    expect(stale.body.error.code).toBe('claim.changed');
    const row = await claimRow(draft.id);
    expect(row).toMatchObject({ version: 2, narrative: 'Started on the lift' });
    // The desk carries on from version 2; the measurements object is replaced whole.
    const b = await w.installer.agent
      .patch(`/api/claims/${draft.id}`)
      .send({ version: 2, measurements: { supplyVolts: 118.4 } });
    expect(b.body.claim).toMatchObject({ version: 3, measurements: { supplyVolts: 118.4 } });
    expect(await auditActions(draft.id)).toEqual(['claim.created', 'claim.updated', 'claim.updated']);
  });

  it('a draft is deleted; a filed claim is not (409) and stays', async () => {
    const w = await claimWorld(t);
    const draft = await createDraft(w.installer.agent, w.installation.id);
    expect((await w.installer.agent.delete(`/api/claims/${draft.id}`)).status).toBe(204);
    expect(await t.ds.getRepository(Claim).countBy({ id: draft.id })).toBe(0);
    const filed = await createDraft(
      w.installer.agent,
      w.installation.id,
      goodClaimFields(w.installation.serials[0]),
    );
    expect((await w.installer.agent.post(`/api/claims/${filed.id}/file`).send({})).status).toBe(200);
    const del = await w.installer.agent.delete(`/api/claims/${filed.id}`);
    expect(del.status).toBe(409);
    expect(del.body.error.code).toBe('claim.not_deletable');
    expect((await claimRow(filed.id)).stage).toBe('filed');
  });
});

describe('filing', () => {
  it('validates the whole claim, evaluates it, numbers it, audits it and queues both e-mails in one go', async () => {
    const w = await claimWorld(t);
    const draft = await createDraft(
      w.installer.agent,
      w.installation.id,
      goodClaimFields(w.installation.serials[0]),
    );
    const r = await w.installer.agent.post(`/api/claims/${draft.id}/file`).send({});
    expect(r.status).toBe(200);
    expect(r.body.replayed).toBe(false);
    const c = r.body.claim;
    expect(c.stage).toBe('filed');
    expect(c.number).toMatch(CLAIM_NUMBER_PATTERN);
    expect(isValidClaimNumber(c.number)).toBe(true);
    expect(c.waitingOn).toBe('manufacturer');
    expect(c.evaluation.engineVersion).toBe(ENGINE_VERSION);
    const row = await claimRow(draft.id);
    expect(row).toMatchObject({
      stage: 'filed',
      number: c.number,
      engineVersion: ENGINE_VERSION,
      verdict: row.evaluation!.verdict,
      filedById: w.installer.user.id,
    });
    expect(row.evaluation!.engineVersion).toBe(ENGINE_VERSION);
    expect(row.expectedCredit).toBe(row.evaluation!.computed.credit);
    // No photos yet and proof of purchase required by the policy: a person has to look.
    expect(row.verdict).toBe('review');
    expect(await auditActions(draft.id)).toEqual(['claim.created', 'claim.filed']);
    const mails = await outboxTo([w.reviewer.user.email, w.installer.user.email]);
    expect(mails.map((m) => m.template).sort()).toEqual([
      'claim-filed-confirmation',
      'claim-filed-manufacturer',
    ]);
    expect(mails.every((m) => m.subject.includes(c.number))).toBe(true);
    expect(await outboxTo([w.otherReviewer.user.email])).toHaveLength(0);
  });

  it('refuses an incomplete claim with 422 naming each missing field; nothing changes and no e-mail goes out', async () => {
    const w = await claimWorld(t);
    const draft = await createDraft(w.installer.agent, w.installation.id, {
      units: 9,
      serials: ['NOT-ON-SITE'],
      failedOn: '2023-12-01',
    });
    const r = await w.installer.agent.post(`/api/claims/${draft.id}/file`).send({});
    expect(r.status).toBe(422);
    expect(r.body.error.code).toBe('claim.incomplete');
    expect(r.body.error.details).toEqual(
      expect.arrayContaining([
        { path: 'serials', message: 'Not registered on this installation: NOT-ON-SITE.' },
        { path: 'units', message: 'The installation has 4 units; a claim cannot name more.' },
        { path: 'failedOn', message: 'The failure date is before the install date (2024-03-01).' },
        { path: 'symptoms', message: 'Pick at least one symptom.' },
        { path: 'narrative', message: 'Describe the failure in a sentence or two (at least 10 characters).' },
      ]),
    );
    const row = await claimRow(draft.id);
    expect(row).toMatchObject({ stage: 'draft', number: null, evaluation: null, version: draft.version });
    expect(await auditActions(draft.id)).toEqual(['claim.created']);
    expect(await outboxTo([w.reviewer.user.email, w.installer.user.email])).toHaveLength(0);
  });

  it('refuses a failure date in the future and more string readings than the product has strings', async () => {
    const w = await claimWorld(t);
    const strings = Array.from({ length: 13 }, () => ({ volts: 48 }));
    const draft = await createDraft(
      w.installer.agent,
      w.installation.id,
      goodClaimFields(w.installation.serials[0], { failedOn: daysAgo(-3), measurements: { strings } }),
    );
    const r = await w.installer.agent.post(`/api/claims/${draft.id}/file`).send({});
    expect(r.status).toBe(422);
    expect(r.body.error.details).toEqual(
      expect.arrayContaining([
        { path: 'failedOn', message: 'The failure date cannot be in the future.' },
        {
          path: 'measurements.strings',
          message: 'The product has 12 LED strings; 13 string readings were given.',
        },
      ]),
    );
  });

  it('is idempotent: a retry answers the same claim with replayed, and a double tap makes one claim', async () => {
    const w = await claimWorld(t);
    const draft = await createDraft(
      w.installer.agent,
      w.installation.id,
      goodClaimFields(w.installation.serials[0]),
    );
    const [a, b] = await Promise.all([
      w.installer.agent.post(`/api/claims/${draft.id}/file`).send({}),
      w.installer.agent.post(`/api/claims/${draft.id}/file`).set('Idempotency-Key', 'double-tap-2').send({}),
    ]);
    expect([a.status, b.status]).toEqual([200, 200]);
    expect([a.body.replayed, b.body.replayed].sort()).toEqual([false, true]);
    expect(a.body.claim.number).toBe(b.body.claim.number);
    const again = await w.installer.agent.post(`/api/claims/${draft.id}/file`).send({});
    expect(again.body).toMatchObject({
      replayed: true,
      claim: { number: a.body.claim.number, stage: 'filed' },
    });
    expect((await auditActions(draft.id)).filter((x) => x === 'claim.filed')).toHaveLength(1);
    expect(await outboxTo([w.installer.user.email])).toHaveLength(1);
  });

  it('stores the engine’s evaluation of exactly the claim as filed: an out-of-range supply shows in the record', async () => {
    const w = await claimWorld(t);
    // 277 V nominal: ANSI C84.1 Table 1 Range B service voltage is 254-293 V, so 300 V is outside it.
    const draft = await createDraft(
      w.installer.agent,
      w.installation.id,
      goodClaimFields(w.installation.serials[0], {
        measurements: { supplyVolts: 300, inputWatts: 23.5, powerFactor: 0.95 },
      }),
    );
    const r = await w.installer.agent.post(`/api/claims/${draft.id}/file`).send({});
    expect(r.body.claim.evaluation.computed.serviceVoltageRange).toBe('outside');
    const row = await claimRow(draft.id);
    expect(row.evaluation!.computed.serviceVoltageRange).toBe('outside');
  });

  it('a filed claim is no longer editable (409), and filing with a stale version is refused', async () => {
    const w = await claimWorld(t);
    const draft = await createDraft(
      w.installer.agent,
      w.installation.id,
      goodClaimFields(w.installation.serials[0]),
    );
    const stale = await w.installer.agent
      .post(`/api/claims/${draft.id}/file`)
      .send({ version: draft.version + 5 });
    expect(stale.status).toBe(409);
    expect((await claimRow(draft.id)).stage).toBe('draft');
    await w.installer.agent.post(`/api/claims/${draft.id}/file`).send({ version: draft.version });
    const edit = await w.installer.agent
      .patch(`/api/claims/${draft.id}`)
      .send({ version: draft.version + 1, narrative: 'Changed my mind' });
    expect(edit.status).toBe(409);
    expect(edit.body.error.code).toBe('claim.not_editable');
    expect((await claimRow(draft.id)).narrative).toBe(goodClaimFields('x').narrative);
  });

  it('withdraws a filed claim; a withdrawn claim can be neither filed nor withdrawn again', async () => {
    const w = await claimWorld(t);
    const draft = await createDraft(
      w.installer.agent,
      w.installation.id,
      goodClaimFields(w.installation.serials[0]),
    );
    await w.installer.agent.post(`/api/claims/${draft.id}/file`).send({});
    const r = await w.installer.agent
      .post(`/api/claims/${draft.id}/actions/withdraw`)
      .send({ reason: 'Loose connector, fixed on site.' });
    expect(r.status).toBe(200);
    expect(r.body.claim.stage).toBe('withdrawn');
    expect((await w.installer.agent.post(`/api/claims/${draft.id}/actions/withdraw`).send({})).status).toBe(
      409,
    );
    const file = await w.installer.agent.post(`/api/claims/${draft.id}/file`).send({});
    expect(file.status).toBe(409);
    expect(file.body.error.code).toBe('claim.invalid_transition');
    expect(await auditActions(draft.id)).toEqual(['claim.created', 'claim.filed', 'claim.withdrawn']);
    expect((await outboxTo([w.reviewer.user.email])).map((m) => m.template).sort()).toEqual([
      'claim-filed-manufacturer',
      'claim-update',
    ]);
  });
});

describe('who may see, edit and file what', () => {
  it('own contractor: everything; other contractor and other manufacturer: 404; the claim’s manufacturer: reads only once filed', async () => {
    const w = await claimWorld(t);
    const admin = await member(t, w.conX, ['administrator']);
    const draft = await createDraft(
      w.installer.agent,
      w.installation.id,
      goodClaimFields(w.installation.serials[0]),
    );
    const url = `/api/claims/${draft.id}`;

    expect((await admin.agent.get(url)).status).toBe(200);
    for (const outsider of [w.otherInstaller, w.otherReviewer, w.reviewer]) {
      expect((await outsider.agent.get(url)).status).toBe(404);
      expect((await outsider.agent.patch(url).send({ version: 1, narrative: 'hijack' })).status).toBe(404);
      expect((await outsider.agent.post(`${url}/file`).send({})).status).toBe(404);
      expect((await outsider.agent.delete(url)).status).toBe(404);
    }
    expect(await claimRow(draft.id)).toMatchObject({ stage: 'draft', version: 1 });
    expect(
      (await w.reviewer.agent.get('/api/claims')).body.items.find((i: { id: string }) => i.id === draft.id),
    ).toBeUndefined();

    // The contractor's administrator may file too.
    expect((await admin.agent.post(`${url}/file`).send({})).status).toBe(200);
    const seen = await w.reviewer.agent.get(url);
    expect(seen.status).toBe(200);
    expect(seen.body.claim.stage).toBe('filed');
    expect((await w.reviewer.agent.post(`${url}/actions/withdraw`).send({})).status).toBe(403);
    expect((await w.reviewer.agent.post(`${url}/file`).send({})).status).toBe(403);
    for (const outsider of [w.otherInstaller, w.otherReviewer]) {
      expect((await outsider.agent.get(url)).status).toBe(404);
      expect((await outsider.agent.post(`${url}/actions/withdraw`).send({})).status).toBe(404);
    }
    expect((await claimRow(draft.id)).stage).toBe('filed');
  });
});

describe('statements per request', () => {
  it('the list runs one whatever the page size (the page carries its total), a claim page one whatever it holds', async () => {
    // Every signed-in request first reads its session with its user and organisation: one statement
    // (server/auth/session.ts), counted like every other read.
    const SESSION = 1;
    const w = await claimWorld(t);
    const [s1, s2] = w.installation.serials;
    const a = await createDraft(w.installer.agent, w.installation.id, goodClaimFields(s1));
    await w.installer.agent.post(`/api/claims/${a.id}/file`).send({});
    const b = await createDraft(w.installer.agent, w.installation.id, goodClaimFields(s2));
    const run = (path: string) => t.countQueries(() => w.installer.agent.get(path));
    for (const qs of ['pageSize=1', 'pageSize=50', 'pageSize=50&stage=draft', 'pageSize=50&q=SN']) {
      const r = await run(`/api/claims?${qs}`);
      expect(r.result.status).toBe(200);
      expect(r.counter.count, qs).toBe(SESSION + 1);
    }
    // The total rides on the page's rows (readPageWithTotal, server/db/read.ts): the same total on every page,
    // and a page past the end, which has no row to carry it, asks for it on its own.
    const first = await run('/api/claims?pageSize=1&page=1');
    const second = await run('/api/claims?pageSize=1&page=2');
    const past = await run('/api/claims?pageSize=1&page=9');
    expect(first.result.body.total).toBe(2);
    expect(second.result.body.total).toBe(2);
    expect(past.result.body).toMatchObject({ items: [], total: 2 });
    expect(past.counter.count).toBe(SESSION + 2);
    for (const stage of ['filed', 'draft']) {
      const r = await w.installer.agent.get(`/api/claims?pageSize=1&page=5&stage=${stage}`);
      expect(r.body).toMatchObject({ items: [], total: 1 });
    }
    // The filed claim has a history and an evaluation, the draft hardly anything: the same statements.
    const filed = await run(`/api/claims/${a.id}`);
    const draft = await run(`/api/claims/${b.id}`);
    expect(filed.result.body.claim.history.length).toBeGreaterThan(draft.result.body.claim.history.length);
    // The claim with its installation's units, its history and its files, in one statement.
    expect(filed.counter.count).toBe(SESSION + 1);
    expect(draft.counter.count).toBe(SESSION + 1);
  });
});

describe('the list', () => {
  it('filters by stage, site, product and date, finds by claim number (any case and spacing) or serial, and pages', async () => {
    const w = await claimWorld(t);
    const [s1, s2] = w.installation.serials;
    const filed = await createDraft(w.installer.agent, w.installation.id, goodClaimFields(s1));
    const f = await w.installer.agent.post(`/api/claims/${filed.id}/file`).send({});
    const number: string = f.body.claim.number;
    const draft = await createDraft(w.installer.agent, w.installation.id, goodClaimFields(s2));

    const all = await w.installer.agent.get('/api/claims?pageSize=1&sort=-createdAt');
    expect(all.body).toMatchObject({ total: 2, page: 1, pageSize: 1 });
    expect(all.body.items[0]).toMatchObject({
      id: draft.id,
      stage: 'draft',
      evaluation: null,
      contractor: { id: w.conX.id },
      manufacturer: { id: w.mfrA.id },
      product: { id: w.product.id },
    });

    const ids = async (qs: string) =>
      (await w.installer.agent.get(`/api/claims?${qs}`)).body.items.map((i: { id: string }) => i.id).sort();
    expect(await ids('stage=filed')).toEqual([filed.id]);
    expect(await ids('stage=draft,filed')).toEqual([filed.id, draft.id].sort());
    expect(await ids(`q=${encodeURIComponent(number.toLowerCase().replace(/-/g, ' '))}`)).toEqual([filed.id]);
    expect(await ids(`q=${encodeURIComponent(s2)}`)).toEqual([draft.id]);
    expect(await ids('site=Test%20site')).toHaveLength(2);
    expect(await ids('site=Nowhere')).toEqual([]);
    expect(await ids(`product=${encodeURIComponent(w.product.modelNumber)}`)).toHaveLength(2);
    expect(await ids(`filedFrom=${daysAgo(1)}&filedTo=${daysAgo(-1)}`)).toEqual([filed.id]);
    expect(await ids('filedTo=2020-01-01')).toEqual([]);
    expect(await ids('verdict=review')).toEqual([filed.id]);
    expect(await ids('verdict=covered')).toEqual([]);
    expect(await ids(`manufacturerId=${w.mfrA.id}`)).toHaveLength(2);
    expect(await ids('open=false')).toEqual([]);
    expect(await ids('open=true')).toHaveLength(2);
    // Search text is matched as text: LIKE's wildcards in it match only themselves.
    expect(await ids('q=%25')).toEqual([]);
    expect(await ids('site=_')).toEqual([]);
    // Pages: the second of two one-row pages holds the other claim, and the total counts both.
    const second = await w.installer.agent.get('/api/claims?pageSize=1&page=2&sort=-createdAt');
    expect(second.body).toMatchObject({ total: 2, page: 2, items: [{ id: filed.id }] });

    const item = (await w.installer.agent.get('/api/claims?stage=filed')).body.items[0];
    expect(item).toMatchObject({
      number,
      filedAt: expect.any(String),
      evaluation: { verdict: 'review', engineVersion: ENGINE_VERSION },
    });
    // The list reads its times as text and the claim's page as Dates: both print them the same way.
    const detail = (await w.installer.agent.get(`/api/claims/${filed.id}`)).body.claim;
    for (const k of ['filedAt', 'stageChangedAt', 'createdAt', 'updatedAt', 'failedOn'] as const)
      expect(item[k], k).toBe(detail[k]);
    expect(item.filedAt).toBe(new Date(item.filedAt).toISOString());

    // The manufacturer sees the filed claim and never the draft; the other contractor sees neither.
    expect((await w.reviewer.agent.get('/api/claims')).body.items.map((i: { id: string }) => i.id)).toEqual([
      filed.id,
    ]);
    expect((await w.otherInstaller.agent.get('/api/claims')).body.total).toBe(0);

    const bad = await w.installer.agent.get('/api/claims?stage=lost&filedFrom=yesterday');
    expect(bad.status).toBe(400);
    expect([...new Set(bad.body.error.details.map((d: { path: string }) => d.path))].sort()).toEqual([
      'filedFrom',
      'stage.0',
    ]);
  });
});
