import type { EntityManager } from 'typeorm';

// Tests only: named points inside transactions (and around file writes) where the crash-safety test holds the
// server and kills it with SIGKILL. A point is armed only when NODE_ENV=test and TEST_CRASH_POINT names it
// (server/config/env.ts); otherwise crashPoint is one string comparison.
//
// When the armed point is reached the server prints one line to stdout, {"crashPoint": name, "connectionId": n}
// (the database connection whose transaction is open there, if any), and then waits forever: the transaction
// stays open, uncommitted, until the process dies and the database rolls it back.

let armed: string | null = null;

export function armCrashPoint(name: string | null | undefined) {
  armed = name || null;
}

export async function crashPoint(name: string, m?: EntityManager): Promise<void> {
  if (armed === null || armed !== name) return;
  let connectionId: number | null = null;
  if (m) {
    const rows = (await m.query('SELECT CONNECTION_ID() AS id')) as { id: number | string }[];
    connectionId = Number(rows[0].id);
  }
  process.stdout.write(`${JSON.stringify({ crashPoint: name, connectionId })}\n`);
  await new Promise<never>(() => {
    setInterval(() => undefined, 60_000);
  });
}
