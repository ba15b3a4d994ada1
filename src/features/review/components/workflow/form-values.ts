// How the bench and receipt forms read their boxes before the move's own schema (the one the server checks)
// judges them: a blank note is no note, a blank reading is no reading.

export const blankToUndefined = (v: unknown) => (typeof v === 'string' && v.trim() === '' ? undefined : v);
export const numberOrUndefined = (v: unknown) =>
  v === '' || v === null || v === undefined
    ? undefined
    : typeof v === 'number'
      ? v
      : Number(String(v).trim());
