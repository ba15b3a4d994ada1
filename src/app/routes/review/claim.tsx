import { useQuery } from '@tanstack/react-query';
import { useState } from 'react';
import { Link, useParams } from 'react-router';
import { STAGE_LABELS } from '../../../../shared/claims/stages';
import { Card, CardHeader } from '../../../components/ui/card';
import { PageHeader } from '../../../components/ui/page-header';
import { Spinner } from '../../../components/ui/spinner';
import { EvaluationPanel } from '../../../features/evaluation/components/evaluation-panel';
import { reviewQueries } from '../../../features/review/api/review-queries';
import {
  Assignment,
  DecisionCard,
  Returns,
  ReviewActions,
  Thread,
} from '../../../features/review/components/claim-workflow';
import { useSession } from '../../../lib/ability';
import { CalendarDate, DateTime, useDateText } from '../../../components/ui/date-time';
import type { LoaderFunctionArgs } from 'react-router';
import { prefetched, queryClient } from '../../query-client';

/** The claim and its workflow are needed before anything draws: fetched together while the route loads. */
export const loader = ({ params }: LoaderFunctionArgs) =>
  prefetched(
    queryClient.ensureQueryData(reviewQueries.detail(params.id ?? '')),
    queryClient.ensureQueryData(reviewQueries.workflow(params.id ?? '')),
  );

