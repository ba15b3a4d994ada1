import crypto from 'node:crypto';
import http from 'node:http';
import type { AddressInfo } from 'node:net';
import type supertest from 'supertest';
import { afterAll, afterEach, beforeAll, describe, expect, it } from 'vitest';
import { WebhookDelivery, WebhookEndpoint } from '../../server/db/entities/webhook.entity';
import { backoffMs } from '../../server/lib/delivery-queue';
import { clock } from '../../server/lib/clock';
import { deliverDueWebhooks, isPrivateAddress } from '../../server/lib/webhooks';
import { WEBHOOK_EVENTS } from '../../shared/schemas/webhooks';
import { verifySignature } from '../../scripts/webhook-receiver';
import { installationPayload } from '../support/catalogue-factories';
import { claimWorld, createDraft, goodClaimFields } from '../support/claim-factories';
import { createApprovedClaim } from '../support/credit-factories';
import { createUser, signIn } from '../support/factories';
import { closeTestApp, createTestApp, type TestContext } from '../support/test-app';

type Received = { headers: http.IncomingHttpHeaders; body: string };

/** A local receiver on 127.0.0.1 that answers with the queued status codes (200 once the queue is empty). */
async function startReceiver() {
  const received: Received[] = [];
  const answers: number[] = [];
  const server = http.createServer((req, res) => {
    const chunks: Buffer[] = [];
    req.on('data', (c) => chunks.push(c));
    req.on('end', () => {
      received.push({ headers: req.headers, body: Buffer.concat(chunks).toString('utf8') });
      res.statusCode = answers.shift() ?? 200;
      res.end('ok');
    });
  });
  await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
  const port = (server.address() as AddressInfo).port;
  return {
    url: (path: string) => `http://127.0.0.1:${port}${path}`,
    received,
    answers,
    close: () => new Promise<void>((resolve) => server.close(() => resolve())),
  };
}

/** What a receiver does: recompute the HMAC over "<t>.<body>" and compare in constant time. */
function verify(secret: string, header: string | undefined, body: string) {
  const m = /^t=(\d+),v1=([0-9a-f]{64})$/.exec(header ?? '');
  if (!m) return false;
  const want = crypto.createHmac('sha256', secret).update(`${m[1]}.${body}`).digest();
  return crypto.timingSafeEqual(want, Buffer.from(m[2], 'hex'));
}

let t: TestContext;
let world: Awaited<ReturnType<typeof claimWorld>>;
let receiver: Awaited<ReturnType<typeof startReceiver>>;
beforeAll(async () => {
  t = await createTestApp();
  world = await claimWorld(t);
  receiver = await startReceiver();
}, 60_000);
afterAll(async () => {
  await closeTestApp(t);
  await receiver.close();
});
afterEach(() => clock.reset());

async function adminAgent(org: typeof world.conX) {
  const admin = await createUser(t.ds, org, ['administrator']);
  return signIn(t.request(), admin.email);
}

async function register(agent: supertest.Agent, path: string, events: string[] = [...WEBHOOK_EVENTS]) {
  const r = await agent.post('/api/webhooks').send({ url: receiver.url(path), events });
  if (r.status !== 201) throw new Error(`webhook: ${r.status} ${JSON.stringify(r.body)}`);
  return r.body as { webhook: { id: string }; signingSecret: string };
}

const deliveriesOf = (endpointId: string) =>
  t.ds.getRepository(WebhookDelivery).find({ where: { endpointId }, order: { id: 'ASC' } });

