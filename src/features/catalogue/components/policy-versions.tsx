import { EXCLUSION_LABELS, type PolicyVersionDto } from '../../../../shared/schemas/catalogue';
import { Table, Td, Th } from '../../../components/ui/table';
import { cn } from '../../../lib/cn';
import { useDateText, type DateText } from '../../../components/ui/date-time';

type Row = { label: string; value: (v: PolicyVersionDto, dates: DateText) => string };

const ROWS: Row[] = [
  { label: 'In force from', value: (v, dates) => dates.calendar(v.effectiveFrom) },
  { label: 'Term', value: (v) => `${v.termMonths} months` },
  { label: 'Full coverage', value: (v) => `${v.fullCoverageMonths} months, then pro-rated` },
  { label: 'Filing window', value: (v) => `${v.filingWindowDays} days` },
  { label: 'Failure threshold', value: (v) => `${v.darkLedFailurePercent} % of LEDs dark` },
  { label: 'Unit credit', value: (v) => `${v.unitCredit} ${v.currency}` },
  { label: 'Labour allowance', value: (v) => `${v.labourAllowance} ${v.currency}` },
  { label: 'Required photos', value: (v) => String(v.requiredPhotos) },
  { label: 'Proof of purchase', value: (v) => (v.proofOfPurchaseRequired ? 'Required' : 'Not required') },
  {
    label: 'Exclusions',
    value: (v) => (v.exclusions.length ? v.exclusions.map((x) => EXCLUSION_LABELS[x]).join('; ') : 'None'),
  },
  {
    label: 'Denial reasons',
    value: (v) => (v.denialReasons.length ? v.denialReasons.map((r) => r.code).join(', ') : 'None'),
  },
  { label: 'Change note', value: (v) => v.changeNote ?? '—' },
];

/** Every version side by side; a value that differs from the version before it is highlighted. */
export function PolicyVersions({ versions }: { versions: PolicyVersionDto[] }) {
  const dates = useDateText();
  return (
    <Table caption="Versions of this policy, side by side">
      <thead>
        <tr>
          <Th>Term</Th>
          {versions.map((v) => (
            <Th key={v.id}>Version {v.versionNumber}</Th>
          ))}
        </tr>
      </thead>
      <tbody className="divide-y divide-ink-100">
        {ROWS.map((row) => (
          <tr key={row.label}>
            <Th scope="row" className="bg-white text-left whitespace-nowrap normal-case">
              {row.label}
            </Th>
            {versions.map((v, i) => {
              const changed =
                i > 0 &&
                row.label !== 'Change note' &&
                row.label !== 'In force from' &&
                row.value(v, dates) !== row.value(versions[i - 1], dates);
              return (
                <Td
                  key={v.id}
                  className={cn('min-w-44 align-top', changed && 'bg-warn-50 font-semibold text-warn-900')}
                >
                  {row.value(v, dates)}
                  {changed ? (
                    <span className="sr-only"> (changed from version {versions[i - 1].versionNumber})</span>
                  ) : null}
                </Td>
              );
            })}
          </tr>
        ))}
      </tbody>
    </Table>
  );
}
