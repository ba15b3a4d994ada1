import crypto from 'node:crypto';
import dns from 'node:dns';
import http from 'node:http';
import https from 'node:https';
import net from 'node:net';
import type { EntityManager } from 'typeorm';
import { WEBHOOK_SIGNATURE_HEADER, type WebhookEvent } from '../../shared/schemas/webhooks';
import type { AppDataSource } from '../db/data-source';
import { WebhookDelivery, WebhookEndpoint } from '../db/entities/webhook.entity';
import { clock } from './clock';
import { AppError } from './errors';
import type { Logger } from './logger';
import { afterFailure, claimDue, startQueueWorker, type ClaimOptions } from './delivery-queue';

// Webhooks ride the same transactional-outbox pattern as e-mail (server/lib/outbox.ts): a delivery row per
// subscribed endpoint is written in the transaction of the change, and a worker sends it with retries and backoff.

/** Loopback, private, link-local and unspecified ranges: never a production webhook's address. */
const PRIVATE = new net.BlockList();
for (const [net4, bits] of [
  ['0.0.0.0', 8],
  ['10.0.0.0', 8],
  ['100.64.0.0', 10],
  ['127.0.0.0', 8],
  ['169.254.0.0', 16],
  ['172.16.0.0', 12],
  ['192.168.0.0', 16],
] as const)
  PRIVATE.addSubnet(net4, bits, 'ipv4');
for (const [net6, bits] of [
  ['::', 128],
  ['::1', 128],
  ['fc00::', 7],
  ['fe80::', 10],
] as const)
  PRIVATE.addSubnet(net6, bits, 'ipv6');

export function isPrivateAddress(address: string): boolean {
  const mapped = /^::ffff:(\d+\.\d+\.\d+\.\d+)$/i.exec(address);
  if (mapped) return PRIVATE.check(mapped[1], 'ipv4');
  const family = net.isIP(address);
  if (family === 4) return PRIVATE.check(address, 'ipv4');
  if (family === 6) return PRIVATE.check(address, 'ipv6');
  return true; // not an address at all: refuse
}

const hostOf = (u: URL) => u.hostname.replace(/^\[(.*)\]$/, '$1');

/**
 * Whether an endpoint may be registered. In production mode it must be https and resolve only to public
 * addresses; in demo and test mode anything goes (tests and the README run a receiver on 127.0.0.1).
 */
export async function checkEndpointUrl(raw: string, opts: { strict: boolean }) {
  const url = new URL(raw);
  if (!opts.strict) return;
  const refuse = (code: string, message: string) =>
    new AppError(422, code, message, [{ path: 'url', message }]);
  if (url.protocol !== 'https:')
    throw refuse('webhook.https_required', 'Webhook addresses must use https://.');
  if (url.username || url.password)
    throw refuse('webhook.credentials_in_url', 'Leave user names and passwords out of the address.');
  const host = hostOf(url);
  let addresses: string[];
  if (net.isIP(host)) addresses = [host];
  else {
    try {
      addresses = (await dns.promises.lookup(host, { all: true })).map((a) => a.address);
    } catch {
      throw refuse('webhook.unresolvable', 'That host name does not resolve.');
    }
  }
  if (!addresses.length || addresses.some(isPrivateAddress))
    throw refuse(
      'webhook.private_address',
      'That address is on a loopback or private network; use a public https address.',
    );
}

export const newSigningSecret = () => `lpwhsec_${crypto.randomBytes(32).toString('base64url')}`;

/** `t=<unix seconds>,v1=<hex HMAC-SHA256 of "<t>.<body>" under the endpoint's secret>`. */
export function signWebhook(secret: string, body: string, timestampSeconds: number) {
  const v1 = crypto.createHmac('sha256', secret).update(`${timestampSeconds}.${body}`).digest('hex');
  return `t=${timestampSeconds},v1=${v1}`;
}

/** A claim as events name it: its parties as organisations only, never their people. */
export function claimRef(
  claim: { id: string; number: string | null; contractorId: string; manufacturerId: string },
  stage: string,
  parties: { contractor: { name: string }; manufacturer: { name: string } },
) {
  return {
    id: claim.id,
    number: claim.number,
    stage,
    contractor: { id: claim.contractorId, name: parties.contractor.name },
    manufacturer: { id: claim.manufacturerId, name: parties.manufacturer.name },
  };
}

/**
 * Queues an event for every live endpoint of the named organisations that asked for it, in the caller's
 * transaction: it is sent only if the change commits. Returns the event's id.
 */