/** Files a claim on a new installation of contractor X (each installation has a few serials only). */
async function fileClaim(w: typeof world) {
  const inst = await w.installer.agent
    .post('/api/installations')
    .send(installationPayload(w.product.id, { installDate: '2024-03-01', purchaseDate: '2024-02-15' }));
  if (inst.status !== 201) throw new Error(`installation: ${inst.status} ${JSON.stringify(inst.body)}`);
  const { id, serials } = inst.body.installation as { id: string; serials: string[] };
  const draft = await createDraft(w.installer.agent, id, goodClaimFields(serials[0]));
  const r = await w.installer.agent.post(`/api/claims/${draft.id}/file`).send({});
  if (r.status !== 200) throw new Error(`file: ${r.status} ${JSON.stringify(r.body)}`);
  return draft.id;
}

describe('webhooks: registration', () => {
  it('an administrator registers an endpoint; the signing secret is answered once, never listed', async () => {
    const agent = await adminAgent(world.conX);
    const made = await register(agent, '/reg');
    expect(made.signingSecret).toMatch(/^lpwhsec_[A-Za-z0-9_-]{43}$/);
    const list = await agent.get('/api/webhooks');
    expect(list.status).toBe(200);
    expect(list.body.items.map((i: { id: string }) => i.id)).toContain(made.webhook.id);
    expect(JSON.stringify(list.body)).not.toContain(made.signingSecret);

    expect((await world.installer.agent.get('/api/webhooks')).status).toBe(403);
    const refused = await world.installer.agent
      .post('/api/webhooks')
      .send({ url: receiver.url('/x'), events: ['claim.filed'] });
    expect(refused.status).toBe(403);
    const other = await adminAgent(world.conY);
    const foreign = await other.get(`/api/webhooks/${made.webhook.id}/deliveries`);
    const missing = await other.get(`/api/webhooks/${crypto.randomUUID()}/deliveries`);
    expect(foreign.status).toBe(404);
    expect(foreign.body.error).toEqual(missing.body.error);
    expect((await other.delete(`/api/webhooks/${made.webhook.id}`)).status).toBe(404);

    const bad = await agent.post('/api/webhooks').send({ url: 'ftp://x', events: ['claim.lost'] });
    expect(bad.status).toBe(400);
  });
});

