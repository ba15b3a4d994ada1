import type { EntityManager } from 'typeorm';
import { formatCalendarDate } from '../../../shared/dates';
import type { WaitingOn } from '../../../shared/schemas/claims';
import type { Claim } from '../../db/entities/claim.entity';
import type { OutboxAttachment } from '../../db/entities/outbox-message.entity';
import { enqueueEmail } from '../../lib/outbox';
import type { Recipient } from '../claims/recipients';
import type { ClaimParties } from './claim-documents';

/** What a claim-update e-mail says. */
export type ClaimUpdateView = {
  headline: string;
  intro?: string;
  quote?: string;
  /** A detail with `date` is a calendar date, written for the recipient's organisation (shared/dates.ts). */
  details?: ({ label: string; value: string } | { label: string; date: string })[];
  nextStep?: string;
  attachments?: OutboxAttachment[];
};

/** Queues the claim-update e-mail to one side of the claim, linking to that side's page of it. */
export async function notifyClaim(
  m: EntityManager,
  publicUrl: (path: string) => string,
  claim: Claim,
  parties: ClaimParties,
  side: WaitingOn,
  to: Recipient[],
  view: ClaimUpdateView,
) {
  if (to.length === 0) return;
  const recipientOrg = side === 'manufacturer' ? parties.manufacturer : parties.contractor;
  const details = view.details?.map((d) =>
    'date' in d ? { label: d.label, value: formatCalendarDate(d.date, recipientOrg, 'long') } : d,
  );
  await enqueueEmail(m, {
    to: to.map((r) => r.email),
    template: 'claim-update',
    view: {
      claimNumber: claim.number ?? 'draft',
      productText: `${parties.product.modelNumber} ${parties.product.name}`,
      siteName: parties.installation.siteName,
      details: [],
      attachmentNote: view.attachments?.length
        ? `Attached: ${view.attachments.map((a) => a.filename).join(', ')}. The same file is on the claim in Lumenproof.`
        : undefined,
      link: publicUrl(side === 'manufacturer' ? `/review/${claim.id}` : `/claims/${claim.id}/workflow`),
      ...view,
      ...(details ? { details } : {}),
    },
    attachments: view.attachments,
  });
}
