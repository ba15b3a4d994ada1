import { DENIAL_CODE_LABELS, RESOLUTION_LABELS } from '../../../../../shared/claims/actions.schema';
import type { ClaimWorkflowDto } from '../../../../../shared/claims/workflow';
import { Card, CardHeader } from '../../../../components/ui/card';
import { useDateText } from '../../../../components/ui/date-time';
import { DocLink } from './doc-link';
import { REPAIR_CAUTION } from './repair-caution';

export function DecisionCard({ wf }: { wf: ClaimWorkflowDto }) {
  const d = wf.decision;
  const dates = useDateText();
  if (!d) return null;
  return (
    <Card>
      <CardHeader title="Decision" description={`${d.decidedBy}, ${dates.dateTime(d.decidedAt)}`} />
      <div className="space-y-2 px-4 py-4 text-sm sm:px-5">
        <p className="text-base font-semibold">
          {d.outcome === 'denied'
            ? 'Denied'
            : d.outcome === 'partly_approved'
              ? 'Partly approved'
              : 'Approved'}
          {d.resolution ? ` · ${RESOLUTION_LABELS[d.resolution]} · ${d.amount} ${d.currency}` : ''}
        </p>
        {d.reasonCodes.length ? (
          <ul className="list-disc pl-5">
            {d.reasonCodes.map((c) => (
              <li key={c}>{DENIAL_CODE_LABELS[c]}</li>
            ))}
          </ul>
        ) : null}
        {d.note ? <p className="whitespace-pre-wrap">{d.note}</p> : null}
        {d.overrideReason ? (
          <p className="text-ink-700">Why it departs from the screening: {d.overrideReason}</p>
        ) : null}
        {d.resolution === 'repair_allowance' ? (
          <p role="note" className="rounded-lg border border-warn-300 bg-warn-50 p-3 text-warn-900">
            {REPAIR_CAUTION}
          </p>
        ) : null}
        {d.letter ? <DocLink doc={d.letter} label="Download the determination letter" /> : null}
      </div>
    </Card>
  );
}