describe('webhooks: deliveries', () => {
  it('signs each delivery; both parties hear of a filing, an unrelated organisation does not', async () => {
    const contractor = await register(await adminAgent(world.conX), '/contractor');
    const manufacturer = await register(await adminAgent(world.mfrA), '/manufacturer');
    const unrelated = await register(await adminAgent(world.conY), '/unrelated');
    const unrelatedMfr = await register(await adminAgent(world.mfrB), '/unrelated-mfr');
    const claimId = await fileClaim(world);

    expect(await deliveriesOf(unrelated.webhook.id)).toEqual([]);
    expect(await deliveriesOf(unrelatedMfr.webhook.id)).toEqual([]);
    const mine = [
      ...(await deliveriesOf(contractor.webhook.id)),
      ...(await deliveriesOf(manufacturer.webhook.id)),
    ];
    expect(mine.map((d) => d.event)).toEqual(['claim.filed', 'claim.filed']);

    const before = receiver.received.length;
    const run = await deliverDueWebhooks(t.ds, { strict: false, ids: mine.map((d) => d.id) });
    expect(run).toEqual({ claimed: 2, delivered: 2 });
    const got = receiver.received.slice(before);
    expect(got).toHaveLength(2);
    for (const r of got) {
      const secret =
        r.headers['lumenproof-delivery'] === mine[0].id
          ? contractor.signingSecret
          : manufacturer.signingSecret;
      expect(verify(secret, r.headers['lumenproof-signature'] as string, r.body)).toBe(true);
      // A wrong secret or a changed body does not verify.
      expect(verify(unrelated.signingSecret, r.headers['lumenproof-signature'] as string, r.body)).toBe(
        false,
      );
      expect(verify(secret, r.headers['lumenproof-signature'] as string, `${r.body} `)).toBe(false);
      // The receiver the README ships agrees, and refuses the same delivery replayed ten minutes later.
      const header = r.headers['lumenproof-signature'] as string;
      expect(verifySignature(secret, header, r.body)).toBe(true);
      expect(verifySignature(secret, header, r.body, Math.floor(Date.now() / 1000) + 600)).toBe(false);
      const t0 = Number(/t=(\d+)/.exec(r.headers['lumenproof-signature'] as string)![1]);
      expect(Math.abs(t0 - Date.now() / 1000)).toBeLessThan(300);
      const event = JSON.parse(r.body);
      expect(event).toMatchObject({
        type: 'claim.filed',
        data: {
          claim: {
            id: claimId,
            stage: 'filed',
            contractor: { id: world.conX.id, name: world.conX.name },
            manufacturer: { id: world.mfrA.id, name: world.mfrA.name },
          },
        },
      });
      expect(r.headers['lumenproof-event-id']).toBe(event.id);
      // Organisations only: the installer who filed is named nowhere.
      expect(r.body).not.toContain(world.installer.user.name);
      expect(r.body).not.toContain(world.installer.user.email);
    }
    const rows = await deliveriesOf(contractor.webhook.id);
    expect(rows[0]).toMatchObject({ status: 'delivered', attempts: 1, lastStatusCode: 200 });
  });

  it('retries with backoff after the receiver answers 500, then delivers the same event', async () => {
    const agent = await adminAgent(world.mfrA);
    const hook = await register(agent, '/flaky', ['claim.information_requested']);
    const claimId = await fileClaim(world);
    // The reviewer starts the review and asks for more information: the subscribed event.
    const rev = world.reviewer.agent;
    expect((await rev.post(`/api/claims/${claimId}/actions/start_review`).send({})).status).toBe(200);
    const asked = await rev
      .post(`/api/claims/${claimId}/actions/request_info`)
      .send({ message: 'Send a photo of the nameplate, please.' });
    expect(asked.status).toBe(200);
    const [row] = await deliveriesOf(hook.webhook.id);
    expect(row.event).toBe('claim.information_requested');

    const before = receiver.received.length;
    receiver.answers.push(500);
    expect(await deliverDueWebhooks(t.ds, { strict: false, ids: [row.id] })).toEqual({
      claimed: 1,
      delivered: 0,
    });
    const failed = await t.ds.getRepository(WebhookDelivery).findOneByOrFail({ id: row.id });
    expect(failed).toMatchObject({
      status: 'pending',
      attempts: 1,
      lastStatusCode: 500,
      lastError: 'answered 500',
    });
    // Not due again until the backoff has passed.
    expect(await deliverDueWebhooks(t.ds, { strict: false, ids: [row.id] })).toEqual({
      claimed: 0,
      delivered: 0,
    });
    clock.advance(backoffMs(1) + 1000);
    expect(await deliverDueWebhooks(t.ds, { strict: false, ids: [row.id] })).toEqual({
      claimed: 1,
      delivered: 1,
    });
    const got = receiver.received.slice(before);
    expect(got).toHaveLength(2);
    expect(got[0].body).toBe(got[1].body);
    const event = JSON.parse(got[1].body);
    expect(event.type).toBe('claim.information_requested');
    expect(event.data.claim.stage).toBe('needs_info');
    expect(event.data.dueOn).toMatch(/^\d{4}-\d{2}-\d{2}$/);
    expect(got[1].body).not.toContain('nameplate'); // the reviewer's words stay in the app
    expect(await t.ds.getRepository(WebhookDelivery).findOneByOrFail({ id: row.id })).toMatchObject({
      status: 'delivered',
      attempts: 2,
      lastStatusCode: 200,
    });
  });

  it('shows the delivery log and sends a delivery again on request', async () => {
    const agent = await adminAgent(world.conX);
    const hook = await register(agent, '/log', ['claim.filed']);
    await fileClaim(world);
    const [row] = await deliveriesOf(hook.webhook.id);
    receiver.answers.push(404);
    await deliverDueWebhooks(t.ds, { strict: false, ids: [row.id] });

    const log = await agent.get(`/api/webhooks/${hook.webhook.id}/deliveries`);
    expect(log.status).toBe(200);
    expect(log.body.items[0]).toMatchObject({
      id: row.id,
      event: 'claim.filed',
      status: 'pending',
      attempts: 1,
      lastStatusCode: 404,
    });

    const again = await agent.post(`/api/webhooks/${hook.webhook.id}/deliveries/${row.id}/resend`).send({});
    expect(again.status).toBe(201);
    expect(again.body.delivery).toMatchObject({ eventId: row.eventId, status: 'pending', attempts: 0 });
    const before = receiver.received.length;
    await deliverDueWebhooks(t.ds, { strict: false, ids: [again.body.delivery.id] });
    expect(JSON.parse(receiver.received[before].body).id).toBe(row.eventId);
    const after = await agent.get(`/api/webhooks/${hook.webhook.id}/deliveries`);
    expect(after.body.items.map((i: { status: string }) => i.status)).toEqual(['delivered', 'pending']);

    // Another organisation's administrator cannot resend it.
    const other = await adminAgent(world.conY);
    expect(
      (await other.post(`/api/webhooks/${hook.webhook.id}/deliveries/${row.id}/resend`).send({})).status,
    ).toBe(404);

    // A test event reaches this endpoint alone.
    const ping = await agent.post(`/api/webhooks/${hook.webhook.id}/test`).send({});
    expect(ping.status).toBe(201);
    await deliverDueWebhooks(t.ds, { strict: false, ids: [ping.body.delivery.id] });
    expect(JSON.parse(receiver.received.at(-1)!.body).type).toBe('webhook.test');

    // Removed: nothing more is queued for it, and its log stays readable.
    expect((await agent.delete(`/api/webhooks/${hook.webhook.id}`)).status).toBe(200);
    await fileClaim(world);
    expect(await deliveriesOf(hook.webhook.id)).toHaveLength(3);
    expect((await agent.get(`/api/webhooks/${hook.webhook.id}/deliveries`)).status).toBe(200);
  });
});

