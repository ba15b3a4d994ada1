import { BENCH_PASSWORD } from '../generate-claims';

/** Signs a bench account in through the API and returns its session cookie (name=value). */
export async function signInBench(base: string, email: string): Promise<string> {
  const r = await fetch(`${base}/api/auth/login`, {
    method: 'POST',
    headers: { 'content-type': 'application/json' },
    body: JSON.stringify({ email, password: BENCH_PASSWORD }),
  });
  if (r.status !== 200) throw new Error(`sign-in of ${email}: ${r.status} ${await r.text()}`);
  return r.headers
    .getSetCookie()
    .find((c) => c.startsWith('lp.sid='))!
    .split(';')[0];
}
