import fs from 'node:fs/promises';
import path from 'node:path';
import { simpleParser } from 'mailparser';
import type { AppDataSource } from '../../db/data-source';
import { readRows } from '../../db/read';
import type { MailboxMessage } from '../../../shared/schemas/mailbox';

export type { MailboxMessage };

// Reads what the local fake SMTP server (scripts/fake-smtp.ts) stored: one .eml file per message.
export async function readMailbox(dir: string, limit = 200): Promise<MailboxMessage[]> {
  let files: string[];
  try {
    files = (await fs.readdir(dir)).filter((f) => f.endsWith('.eml'));
  } catch {
    return [];
  }
  files.sort().reverse();
  const out: MailboxMessage[] = [];
  for (const file of files.slice(0, limit)) {
    const parsed = await simpleParser(await fs.readFile(path.join(dir, file)));
    const toField = Array.isArray(parsed.to) ? parsed.to : parsed.to ? [parsed.to] : [];
    out.push({
      id: file.replace(/\.eml$/, ''),
      receivedAt: (parsed.date ?? new Date(0)).toISOString(),
      from: parsed.from?.text ?? '',
      to: toField.flatMap((a) => a.value.map((v) => (v.address ?? '').toLowerCase())),
      subject: parsed.subject ?? '',
      text: parsed.text ?? '',
      html: typeof parsed.html === 'string' ? parsed.html : null,
      attachments: parsed.attachments.map((a) => ({
        filename: a.filename ?? 'attachment',
        contentType: a.contentType,
        size: a.size,
      })),
    });
  }
  return out;
}

/** What the fake SMTP server received for any member of the organisation (demo mode's mailbox page). */
export async function organizationMailbox(ds: AppDataSource, dir: string, organizationId: string) {
  const members = await readRows<{ email: string }>(ds, 'SELECT email FROM users WHERE organization_id = ?', [
    organizationId,
  ]);
  const emails = new Set(members.map((m) => m.email.toLowerCase()));
  return (await readMailbox(dir)).filter((m) => m.to.some((t) => emails.has(t)));
}
