// Claim numbers: LP-YYMM-XXX-XXC, e.g. LP-2612-7K4-QXM. Read over the phone from a lift, so the alphabet leaves
// out the look-alikes and sound-alikes 0/O, 1/I/L and U/V (29 symbols: 2-9 and 21 letters); the last symbol is
// a check character (weighted sum mod 29, a prime), which catches any one wrong symbol and any two swapped
// neighbours. The month tells a person roughly when it was filed; the rest is random, unique by index.

export const CLAIM_NUMBER_ALPHABET = '23456789ABCDEFGHJKMNPQRSTWXYZ';
const A = CLAIM_NUMBER_ALPHABET;
const N = A.length;

export const CLAIM_NUMBER_PATTERN = /^LP-\d{4}-[2-9A-HJKMNP-TW-Z]{3}-[2-9A-HJKMNP-TW-Z]{3}$/;

function checkSymbol(payload: string): string {
  // Weights 1..n over the month digits and random symbols; digits of the month count by their own value.
  let sum = 0;
  for (let i = 0; i < payload.length; i++) {
    const c = payload[i];
    const v = c >= '0' && c <= '9' && i < 4 ? Number(c) : A.indexOf(c);
    sum += (i + 1) * v;
  }
  return A[sum % N];
}

/** A fresh number for a claim filed on `date` (UTC month). `random` gives integers in [0, n). */
export function newClaimNumber(date: Date, random: (n: number) => number = cryptoRandom): string {
  const yymm = `${String(date.getUTCFullYear() % 100).padStart(2, '0')}${String(date.getUTCMonth() + 1).padStart(2, '0')}`;
  let body = '';
  for (let i = 0; i < 5; i++) body += A[random(N)];
  const check = checkSymbol(yymm + body);
  return `LP-${yymm}-${body.slice(0, 3)}-${body.slice(3)}${check}`;
}

/**
 * What a person typed or said, as a canonical number, or null when it cannot be one: any case, spaces or
 * dashes anywhere, "LP" optional.
 */
export function normalizeClaimNumber(text: string): string | null {
  const s = text.toUpperCase().replace(/[\s-]/g, '');
  const m = /^(?:LP)?(\d{4})([A-Z0-9]{6})$/.exec(s);
  if (!m) return null;
  const canonical = `LP-${m[1]}-${m[2].slice(0, 3)}-${m[2].slice(3)}`;
  return isValidClaimNumber(canonical) ? canonical : null;
}

/** The shape is right and the check character matches. */
export function isValidClaimNumber(n: string): boolean {
  if (!CLAIM_NUMBER_PATTERN.test(n)) return false;
  const compact = n.slice(3).replace(/-/g, '');
  return checkSymbol(compact.slice(0, -1)) === compact.slice(-1);
}

function cryptoRandom(n: number): number {
  // Rejection sampling keeps every symbol equally likely.
  const buf = new Uint8Array(1);
  const limit = 256 - (256 % n);
  for (;;) {
    globalThis.crypto.getRandomValues(buf);
    if (buf[0] < limit) return buf[0] % n;
  }
}