describe('webhooks: credits', () => {
  it('tells both parties of a credit and of its voiding, with the memo numbers', async () => {
    const hook = await register(await adminAgent(world.conX), '/credits', [
      'claim.credited',
      'credit_memo.voided',
    ]);
    const accountant = await createUser(t.ds, world.mfrA, ['accountant']);
    const agent = await signIn(t.request(), accountant.email);
    const claim = await createApprovedClaim(t.ds, {
      manufacturer: world.mfrA,
      contractor: world.conX,
      amount: '73.41',
    });
    const issued = await agent
      .post(`/api/claims/${claim.id}/credits`)
      .set('Idempotency-Key', crypto.randomUUID())
      .send({});
    expect(issued.status).toBe(201);
    const voided = await agent
      .post(`/api/credits/${issued.body.creditMemo.id}/void`)
      .send({ reason: 'Issued against the wrong claim.' });
    expect(voided.status).toBe(201);
    const rows = await deliveriesOf(hook.webhook.id);
    expect(rows.map((r) => r.event)).toEqual(['claim.credited', 'credit_memo.voided']);
    const [credited, reversed] = rows.map((r) => JSON.parse(r.body));
    expect(credited.data).toMatchObject({
      claim: { id: claim.id, stage: 'credited' },
      creditMemo: { id: issued.body.creditMemo.id, amount: '73.41' },
    });
    expect(reversed.data).toMatchObject({
      claim: { id: claim.id, stage: 'approved' },
      creditMemo: { id: issued.body.creditMemo.id, number: credited.data.creditMemo.number },
    });
    expect(JSON.stringify([credited, reversed])).not.toContain(accountant.name);
  });
});

