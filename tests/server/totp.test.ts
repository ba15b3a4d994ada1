import { stringToBytes } from 'otplib';
import { describe, expect, it } from 'vitest';
import { hashRecoveryCode, newRecoveryCode, totpCode, verifyTotp } from '../../server/auth/totp';

// RFC 6238 (TOTP), Appendix B: the reference test vectors. Seeds are the ASCII keys the RFC's reference code
// uses: "12345678901234567890" for SHA-1, the same repeated to 32 bytes for SHA-256 and to 64 bytes for SHA-512;
// T0 = 0, X = 30 seconds, eight digits.
const SEED_SHA1 = stringToBytes('12345678901234567890');
const SEED_SHA256 = stringToBytes('12345678901234567890123456789012');
const SEED_SHA512 = stringToBytes('1234567890123456789012345678901234567890123456789012345678901234');

// [Unix time in seconds, SHA-1, SHA-256, SHA-512] -- RFC 6238 Appendix B, the table of test vectors.
const RFC6238_APPENDIX_B: [number, string, string, string][] = [
  [59, '94287082', '46119246', '90693936'],
  [1111111109, '07081804', '68084774', '25091201'],
  [1111111111, '14050471', '67062674', '99943326'],
  [1234567890, '89005924', '91819424', '93441116'],
  [2000000000, '69279037', '90698825', '38618901'],
  [20000000000, '65353130', '77737706', '47863826'],
];

describe('TOTP configuration', () => {
  it.each(RFC6238_APPENDIX_B)('matches RFC 6238 Appendix B at T = %i s', async (t, sha1, sha256, sha512) => {
    const at = t * 1000;
    expect(await totpCode(SEED_SHA1, at, { digits: 8 })).toBe(sha1); // RFC 6238 Appendix B, SHA1 column
    expect(await totpCode(SEED_SHA256, at, { digits: 8, algorithm: 'sha256' })).toBe(sha256); // SHA256 column
    expect(await totpCode(SEED_SHA512, at, { digits: 8, algorithm: 'sha512' })).toBe(sha512); // SHA512 column
  });

  it('uses six digits, the low six of the RFC value (RFC 4226 section 5.3: Snum mod 10^Digit)', async () => {
    // RFC 6238 Appendix B, T = 59, SHA-1: 94287082; six digits are 94287082 mod 10^6.
    expect(await totpCode(SEED_SHA1, 59_000)).toBe('287082');
    // RFC 6238 Appendix B, T = 1111111109, SHA-1: 07081804 -> 081804.
    expect(await totpCode(SEED_SHA1, 1_111_111_109_000)).toBe('081804');
  });

  // Authenticator apps are given base32 secrets: the RFC's SHA-1 seed in base32 (RFC 4648 section 6; from
  // memory, and confirmed by the RFC vector below) checks that path too.
  const BASE32_SEED = 'GEZDGNBVGY3TQOJQGEZDGNBVGY3TQOJQ';

  it('reads base32 secrets (RFC 4648 section 6) like the raw key', async () => {
    expect(await totpCode(BASE32_SEED, 59_000)).toBe('287082'); // RFC 6238 Appendix B, T = 59, SHA-1
  });

  it('accepts one step of drift either side and refuses a step already used', async () => {
    const t = 1_111_111_109_000; // step 37037036 (floor(1111111109 / 30))
    const code = await totpCode(BASE32_SEED, t);
    expect(await verifyTotp(BASE32_SEED, code, t, null)).toBe(37037036);
    expect(await verifyTotp(BASE32_SEED, code, t + 30_000, null)).toBe(37037036);
    expect(await verifyTotp(BASE32_SEED, code, t - 30_000, null)).toBe(37037036);
    expect(await verifyTotp(BASE32_SEED, code, t + 90_000, null)).toBeNull();
    expect(await verifyTotp(BASE32_SEED, code, t, 37037036)).toBeNull(); // RFC 6238 section 5.2: no second use
    expect(await verifyTotp(BASE32_SEED, '12345', t, null)).toBeNull();
  });

  it('makes recovery codes that hash the same however they are typed', () => {
    const code = newRecoveryCode();
    expect(code).toMatch(/^[a-z1-9]{5}-[a-z1-9]{5}$/);
    expect(hashRecoveryCode(code.toUpperCase().replace('-', ' '))).toBe(hashRecoveryCode(code));
    expect(hashRecoveryCode(code)).toMatch(/^[0-9a-f]{64}$/);
  });
});
