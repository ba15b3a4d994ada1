import crypto from 'node:crypto';
import type { AddressInfo } from 'node:net';
import type { Server } from 'node:http';
import type { TestContext } from './test-app';
import { createOrganization, createUser, signIn, TEST_PASSWORD } from './factories';
import type { Role } from '../../shared/roles';

// The parties of a credit: two manufacturers, two contractors, and people in each role, signed in.

const letters = () => Array.from(crypto.randomBytes(6), (b) => String.fromCharCode(65 + (b % 26))).join('');

export async function creditWorld(t: TestContext) {
  const mfr = await createOrganization(t.ds, 'manufacturer', `${letters()} Lighting ${letters()}`);
  const otherMfr = await createOrganization(t.ds, 'manufacturer', `${letters()} Luminaires ${letters()}`);
  const contractor = await createOrganization(t.ds, 'contractor', `${letters()} Electric ${letters()}`);
  const otherContractor = await createOrganization(
    t.ds,
    'contractor',
    `${letters()} Electrical ${letters()}`,
  );
  const person = async (org: typeof mfr, roles: Role[]) => {
    const user = await createUser(t.ds, org, roles);
    return { user, agent: await signIn(t.request(), user.email) };
  };
  return {
    mfr,
    otherMfr,
    contractor,
    otherContractor,
    accountant: await person(mfr, ['accountant']),
    otherAccountant: await person(otherMfr, ['accountant']),
    reviewer: await person(mfr, ['reviewer']),
    installer: await person(contractor, ['installer']),
    contractorAdmin: await person(contractor, ['administrator']),
    otherInstaller: await person(otherContractor, ['installer']),
  };
}

/** A real listening server, so that parallel requests really run in parallel (not one server per request). */
export async function listen(t: TestContext) {
  const server: Server = await new Promise((resolve) => {
    const s = t.app.listen(0, '127.0.0.1', () => resolve(s));
  });
  const base = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
  return {
    base,
    close: () =>
      new Promise<void>((resolve) => {
        server.closeAllConnections?.();
        server.close(() => resolve());
      }),
  };
}

/** Signs in over fetch and returns the session cookie. */
export async function fetchSignIn(base: string, email: string, password = TEST_PASSWORD) {
  const r = await fetch(`${base}/api/auth/login`, {
    method: 'POST',
    headers: { 'content-type': 'application/json' },
    body: JSON.stringify({ email, password }),
  });
  if (r.status !== 200) throw new Error(`sign-in failed: ${r.status}`);
  const cookie = r.headers.getSetCookie().find((c) => c.startsWith('lp.sid='))!;
  return cookie.split(';')[0];
}

export async function postCredit(
  base: string,
  cookie: string,
  claimId: string,
  key: string,
  body: unknown = {},
) {
  const r = await fetch(`${base}/api/claims/${claimId}/credits`, {
    method: 'POST',
    headers: { 'content-type': 'application/json', cookie, 'idempotency-key': key },
    body: JSON.stringify(body),
  });
  return { status: r.status, replayed: r.headers.get('idempotent-replayed'), text: await r.text() };
}
