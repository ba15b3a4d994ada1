import crypto from 'node:crypto';
import { generate, generateSecret, generateURI, verify, type HashAlgorithm } from 'otplib';

// TOTP (RFC 6238) as every authenticator app reads it: HMAC-SHA-1, six digits, 30-second steps from the Unix
// epoch. One step either side is accepted for clock drift (RFC 6238 section 5.2 recommends at most one).
export const TOTP_CONFIG = { algorithm: 'sha1' as HashAlgorithm, digits: 6 as const, period: 30, t0: 0 };
const DRIFT_STEPS = 1;
export const TOTP_ISSUER = 'Lumenproof';

/** A new secret: 20 random bytes (160 bits, RFC 4226 section 4's recommended length), base32. */
export function newTotpSecret(): string {
  return generateSecret({ length: 20 });
}

export function totpUri(secret: string, label: string): string {
  return generateURI({ issuer: TOTP_ISSUER, label, secret, ...TOTP_CONFIG });
}

export function totpStep(epochMs: number): number {
  return Math.floor(epochMs / 1000 / TOTP_CONFIG.period);
}

/**
 * The code at a moment. `secret` is base32, or the raw key bytes; `overrides` change the digits or hash (the
 * RFC's own test vectors use eight digits and three hashes).
 */
export function totpCode(
  secret: string | Uint8Array,
  epochMs: number,
  overrides: { digits?: 6 | 7 | 8; algorithm?: HashAlgorithm } = {},
): Promise<string> {
  return generate({ secret, ...TOTP_CONFIG, ...overrides, epoch: Math.floor(epochMs / 1000) });
}

/**
 * The time step a code belongs to when it is valid now (within the drift) and later than `afterStep` (a step
 * already used is a replay); null otherwise.
 */
export async function verifyTotp(
  secret: string,
  code: string,
  epochMs: number,
  afterStep: number | null,
): Promise<number | null> {
  if (!/^\d{6}$/.test(code)) return null;
  const result = await verify({
    secret,
    token: code,
    ...TOTP_CONFIG,
    epoch: Math.floor(epochMs / 1000),
    epochTolerance: DRIFT_STEPS * TOTP_CONFIG.period,
    ...(afterStep !== null ? { afterTimeStep: afterStep } : {}),
  });
  return result.valid ? (result as { timeStep: number }).timeStep : null;
}

/** Recovery codes: ten characters from 32 letters and digits without i, l and o (50 bits), shown as xxxxx-xxxxx. */
const ALPHABET = 'abcdefghjkmnpqrstuvwxyz123456789';
export function newRecoveryCode(): string {
  const bytes = crypto.randomBytes(10);
  const chars = [...bytes].map((b) => ALPHABET[b & 31]);
  return `${chars.slice(0, 5).join('')}-${chars.slice(5).join('')}`;
}

/** The stored form: SHA-256 of the code as typed, without dashes or spaces and in lower case. */
export function hashRecoveryCode(code: string): string {
  const normal = code.replace(/[\s-]/g, '').toLowerCase();
  return crypto.createHash('sha256').update(normal).digest('hex');
}
