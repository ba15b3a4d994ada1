import { useState, type FormEvent } from 'react';
import {
  BENCH_DENIAL_CODE,
  BENCH_RESULT_LABELS,
  DENIAL_CODE_LABELS,
  DENIAL_CODES,
  RESOLUTION_LABELS,
  RESOLUTIONS,
  type BenchResult,
  type DenialCode,
  type Resolution,
} from '../../../../../shared/claims/actions.schema';
import { overrideReasonsFor, STAGE_LABELS, type ClaimActionName } from '../../../../../shared/claims/stages';
import type { ClaimWorkflowDto } from '../../../../../shared/claims/workflow';
import type { Evaluation } from '../../../../../shared/engine/schema';
import { Badge } from '../../../../components/ui/badge';
import { Button } from '../../../../components/ui/button';
import { Card, CardHeader } from '../../../../components/ui/card';
import { InputField, SelectField } from '../../../../components/ui/field';
import { BenchTestForm } from './bench-test-form';
import { ErrorText } from './error-text';
import { ReceiveUnitForm } from './receive-unit-form';
import { REPAIR_CAUTION } from './repair-caution';
import { TextArea } from './text-area';
import { useMove } from './use-move';

/** The reviewer's moves, each a small form; approve and deny say when a written reason is needed and why. */
export function ReviewActions({
  wf,
  evaluation,
  units,
}: {
  wf: ClaimWorkflowDto;
  evaluation: Evaluation | null;
  units: number;
}) {
  const move = useMove(wf.claim.id, wf.claim.version);
  const [open, setOpen] = useState<ClaimActionName | null>(null);
  const [text, setText] = useState('');
  const [resolution, setResolution] = useState<Resolution>('replace');
  const [amount, setAmount] = useState(evaluation?.computed.credit ?? '');
  const [reason, setReason] = useState('');
  const [codes, setCodes] = useState<DenialCode[]>([]);
  const [addr, setAddr] = useState({ name: '', line1: '', city: '', postalCode: '', country: 'US' });
  const latestBench = wf.benchTests.length ? wf.benchTests[wf.benchTests.length - 1] : null;
  const benchResult = (latestBench?.result as BenchResult | undefined) ?? null;
  const view = {
    stage: wf.claim.stage,
    contractorId: '',
    manufacturerId: '',
    benchResult,
    evaluation: evaluation ? { verdict: evaluation.verdict, computed: evaluation.computed } : null,
  };
  const choose = (a: ClaimActionName) => {
    setOpen(a);
    // The bench's finding points to a denial reason; offer it ticked (the reviewer may untick it).
    const suggested = benchResult ? BENCH_DENIAL_CODE[benchResult] : null;
    if (a === 'deny' && suggested && codes.length === 0) setCodes([suggested]);
  };
  const why =
    open === 'approve'
      ? overrideReasonsFor(view, { action: 'approve', amount })
      : open === 'deny'
        ? overrideReasonsFor(view, { action: 'deny' })
        : [];
  const offered = wf.actions;

  function submit(e: FormEvent) {
    e.preventDefault();
    if (!open) return;
    const r = reason.trim() ? { overrideReason: reason.trim() } : {};
    const payloads: Partial<Record<ClaimActionName, unknown>> = {
      start_review: {},
      request_info: { message: text },
      request_return: { shipTo: addr, ...(text.trim() ? { instructions: text } : {}) },
      approve: { resolution, amount, ...(text.trim() ? { note: text } : {}), ...r },
      deny: { reasonCodes: codes, note: text, ...r },
      reopen: { reason: text },
      close: {},
    };
    move.run(open, payloads[open] ?? {});
  }

  return (
    <Card>
      <CardHeader
        title="Decide or ask"
        description={`${STAGE_LABELS[wf.claim.stage]} · ${units} ${units === 1 ? 'unit' : 'units'}`}
      />
      <div className="space-y-4 px-4 py-4 sm:px-5">
        <div className="flex flex-wrap gap-2" role="group" aria-label="Moves">
          {offered.map((a) => (
            <Button
              key={a}
              variant={open === a ? 'primary' : 'secondary'}
              onClick={() => choose(a)}
              aria-pressed={open === a}
            >
              {ACTION_LABEL[a] ?? a}
            </Button>
          ))}
          {offered.length === 0 ? (
            <p className="text-sm text-ink-600">Nothing for you to do at this stage.</p>
          ) : null}
        </div>
        {latestBench ? (
          <p className="text-sm text-ink-700" data-testid="latest-bench-result">
            Bench test {latestBench.testedOn}:{' '}
            {BENCH_RESULT_LABELS[benchResult as BenchResult] ?? latestBench.result}
          </p>
        ) : null}
        <ErrorText error={move.error} />
        {open === 'record_bench_test' ? (
          <BenchTestForm
            pending={move.pending}
            onSubmit={(p) => move.run('record_bench_test', p, () => setOpen(null))}
          />
        ) : open === 'receive_unit' ? (
          <ReceiveUnitForm
            pending={move.pending}
            onSubmit={(p) => move.run('receive_unit', p, () => setOpen(null))}
          />
        ) : open ? (
          <form className="space-y-3" onSubmit={submit} aria-label={ACTION_LABEL[open]}>
            {open === 'approve' ? (
              <>
                <SelectField
                  label="Resolution"
                  value={resolution}
                  onChange={(e) => setResolution(e.target.value as Resolution)}
                >
                  {RESOLUTIONS.map((r) => (
                    <option key={r} value={r}>
                      {RESOLUTION_LABELS[r]}
                    </option>
                  ))}
                </SelectField>
                {resolution === 'repair_allowance' ? (
                  <p
                    role="note"
                    className="rounded-lg border border-warn-300 bg-warn-50 p-3 text-sm text-warn-900"
                  >
                    {REPAIR_CAUTION}
                  </p>
                ) : null}
                <InputField
                  label="Amount"
                  unit={evaluation?.computed.currency}
                  value={amount}
                  onChange={(e) => setAmount(e.target.value)}
                  hint={`The engine's credit: ${evaluation?.computed.credit ?? 'none'}`}
                />
              </>
            ) : null}
            {open === 'deny' ? (
              <fieldset className="space-y-1">
                <legend className="text-sm font-medium">Reasons from the policy</legend>
                {DENIAL_CODES.map((c) => (
                  <label key={c} className="flex min-h-11 items-center gap-2 text-sm">
                    <input
                      type="checkbox"
                      checked={codes.includes(c)}
                      onChange={(e) =>
                        setCodes(e.target.checked ? [...codes, c] : codes.filter((x) => x !== c))
                      }
                    />
                    {DENIAL_CODE_LABELS[c]}
                  </label>
                ))}
              </fieldset>
            ) : null}
            {open === 'request_return' ? (
              <div className="grid gap-3 sm:grid-cols-2">
                <InputField
                  label="Ship to (name)"
                  value={addr.name}
                  onChange={(e) => setAddr({ ...addr, name: e.target.value })}
                />
                <InputField
                  label="Street"
                  value={addr.line1}
                  onChange={(e) => setAddr({ ...addr, line1: e.target.value })}
                />
                <InputField
                  label="City"
                  value={addr.city}
                  onChange={(e) => setAddr({ ...addr, city: e.target.value })}
                />
                <InputField
                  label="Postal code"
                  value={addr.postalCode}
                  onChange={(e) => setAddr({ ...addr, postalCode: e.target.value })}
                />
                <InputField
                  label="Country"
                  value={addr.country}
                  onChange={(e) => setAddr({ ...addr, country: e.target.value.toUpperCase() })}
                />
              </div>
            ) : null}
            {open !== 'start_review' && open !== 'close' ? (
              <TextArea label={TEXT_LABEL[open] ?? 'Note'} value={text} onChange={setText} />
            ) : null}
            {why.length ? (
              <div
                role="alert"
                className="space-y-2 rounded-lg border border-warn-300 bg-warn-50 p-3 text-sm text-warn-900"
              >
                <p className="font-medium">This decision needs a written reason: {why.join(' ')}</p>
                <TextArea label="Reason for departing from the engine" value={reason} onChange={setReason} />
              </div>
            ) : null}
            <Button type="submit" loading={move.pending}>
              {ACTION_LABEL[open]}
            </Button>
          </form>
        ) : null}
        <Badge tone="neutral">Version {wf.claim.version}</Badge>
      </div>
    </Card>
  );
}

const ACTION_LABEL: Partial<Record<ClaimActionName, string>> = {
  start_review: 'Take into review',
  request_info: 'Ask the installer',
  request_return: 'Request the unit back',
  receive_unit: 'Mark unit received',
  record_bench_test: 'Record bench test',
  approve: 'Approve',
  deny: 'Deny',
  reopen: 'Reopen decision',
  close: 'Close claim',
};

const TEXT_LABEL: Partial<Record<ClaimActionName, string>> = {
  request_info: 'What you need from the installer',
  request_return: 'Instructions for the return (optional)',
  approve: 'Note for the installer (optional)',
  deny: 'Note the installer will read',
  reopen: 'Why the decision is reopened',
};