export async function enqueueWebhookEvent(
  m: EntityManager,
  msg: { event: WebhookEvent | 'webhook.test'; organizationIds: string[]; data: Record<string, unknown> },
  only?: { endpointId: string },
) {
  const qb = m
    .createQueryBuilder(WebhookEndpoint, 'w')
    .where('w.organization_id IN (:...orgs) AND w.disabled_at IS NULL', { orgs: msg.organizationIds });
  if (only) qb.andWhere('w.id = :id', { id: only.endpointId });
  const endpoints = (await qb.getMany()).filter((e) => only || e.events.includes(msg.event as WebhookEvent));
  const eventId = crypto.randomUUID();
  if (!endpoints.length) return eventId;
  const now = clock.now();
  const body = JSON.stringify({ id: eventId, type: msg.event, createdAt: now.toISOString(), data: msg.data });
  await m.insert(
    WebhookDelivery,
    endpoints.map((e) => ({
      endpointId: e.id,
      eventId,
      event: msg.event,
      body,
      status: 'pending' as const,
      attempts: 0,
      nextAttemptAt: now,
    })),
  );
  return eventId;
}

const TIMEOUT_MS = 10_000;

type LookupCallback = (err: NodeJS.ErrnoException | null, address: unknown, family?: number) => void;

/** dns.lookup that refuses private answers: checked again at send time, so a host cannot turn private later. */
function guardedLookup(hostname: string, options: dns.LookupOptions, cb: LookupCallback) {
  dns.lookup(hostname, { ...options }, (err, address, family) => {
    if (err) return cb(err, address, family);
    const list = Array.isArray(address) ? address.map((a) => a.address) : [address];
    if (list.some(isPrivateAddress))
      return cb(new Error('refused: the host resolves to a private address'), address, family);
    cb(null, address, family);
  });
}

/** POSTs one signed body; resolves with the answer's status code. */
function post(url: URL, body: string, headers: Record<string, string>, strict: boolean): Promise<number> {
  return new Promise((resolve, reject) => {
    if (strict && url.protocol !== 'https:') return reject(new Error('refused: not https'));
    if (strict && net.isIP(hostOf(url)) && isPrivateAddress(hostOf(url)))
      return reject(new Error('refused: private address'));
    const lib = url.protocol === 'https:' ? https : http;
    const req = lib.request(
      url,
      {
        method: 'POST',
        headers: { ...headers, 'Content-Length': Buffer.byteLength(body) },
        timeout: TIMEOUT_MS,
        ...(strict ? { lookup: guardedLookup as unknown as net.LookupFunction } : {}),
      },
      (res) => {
        res.resume(); // the answer's body is not ours to keep
        res.on('end', () => resolve(res.statusCode ?? 0));
        res.on('error', reject);
      },
    );
    req.on('timeout', () => req.destroy(new Error(`no answer in ${TIMEOUT_MS / 1000} s`)));
    req.on('error', reject);
    req.end(body);
  });
}

/** Sends due deliveries, claimed with a lease exactly as the e-mail outbox's (server/lib/delivery-queue.ts). */
export async function deliverDueWebhooks(ds: AppDataSource, opts: ClaimOptions & { strict: boolean }) {
  const claimed = await claimDue(ds, WebhookDelivery, opts);

  const repo = ds.getRepository(WebhookDelivery);
  let delivered = 0;
  for (const row of claimed) {
    const attempts = row.attempts + 1;
    const endpoint = await ds.getRepository(WebhookEndpoint).findOneBy({ id: row.endpointId });
    let status: number | null = null;
    let error: string | null = null;
    try {
      if (!endpoint || endpoint.disabledAt) throw new Error('the endpoint was removed');
      const t = Math.floor(clock.nowMs() / 1000);
      status = await post(
        new URL(endpoint.url),
        row.body,
        {
          'Content-Type': 'application/json',
          'User-Agent': 'Lumenproof-Webhooks/1',
          [WEBHOOK_SIGNATURE_HEADER]: signWebhook(endpoint.signingSecret, row.body, t),
          'Lumenproof-Event': row.event,
          'Lumenproof-Event-Id': row.eventId,
          'Lumenproof-Delivery': row.id,
        },
        opts.strict,
      );
      if (status < 200 || status > 299) error = `answered ${status}`;
    } catch (err) {
      error = String((err as Error).message ?? err);
    }
    const now = clock.now();
    if (!error) {
      await repo.update(
        { id: row.id },
        {
          status: 'delivered',
          lastStatusCode: status,
          lastError: null,
          lastAttemptAt: now,
          deliveredAt: now,
        },
      );
      delivered += 1;
    } else {
      const gone = !endpoint || Boolean(endpoint.disabledAt);
      await repo.update(
        { id: row.id },
        {
          ...afterFailure(attempts, gone),
          lastStatusCode: status,
          lastError: error.slice(0, 500),
          lastAttemptAt: now,
        },
      );
    }
  }
  return { claimed: claimed.length, delivered };
}

export function startWebhookWorker(
  ds: AppDataSource,
  logger: Logger,
  opts: { strict: boolean; intervalMs?: number },
) {
  return startQueueWorker({
    firstDelayMs: 300,
    intervalMs: opts.intervalMs,
    run: () =>
      deliverDueWebhooks(ds, { strict: opts.strict })
        .then((r) => r.delivered && logger.info({ delivered: r.delivered }, 'webhooks delivered'))
        .catch((err) => logger.warn({ err }, 'webhook run failed')),
  });
}
