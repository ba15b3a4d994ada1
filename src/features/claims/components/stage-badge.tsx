import { CLAIM_STAGE_LABELS, type ClaimStage, type WaitingOn } from '../../../../shared/schemas/claims';
import { Badge, type Tone } from '../../../components/ui/badge';

const TONES: Record<ClaimStage, Tone> = {
  draft: 'neutral',
  filed: 'info',
  in_review: 'info',
  needs_info: 'warn',
  return_requested: 'warn',
  unit_received: 'info',
  approved: 'ok',
  denied: 'bad',
  credited: 'ok',
  closed: 'neutral',
  withdrawn: 'neutral',
};

export function StageBadge({ stage }: { stage: ClaimStage }) {
  return <Badge tone={TONES[stage]}>{CLAIM_STAGE_LABELS[stage]}</Badge>;
}

/** What the claim waits for, in the installer's words. */
export function waitingText(stage: ClaimStage, waitingOn: WaitingOn | null): string {
  if (stage === 'draft') return 'Waiting for you to finish and file it';
  if (stage === 'needs_info') return 'The manufacturer asked you for more information';
  if (stage === 'return_requested') return 'Ship the failed unit back';
  if (stage === 'approved') return 'Approved: waiting for the credit';
  if (waitingOn === 'contractor') return 'Waiting on you';
  if (waitingOn === 'manufacturer') return 'Waiting on the manufacturer';
  return 'Nothing to do';
}
