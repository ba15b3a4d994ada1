import crypto from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import { SMTPServer } from 'smtp-server';

export type ReceivedMail = { id: string; from: string; to: string[]; raw: string; receivedAt: Date };

/**
 * A local stand-in for a mail relay: accepts every message on 127.0.0.1, keeps it in memory and, when a folder
 * is given, as an .eml file there (the demo's mailbox page reads that folder).
 */
export async function startFakeSmtp(opts: { port: number; host?: string; dir?: string }) {
  const received: ReceivedMail[] = [];
  if (opts.dir) fs.mkdirSync(opts.dir, { recursive: true });
  const server = new SMTPServer({
    secure: false,
    authOptional: true,
    disabledCommands: ['STARTTLS'],
    logger: false,
    size: 30 * 1024 * 1024,
    onData(stream, session, callback) {
      const chunks: Buffer[] = [];
      stream.on('data', (c: Buffer) => chunks.push(c));
      stream.on('end', () => {
        const raw = Buffer.concat(chunks).toString('utf8');
        const id = `${Date.now().toString().padStart(14, '0')}-${crypto.randomBytes(4).toString('hex')}`;
        const mail: ReceivedMail = {
          id,
          from: session.envelope.mailFrom ? session.envelope.mailFrom.address : '',
          to: session.envelope.rcptTo.map((r) => r.address.toLowerCase()),
          raw,
          receivedAt: new Date(),
        };
        received.push(mail);
        if (opts.dir) fs.writeFileSync(path.join(opts.dir, `${id}.eml`), raw);
        callback();
      });
    },
  });
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(opts.port, opts.host ?? '127.0.0.1', () => resolve());
  });
  const address = server.server.address();
  const port = typeof address === 'object' && address ? address.port : opts.port;
  return {
    port,
    received,
    close: () => new Promise<void>((resolve) => server.close(() => resolve())),
  };
}
