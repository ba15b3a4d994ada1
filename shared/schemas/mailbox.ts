import { z } from 'zod';
import { instantSchema } from './answer-parts';

// Demo mode's mailbox (GET /api/mailbox): what the local fake SMTP server received for the organisation.

export const mailboxMessageSchema = z.object({
  /** The stored .eml file's name without its extension. */
  id: z.string(),
  receivedAt: instantSchema,
  from: z.string(),
  to: z.array(z.string()),
  subject: z.string(),
  text: z.string(),
  html: z.string().nullable(),
  attachments: z.array(
    z.object({ filename: z.string(), contentType: z.string(), size: z.number().int().min(0) }),
  ),
});
export type MailboxMessage = z.infer<typeof mailboxMessageSchema>;
