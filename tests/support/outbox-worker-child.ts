// A stand-alone outbox worker for the crash test: sends slowly (so that it can be killed mid-batch), takes only the
// messages in ONLY_IDS when given, and, with UNTIL_SENT_FROM, exits once every message from that id on (of those)
// has been sent. With KILL_AFTER_SENDS=n it SIGKILLs itself as soon as its n-th message has gone out and before
// that message is marked sent, so the kill always lands in the middle of a leased batch.
import type { Transporter } from 'nodemailer';
import { In, MoreThanOrEqual } from 'typeorm';
import { loadConfig } from '../../server/config/env';
import { createDataSource } from '../../server/db/data-source';
import { OutboxMessage } from '../../server/db/entities/outbox-message.entity';
import { createTransport, deliverDue } from '../../server/lib/outbox';

const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));
const config = loadConfig({ ...process.env, NODE_ENV: 'test', LOG_LEVEL: 'silent' });
const ds = createDataSource(process.env.DATABASE_URL!, { poolSize: 2 });
await ds.initialize();
const real = createTransport(config);
const delay = Number(process.env.SEND_DELAY_MS ?? 150);
const killAfter = Number(process.env.KILL_AFTER_SENDS ?? 0);
let sends = 0;
const slow = {
  sendMail: async (msg: Parameters<Transporter['sendMail']>[0]) => {
    await sleep(delay);
    const info = await real.sendMail(msg);
    sends += 1;
    if (killAfter && sends >= killAfter) process.kill(process.pid, 'SIGKILL');
    return info;
  },
} as unknown as Transporter;
const from = process.env.UNTIL_SENT_FROM;
const only = process.env.ONLY_IDS ? process.env.ONLY_IDS.split(',') : undefined;
for (;;) {
  await deliverDue(ds, slow, {
    from: config.smtp.from,
    batch: 10,
    leaseMs: Number(process.env.LEASE_MS ?? 2000),
    ids: only,
  });
  if (from) {
    const left = await ds
      .getRepository(OutboxMessage)
      .count({ where: { id: only ? In(only) : MoreThanOrEqual(from), status: 'pending' } });
    if (left === 0) break;
  }
  await sleep(200);
}
real.close();
await ds.destroy();
