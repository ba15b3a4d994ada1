import { memo, useId, useMemo } from 'react';

import {
  CATEGORIES,
  type Category,
  type Evaluation,
  type Finding,
  type Severity,
  type Verdict,
} from '../../../../shared/engine';

export interface EvaluationPanelProps {
  evaluation: Evaluation | null;
  /** The shown evaluation is for an older input than the one being typed. */
  pending?: boolean;
}

const VERDICT_TEXT: Record<Verdict, { title: string; detail: string; className: string }> = {
  covered: {
    title: 'Likely covered',
    detail: 'Nothing found that excludes this claim or needs a reviewer. A reviewer still decides.',
    className: 'border-ok-300 bg-ok-50 text-ok-900',
  },
  review: {
    title: 'Needs a reviewer',
    detail: 'Something below needs a person to look at it before a decision.',
    className: 'border-warn-300 bg-warn-50 text-warn-900',
  },
  excluded: {
    title: 'Likely excluded',
    detail: 'A warranty exclusion applies; the reasons are below. A reviewer still decides.',
    className: 'border-bad-300 bg-bad-50 text-bad-900',
  },
};

// Severity is always written out, never shown by colour alone.
const SEVERITY_TEXT: Record<Severity, { label: string; className: string }> = {
  pass: { label: 'Pass', className: 'bg-ok-100 text-ok-900' },
  info: { label: 'Note', className: 'bg-info-100 text-info-900' },
  warn: { label: 'Check', className: 'bg-warn-100 text-warn-900' },
  fail: { label: 'Fail', className: 'bg-bad-100 text-bad-900' },
};

const CATEGORY_TEXT: Record<Category, string> = {
  coverage: 'Coverage',
  application: 'Application',
  electrical: 'Electrical',
  evidence: 'Evidence',
  life: 'Life and light output',
};

const RANGE_TEXT = { A: 'ANSI Range A', B: 'ANSI Range B', outside: 'Outside ANSI Range B' } as const;

function fixed(value: number, places: number): string {
  return value.toLocaleString('en-US', { maximumFractionDigits: places });
}

function computedRows(e: Evaluation): [string, string][] {
  const c = e.computed;
  const rows: [string, string][] = [];
  if (c.serviceVoltageRange !== null) rows.push(['Supply voltage', RANGE_TEXT[c.serviceVoltageRange]]);
  if (c.driverOutputWatts !== null) rows.push(['Driver output', `${fixed(c.driverOutputWatts, 1)} W`]);
  if (c.driverEfficiency !== null)
    rows.push(['Driver efficiency', `${fixed(c.driverEfficiency * 100, 1)} %`]);
  if (c.inputPowerDeviationPercent !== null) {
    const sign = c.inputPowerDeviationPercent > 0 ? '+' : '';
    rows.push(['Input power against rated', `${sign}${fixed(c.inputPowerDeviationPercent, 1)} %`]);
  }
  rows.push(['Expected string voltage', `${fixed(c.expectedStringVolts, 1)} V`]);
  rows.push(['Dark LEDs', `${c.darkLeds} of ${c.totalLeds} (${fixed(c.darkLedPercent, 1)} %)`]);
  rows.push(['Age at failure', `${c.ageMonths} ${c.ageMonths === 1 ? 'month' : 'months'}`]);
  rows.push(['Operating hours', `${fixed(c.operatingHours, 0)} h`]);
  if (c.lumenMaintenance !== null) {
    const lm = c.lumenMaintenance;
    rows.push(['Projected L70 (TM-21)', lm.lifetimes[0].reported]);
    if (lm.projectedOutputPercent !== null)
      rows.push(['Projected light output now', `${fixed(lm.projectedOutputPercent, 1)} %`]);
  }
  rows.push(['Coverage', `${fixed(c.coveragePercent, 2)} %`]);
  rows.push(['Credit', `${c.credit} ${c.currency}`]);
  return rows;
}

