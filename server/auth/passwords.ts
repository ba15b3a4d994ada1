import { hash, verify } from '@node-rs/argon2';

// argon2id with at least the OWASP Password Storage Cheat Sheet's first option (m = 19 MiB, t = 2, p = 1).
// algorithm 2 is Argon2id in @node-rs/argon2's Algorithm enum (a const enum, not importable under isolatedModules).
const OPTIONS = { algorithm: 2, memoryCost: 19456, timeCost: 2, parallelism: 1 } as const;

export function hashPassword(password: string): Promise<string> {
  return hash(password, OPTIONS);
}

// A fixed hash to verify against when the account does not exist, so that an unknown e-mail costs the same
// time as a wrong password and the two cannot be told apart.
let dummyHash: Promise<string> | null = null;

export async function verifyPassword(stored: string | null, password: string): Promise<boolean> {
  if (!stored) {
    dummyHash ??= hashPassword('lumenproof-timing-equaliser');
    await verify(await dummyHash, password).catch(() => false);
    return false;
  }
  try {
    return await verify(stored, password);
  } catch {
    return false;
  }
}