describe('webhooks: production mode', () => {
  let prod: TestContext;
  beforeAll(async () => {
    prod = await createTestApp({ APP_MODE: 'production' });
  });
  afterAll(() => closeTestApp(prod));

  it('refuses plain http and loopback, private and link-local addresses, storing nothing', async () => {
    const org = world.conX;
    const admin = await createUser(prod.ds, org, ['administrator']);
    const agent = await signIn(prod.request(), admin.email);
    const before = await prod.ds.getRepository(WebhookEndpoint).count();
    const refused: Record<string, string> = {
      'http://203.0.113.10/hook': 'webhook.https_required',
      'https://127.0.0.1/hook': 'webhook.private_address',
      'https://localhost/hook': 'webhook.private_address',
      'https://10.20.30.40/hook': 'webhook.private_address',
      'https://172.16.0.1/hook': 'webhook.private_address',
      'https://172.31.255.254/hook': 'webhook.private_address',
      'https://192.168.1.10/hook': 'webhook.private_address',
      'https://169.254.169.254/latest': 'webhook.private_address',
      'https://[::1]/hook': 'webhook.private_address',
      'https://[fd12:3456::1]/hook': 'webhook.private_address',
      'https://[fe80::1]/hook': 'webhook.private_address',
      'https://[::ffff:10.0.0.1]/hook': 'webhook.private_address',
    };
    for (const [url, code] of Object.entries(refused)) {
      const r = await agent.post('/api/webhooks').send({ url, events: ['claim.filed'] });
      expect({ url, status: r.status, code: r.body.error?.code }).toEqual({ url, status: 422, code });
    }
    expect(await prod.ds.getRepository(WebhookEndpoint).count()).toBe(before);
    // A public address literal (RFC 5737 documentation range) passes without any DNS.
    const ok = await agent
      .post('/api/webhooks')
      .send({ url: 'https://203.0.113.10/hook', events: ['claim.filed'] });
    expect(ok.status).toBe(201);
  });

  it('the sender refuses a private address too, should one be stored', async () => {
    const endpoint = await t.ds.getRepository(WebhookEndpoint).save(
      t.ds.getRepository(WebhookEndpoint).create({
        organizationId: world.conX.id,
        url: receiver.url('/sneaky'),
        events: ['claim.filed'],
        signingSecret: 'lpwhsec_x',
        createdById: world.installer.user.id,
        disabledAt: null,
      }),
    );
    await fileClaim(world);
    const [row] = await deliveriesOf(endpoint.id);
    const before = receiver.received.length;
    await deliverDueWebhooks(t.ds, { strict: true, ids: [row.id] });
    expect(receiver.received.length).toBe(before);
    const after = await t.ds.getRepository(WebhookDelivery).findOneByOrFail({ id: row.id });
    expect(after.status).toBe('pending');
    expect(after.lastError).toMatch(/refused/);
    await t.ds.getRepository(WebhookEndpoint).update({ id: endpoint.id }, { disabledAt: new Date() });
  });

  it('knows the private ranges', () => {
    // RFC 1918 (10/8, 172.16/12, 192.168/16), RFC 1122 (127/8), RFC 3927 (169.254/16), RFC 4193 (fc00::/7),
    // RFC 4291 (::1, fe80::/10); RFC 5737 documentation ranges are public-shaped.
    for (const a of [
      '10.0.0.1',
      '172.16.0.1',
      '172.31.255.255',
      '192.168.0.1',
      '127.0.0.1',
      '169.254.1.1',
      '::1',
      'fc00::1',
      'fdff::1',
      'fe80::1',
      '::ffff:192.168.0.1',
    ])
      expect({ a, private: isPrivateAddress(a) }).toEqual({ a, private: true });
    for (const a of [
      '172.15.255.255',
      '172.32.0.1',
      '192.0.2.1',
      '198.51.100.7',
      '203.0.113.10',
      '2001:db8::1',
    ])
      expect({ a, private: isPrivateAddress(a) }).toEqual({ a, private: false });
  });
});
