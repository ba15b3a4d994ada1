import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { Download } from 'lucide-react';
import { useState, type FormEvent } from 'react';
import { Link } from 'react-router';
import { STAGE_LABELS } from '../../../../shared/claims/stages';
import {
  AGEING_BUCKETS,
  AGEING_STAGES,
  type AgeingRowDto,
  type AgeingStage,
  type StageTargets,
} from '../../../../shared/schemas/ageing';
import { Button, buttonClasses } from '../../../components/ui/button';
import { Card, CardHeader } from '../../../components/ui/card';
import { InputField } from '../../../components/ui/field';
import { Spinner } from '../../../components/ui/spinner';
import { Table, Td, Th } from '../../../components/ui/table';
import { useToast } from '../../../components/ui/toast';
import { ApiError } from '../../../lib/api-client';
import { cn } from '../../../lib/cn';
import { AGEING_CSV_URL, ageingQueries, setStageTargets } from '../api/ageing-queries';

const BUCKET_LABEL: Record<(typeof AGEING_BUCKETS)[number], string> = {
  '0-7': '0–7 days',
  '8-14': '8–14 days',
  '15-30': '15–30 days',
  '>30': 'Over 30 days',
};

function Counts({ row }: { row: AgeingRowDto }) {
  return (
    <>
      {AGEING_BUCKETS.map((b) => (
        <Td key={b} className="tabular-nums">
          {row.counts[b]}
        </Td>
      ))}
      <Td className="font-semibold tabular-nums">{row.total}</Td>
      <Td className={cn('tabular-nums', row.overTarget > 0 && 'bg-warn-50 font-semibold text-warn-900')}>
        {row.overTarget}
      </Td>
    </>
  );
}

const Heads = () => (
  <>
    {AGEING_BUCKETS.map((b) => (
      <Th key={b}>{BUCKET_LABEL[b]}</Th>
    ))}
    <Th>Total</Th>
    <Th>Past target</Th>
  </>
);

/** Open claims by stage and by how long they have waited, per reviewer, against the organisation's targets. */
export function AgeingView() {
  const { data, isPending, isError } = useQuery(ageingQueries.view());
  if (isPending) return <Spinner label="Loading the ageing" />;
  if (isError) return <p role="alert">The ageing could not be loaded. Try again in a moment.</p>;
  return (
    <div className="space-y-5">
      <Card>
        <CardHeader
          title="By stage"
          description="Whole days each open claim has waited in its stage. Past target: longer than your target for that stage."
          actions={
            <a href={AGEING_CSV_URL} download className={buttonClasses('secondary', 'sm')}>
              <Download className="size-4" aria-hidden /> Download CSV
            </a>
          }
        />
        <Table caption="Open claims by stage and days waited">
          <thead>
            <tr>
              <Th>Stage</Th>
              <Th>Target</Th>
              <Heads />
            </tr>
          </thead>
          <tbody className="divide-y divide-ink-100">
            {data.byStage.map((s) => (
              <tr key={s.stage}>
                <Th scope="row" className="bg-white text-left normal-case">
                  {STAGE_LABELS[s.stage]}
                </Th>
                <Td>{s.target === null ? 'None' : `${s.target} days`}</Td>
                <Counts row={s} />
              </tr>
            ))}
          </tbody>
        </Table>
      </Card>
      <Card>
        <CardHeader title="By reviewer" description="Who has the claims that wait." />
        <Table caption="Open claims by reviewer and days waited">
          <thead>
            <tr>
              <Th>Reviewer</Th>
              <Heads />
            </tr>
          </thead>
          <tbody className="divide-y divide-ink-100">
            {data.byReviewer.map((r) => (
              <tr key={r.reviewerId ?? 'nobody'}>
                <Th scope="row" className="bg-white text-left normal-case">
                  {r.reviewer}
                </Th>
                <Counts row={r} />
              </tr>
            ))}
          </tbody>
        </Table>
      </Card>
      <Card>
        <CardHeader
          title={`Past target (${data.overdue.length})`}
          description="Longest first. Each opens the claim."
        />
        {data.overdue.length ? (
          <ul aria-label="Claims past target" className="divide-y divide-ink-100">
            {data.overdue.map((c) => (
              <li key={c.id} className="bg-warn-50">
                <Link
                  to={`/claims/${c.id}`}
                  className="flex min-h-11 flex-wrap items-center gap-x-3 px-4 py-2 text-sm hover:bg-warn-100 sm:px-5"
                >
                  <span className="font-mono font-semibold">{c.number}</span>
                  <span>{STAGE_LABELS[c.stage]}</span>
                  <span className="font-semibold text-warn-900">{c.days} days</span>
                  <span className="text-ink-700">{c.reviewer ?? 'Nobody yet'}</span>
                </Link>
              </li>
            ))}
          </ul>
        ) : (
          <p className="px-4 py-4 text-sm text-ink-700 sm:px-5">No claim is past its stage&apos;s target.</p>
        )}
      </Card>
      <TargetsForm targets={data.targets} />
    </div>
  );
}

/** The organisation's target days per stage; an empty field means no target. */
function TargetsForm({ targets }: { targets: StageTargets }) {
  const qc = useQueryClient();
  const { notify } = useToast();
  const [text, setText] = useState<Record<AgeingStage, string>>(
    () =>
      Object.fromEntries(AGEING_STAGES.map((s) => [s, targets[s]?.toString() ?? ''])) as Record<
        AgeingStage,
        string
      >,
  );
  const save = useMutation({
    mutationFn: () =>
      setStageTargets(
        Object.fromEntries(
          AGEING_STAGES.filter((s) => text[s].trim() !== '').map((s) => [s, Number(text[s].trim())]),
        ) as StageTargets,
      ),
    onSuccess: async (view) => {
      qc.setQueryData(ageingQueries.view().queryKey, view);
      notify('Targets saved.');
    },
  });
  const err = save.error instanceof ApiError ? save.error : null;
  const submit = (e: FormEvent) => {
    e.preventDefault();
    save.mutate();
  };
  return (
    <Card>
      <CardHeader
        title="Targets"
        description="The most days a claim should wait in each stage. Leave empty for none."
      />
      <form className="space-y-4 px-4 py-4 sm:px-5" onSubmit={submit}>
        {err ? (
          <p role="alert" className="rounded-lg bg-bad-50 px-3 py-2 text-sm text-bad-800">
            {err.details[0]?.message ?? err.message}
          </p>
        ) : null}
        <div className="grid gap-3 sm:grid-cols-3">
          {AGEING_STAGES.map((s) => (
            <InputField
              key={s}
              label={STAGE_LABELS[s]}
              unit="days"
              inputMode="numeric"
              value={text[s]}
              onChange={(e) => setText((t) => ({ ...t, [s]: e.target.value }))}
            />
          ))}
        </div>
        <Button type="submit" loading={save.isPending}>
          Save targets
        </Button>
      </form>
    </Card>
  );
}