function FindingItem({ finding }: { finding: Finding }) {
  const severity = SEVERITY_TEXT[finding.severity];
  return (
    <li className="flex gap-3 py-2">
      <span className={`h-fit shrink-0 rounded px-2 py-0.5 text-xs font-semibold ${severity.className}`}>
        {severity.label}
      </span>
      <div className="min-w-0 text-sm text-ink-800">
        <p>{finding.message}</p>
        {(finding.reference !== undefined || finding.effect !== 'none') && (
          <p className="mt-0.5 text-xs text-ink-600">
            {finding.effect === 'exclude' && (
              <span className="font-medium text-bad-800">Excludes the claim. </span>
            )}
            {finding.effect === 'review' && (
              <span className="font-medium text-warn-900">Sends the claim to a reviewer. </span>
            )}
            {finding.reference !== undefined && <span>Source: {finding.reference}</span>}
          </p>
        )}
      </div>
    </li>
  );
}

/**
 * The engine's evaluation of a claim: the verdict (announced politely to screen readers as it changes),
 * the findings grouped by category with their sources, and the computed values with their units. Used on
 * the claim form (live, with useLiveEvaluation) and on the review screen (the stored evaluation).
 */
export const EvaluationPanel = memo(function EvaluationPanel({
  evaluation,
  pending = false,
}: EvaluationPanelProps) {
  const headingId = useId();
  const groups = useMemo(() => {
    if (evaluation === null) return [];
    return CATEGORIES.map((category) => ({
      category,
      findings: evaluation.findings.filter((f) => f.category === category),
    })).filter((g) => g.findings.length > 0);
  }, [evaluation]);
  const rows = useMemo(() => (evaluation === null ? [] : computedRows(evaluation)), [evaluation]);
  const verdict = evaluation === null ? null : VERDICT_TEXT[evaluation.verdict];

  return (
    <section
      aria-labelledby={headingId}
      aria-busy={pending}
      className="rounded-lg border border-ink-200 bg-white p-4 text-ink-900"
    >
      <div className="flex items-baseline justify-between gap-2">
        <h2 id={headingId} className="text-base font-semibold">
          Engine evaluation
        </h2>
        {evaluation !== null && (
          <span className="text-xs text-ink-600">Engine {evaluation.engineVersion}</span>
        )}
      </div>

      <div
        role="status"
        aria-live="polite"
        className={`mt-3 rounded-lg border p-3 ${verdict === null ? 'border-ink-200 bg-ink-50 text-ink-800' : verdict.className}`}
      >
        {verdict === null ? (
          <p className="text-sm">Fill in the claim to see the evaluation.</p>
        ) : (
          <>
            <p className="text-sm font-semibold">{verdict.title}</p>
            <p className="mt-0.5 text-sm">{verdict.detail}</p>
          </>
        )}
        {pending && <p className="mt-1 text-xs">Updating…</p>}
      </div>

      {groups.map((group) => (
        <section key={group.category} aria-label={CATEGORY_TEXT[group.category]} className="mt-4">
          <h3 className="text-sm font-semibold text-ink-900">{CATEGORY_TEXT[group.category]}</h3>
          <ul className="divide-y divide-ink-100">
            {group.findings.map((finding) => (
              <FindingItem key={finding.code} finding={finding} />
            ))}
          </ul>
        </section>
      ))}

      {rows.length > 0 && (
        <section aria-label="Computed values" className="mt-4">
          <h3 className="text-sm font-semibold text-ink-900">Computed values</h3>
          <dl className="mt-1 grid grid-cols-1 gap-x-4 gap-y-1 text-sm sm:grid-cols-2">
            {rows.map(([label, value]) => (
              <div key={label} className="flex justify-between gap-2 border-b border-ink-100 py-1">
                <dt className="text-ink-600">{label}</dt>
                <dd className="font-medium tabular-nums text-ink-900">{value}</dd>
              </div>
            ))}
          </dl>
        </section>
      )}
    </section>
  );
});