/** The review screen: the evidence on the left, the engine's findings and the moves on the right (one column on a phone). */
export function ReviewClaimRoute() {
  const { id = '' } = useParams();
  const claim = useQuery(reviewQueries.detail(id));
  const wf = useQuery(reviewQueries.workflow(id));
  const [zoom, setZoom] = useState<string | null>(null);
  const me = useSession().user.id;
  const dates = useDateText();
  if (claim.isPending || wf.isPending) return <Spinner label="Loading the claim" />;
  if (claim.isError || wf.isError)
    return <p className="text-bad-700">This claim does not exist or is not shared with you.</p>;
  const c = claim.data;
  const w = wf.data;
  const latestBench = w.benchTests.at(-1);
  const m = c.measurements;
  return (
    <>
      <PageHeader
        title={`Claim ${c.number ?? ''}`}
        description={`${c.contractor.name} · ${c.product.modelNumber} ${c.product.name} · ${STAGE_LABELS[w.claim.stage]}`}
        actions={
          <Link to="/review" className="text-sm text-brand-700 underline">
            Back to the desk
          </Link>
        }
      />
      <div className="grid gap-4 lg:grid-cols-2">
        <div className="space-y-4">
          <Card>
            <CardHeader
              title="What the installer reports"
              description={`Failed ${c.failedOn ?? 'unknown'} · ${c.units} ${c.units === 1 ? 'unit' : 'units'} · serials ${c.serials.join(', ') || 'none'}`}
            />
            <div className="space-y-3 px-4 py-4 text-sm sm:px-5">
              <p className="whitespace-pre-wrap">{c.narrative}</p>
              <dl className="grid grid-cols-2 gap-2">
                {[
                  ['Supply', m.supplyVolts, 'V'],
                  ['Input power', m.inputWatts, 'W'],
                  ['Power factor', m.powerFactor, ''],
                  ['Driver output', m.driverOutputVolts, 'V'],
                  ['Driver current', m.driverOutputAmps, 'A'],
                ].map(([k, v, u]) => (
                  <div key={k as string}>
                    <dt className="text-ink-600">{k}</dt>
                    <dd className="tabular-nums">{v === undefined || v === null ? '—' : `${v} ${u}`}</dd>
                  </div>
                ))}
              </dl>
            </div>
          </Card>
          <Card>
            <CardHeader title="Photos and documents" description="Select a photo to see it full size." />
            <ul className="flex flex-wrap gap-2 px-4 py-4 sm:px-5">
              {c.attachments.map((a) => (
                <li key={a.id}>
                  {a.contentType.startsWith('image/') ? (
                    <button
                      type="button"
                      onClick={() => setZoom(zoom === a.contentUrl ? null : a.contentUrl)}
                      aria-label={`Zoom ${a.name}`}
                      className="rounded focus-visible:ring-2 focus-visible:ring-brand-600"
                    >
                      <img
                        src={a.contentUrl}
                        alt={a.name}
                        className="h-28 rounded border border-ink-200 object-cover"
                      />
                    </button>
                  ) : (
                    <a href={a.contentUrl} className="text-brand-700 underline">
                      {a.name}
                    </a>
                  )}
                </li>
              ))}
              {c.attachments.length === 0 ? <li className="text-sm text-ink-600">No files.</li> : null}
            </ul>
            {zoom ? (
              <img
                src={zoom}
                alt="The selected photo, full size"
                className="w-full border-t border-ink-200"
                onClick={() => setZoom(null)}
              />
            ) : null}
          </Card>
          <Card>
            <CardHeader title="Installation and ratings" />
            <dl className="grid grid-cols-2 gap-2 px-4 py-4 text-sm sm:px-5">
              <div>
                <dt className="text-ink-600">Site</dt>
                <dd>
                  {c.installationDetail.siteName}, {c.installationDetail.siteCity}
                </dd>
              </div>
              <div>
                <dt className="text-ink-600">Installed</dt>
                <dd>
                  <CalendarDate value={c.installationDetail.installDate} />
                </dd>
              </div>
              <div>
                <dt className="text-ink-600">Conditions</dt>
                <dd>
                  {c.engineContext.installation.location},{' '}
                  {c.engineContext.installation.enclosure.replace('_', ' ')}, dimmer{' '}
                  {c.engineContext.installation.dimmer}, {c.engineContext.installation.nominalSupplyVolts} V,{' '}
                  {c.engineContext.installation.ambientC} °C
                </dd>
              </div>
              <div>
                <dt className="text-ink-600">Rated</dt>
                <dd>
                  {c.engineContext.product.ratedInputWatts} W, {c.engineContext.product.inputVoltage.min}–
                  {c.engineContext.product.inputVoltage.max} V, {c.engineContext.product.location}, up to{' '}
                  {c.engineContext.product.ambientMaxC} °C
                </dd>
              </div>
            </dl>
          </Card>
          <Thread wf={w} />
          <Returns wf={w} />
        </div>
        <div className="space-y-4">
          <Card>
            <CardHeader title="Who has it" />
            <div className="px-4 py-4 sm:px-5">
              <Assignment wf={w} meId={me} />
            </div>
          </Card>
          <ReviewActions wf={w} evaluation={latestBench?.evaluation ?? c.evaluation} units={c.units} />
          <DecisionCard wf={w} />
          {latestBench ? (
            <Card>
              <CardHeader
                title="Engine on the bench readings"
                description={`Tested ${dates.calendar(latestBench.testedOn)} by ${latestBench.testedBy}: ${latestBench.result.replace(/_/g, ' ')}`}
              />
              <div className="p-4">
                <EvaluationPanel evaluation={latestBench.evaluation} />
              </div>
            </Card>
          ) : null}
          <Card>
            <CardHeader title="Engine at filing" description="Each finding with the reference it rests on." />
            <div className="p-4">
              <EvaluationPanel evaluation={c.evaluation} />
            </div>
          </Card>
          <Card>
            <CardHeader title="History" />
            <ol className="space-y-1 px-4 py-4 text-sm sm:px-5">
              {w.history.map((h) => (
                <li key={h.id}>
                  <DateTime value={h.occurredAt} className="text-ink-600" /> ·{' '}
                  {h.action.replace('claim.', '').replace(/_/g, ' ')}
                  {h.actor ? ` · ${h.actor.name}` : ''}
                </li>
              ))}
            </ol>
          </Card>
        </div>
      </div>
    </>
  );
}
