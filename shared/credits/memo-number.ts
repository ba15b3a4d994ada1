// Credit memo numbers: CM-ALD-2026-000042. The manufacturer's code (letters of its name, a digit added when
// another manufacturer holds them), the year of issue, and a sequence per manufacturer and year, so that an
// accounting system sees gap-free numbers it can reconcile.

export const MEMO_NUMBER_PATTERN = /^CM-[A-Z]{3}\d{0,2}-\d{4}-\d{6}$/;

/** ALD from "Aldercrest Lighting"; letters only, accents dropped; "MFR" when the name has no letters. */
export function baseCode(name: string): string {
  const letters = name
    .normalize('NFKD')
    .replace(/[^A-Za-z]/g, '')
    .toUpperCase();
  return (letters + 'XXX').slice(0, 3) === 'XXX' ? 'MFR' : (letters + 'XXX').slice(0, 3);
}

/** The n-th candidate code: ALD, ALD2, ALD3, … */
export function codeCandidate(name: string, attempt: number): string {
  return attempt <= 1 ? baseCode(name) : `${baseCode(name)}${attempt}`;
}

export function formatMemoNumber(code: string, year: number, sequence: number): string {
  return `CM-${code}-${year}-${String(sequence).padStart(6, '0')}`;
}
