import { Writable } from 'node:stream';
import pino from 'pino';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { inject } from 'vitest';
import { createDataSource, type AppDataSource } from '../../server/db/data-source';
import { PinoQueryLogger } from '../../server/db/query-logger';

// The production DataSource's logging (server/db/query-logger.ts): failed and slow statements reach pino, with
// their SQL but never their parameters.

const lines: Record<string, unknown>[] = [];
let ds: AppDataSource;

beforeAll(async () => {
  const sink = new Writable({
    write(chunk, _enc, done) {
      for (const l of String(chunk).split('\n').filter(Boolean)) lines.push(JSON.parse(l));
      done();
    },
  });
  const log = pino({ level: 'info' }, sink);
  ds = createDataSource(inject('databaseUrl'), {
    poolSize: 2,
    logger: new PinoQueryLogger(log),
    slowQueryMs: 50,
  });
  await ds.initialize();
});
afterAll(() => ds?.destroy());

describe('PinoQueryLogger', () => {
  it('logs a failed statement as an error with its SQL, never its parameters', async () => {
    await expect(
      ds.query('SELECT * FROM no_such_table WHERE token = ?', ['secret-token-value']),
    ).rejects.toThrow();
    const failed = lines.find((l) => l.msg === 'query failed');
    expect(failed).toMatchObject({
      level: 50,
      sql: 'SELECT * FROM no_such_table WHERE token = ?',
      params: 1,
    });
    expect(JSON.stringify(lines)).not.toContain('secret-token-value');
  });

  it('logs a duplicate key, which the services answer themselves, only at debug', async () => {
    const before = lines.length;
    // One connection for the temporary table: a transaction's manager.
    await ds.transaction(async (m) => {
      await m.query('CREATE TEMPORARY TABLE ql_dup (k VARCHAR(40) PRIMARY KEY)');
      await m.query('INSERT INTO ql_dup VALUES (?)', ['a@example.test']);
      await expect(m.query('INSERT INTO ql_dup VALUES (?)', ['a@example.test'])).rejects.toThrow();
    });
    expect(lines.slice(before).filter((l) => (l.level as number) >= 30)).toEqual([]);
  });

  it('logs a statement slower than slowQueryMs as a warning, and a quick one not at all', async () => {
    await ds.query('SELECT 1 AS quick');
    await ds.query('SELECT SLEEP(0.1) AS slow');
    const slow = lines.filter((l) => l.msg === 'slow query');
    expect(slow.find((l) => l.sql === 'SELECT SLEEP(0.1) AS slow')).toMatchObject({ level: 40 });
    expect(slow.find((l) => l.sql === 'SELECT SLEEP(0.1) AS slow')!.ms as number).toBeGreaterThanOrEqual(50);
    expect(lines.some((l) => String(l.sql).includes('quick'))).toBe(false);
  });
});
