import type { ClaimWorkflowDto } from '../../../../../shared/claims/workflow';
import { Card, CardHeader } from '../../../../components/ui/card';
import { CalendarDate } from '../../../../components/ui/date-time';
import { DocLink } from './doc-link';

export function Returns({ wf }: { wf: ClaimWorkflowDto }) {
  if (!wf.returns.length) return null;
  return (
    <Card>
      <CardHeader title="Return authorisation" />
      <ul className="space-y-3 px-4 py-4 text-sm sm:px-5">
        {wf.returns.map((r) => (
          <li key={r.id} className="space-y-1">
            <p className="font-mono font-semibold">{r.number}</p>
            <p>
              Ship to {r.shipTo.name}, {r.shipTo.line1}, {r.shipTo.city} {r.shipTo.postalCode}{' '}
              {r.shipTo.country} by <CalendarDate value={r.shipBy} />
            </p>
            {r.shippedOn ? (
              <p>
                Shipped <CalendarDate value={r.shippedOn} /> with {r.carrier}, tracking {r.trackingNumber}
              </p>
            ) : (
              <p className="text-ink-600">Not shipped yet.</p>
            )}
            {r.receivedOn ? (
              <p>
                Received <CalendarDate value={r.receivedOn} /> ({r.receivedCondition?.replace(/_/g, ' ')})
              </p>
            ) : null}
            {r.packingSlip ? <DocLink doc={r.packingSlip} label="Download the packing slip" /> : null}
          </li>
        ))}
      </ul>
    </Card>
  );
}
