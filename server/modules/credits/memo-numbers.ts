import type { EntityManager } from 'typeorm';
import { codeCandidate, formatMemoNumber } from '../../../shared/credits/memo-number';
import { MemoPrefix } from '../../db/entities/memo-sequence.entity';

const isDuplicate = (err: unknown) => {
  const e = err as { errno?: number; driverError?: { errno?: number } };
  return (e.driverError?.errno ?? e.errno) === 1062;
};

/** The manufacturer's letters, chosen on its first memo: ALD, or ALD2 when another manufacturer holds ALD. */
async function prefixFor(m: EntityManager, manufacturerId: string, name: string): Promise<string> {
  const found = await m.findOne(MemoPrefix, { where: { manufacturerId } });
  if (found) return found.code;
  for (let attempt = 1; attempt <= 99; attempt++) {
    const code = codeCandidate(name, attempt);
    try {
      // A failed INSERT rolls back only itself in MariaDB; the transaction goes on.
      await m.insert(MemoPrefix, { manufacturerId, code });
      return code;
    } catch (err) {
      if (!isDuplicate(err)) throw err;
      const mine = await m.findOne(MemoPrefix, { where: { manufacturerId } });
      if (mine) return mine.code; // a concurrent first memo of ours chose it
    }
  }
  throw new Error(`no free memo prefix for ${name}`);
}

/**
 * The next number for this manufacturer and year, inside the caller's transaction: the sequence row is locked
 * (created first if the year is new) until the transaction ends, so numbers are unique and gap-free among
 * committed memos.
 */
export async function nextMemoNumber(
  m: EntityManager,
  manufacturer: { id: string; name: string },
  year: number,
) {
  const code = await prefixFor(m, manufacturer.id, manufacturer.name);
  await m.query(
    'INSERT INTO memo_sequences (manufacturer_id, year, next_value) VALUES (?, ?, 1) ON DUPLICATE KEY UPDATE next_value = next_value',
    [manufacturer.id, year],
  );
  const rows: { next_value: number | string }[] = await m.query(
    'SELECT next_value FROM memo_sequences WHERE manufacturer_id = ? AND year = ? FOR UPDATE',
    [manufacturer.id, year],
  );
  const seq = Number(rows[0].next_value);
  await m.query(
    'UPDATE memo_sequences SET next_value = next_value + 1 WHERE manufacturer_id = ? AND year = ?',
    [manufacturer.id, year],
  );
  return formatMemoNumber(code, year, seq);
}
