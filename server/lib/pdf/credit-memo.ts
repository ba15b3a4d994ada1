import { formatCents, scaleCentsHalfUp } from '../../../shared/engine/money';
import { PdfBuilder, type PaperSize } from './document';
import type { Party } from './determination-letter';
import { formatAmount, formatMoney } from '../../../shared/money';
import { formatDate, formatPercent, toCents } from './format';
import { loadLayout } from './layout';

export type CreditMemoLine = {
  description: string;
  units: number;
  /** Credit per unit at full coverage, a decimal string. */
  unitCredit: string;
  /** Share of the unit credit covered (proration), in per cent. */
  coveragePercent: number;
  /**
   * The line's amount as decided (a decimal string). Left out, it is units x unit credit x coverage, rounded
   * half-up to the cent.
   */
  amount?: string;
};

export type CreditMemoData = {
  memoNumber: string;
  memoDate: string;
  manufacturer: Party;
  contractor: Party & { accountNumber?: string };
  claimNumber: string;
  currency: string;
  lines: readonly CreditMemoLine[];
  /** Present on a reversal: the memo it voids, and why. */
  reversal?: { originalMemoNumber: string; originalDate: string; reason: string };
  paper?: PaperSize;
  /** The recipient's locale (their organisation's): how dates read. Default en-US. */
  locale?: string;
};

const SECTIONS = ['void_notice', 'parties', 'lines', 'settles'] as const;

/** A line's amount in cents: as decided, or units x unit credit x coverage (to 0.01 %), half-up. */
export function lineCents(line: CreditMemoLine): number {
  if (line.amount !== undefined) return toCents(line.amount);
  return scaleCentsHalfUp(
    toCents(line.unitCredit) * line.units,
    Math.round(line.coveragePercent * 100),
    10_000,
  );
}

/** The memo's total as a decimal string, positive; a reversal prints it negated. */
export function memoTotal(data: Pick<CreditMemoData, 'lines'>): string {
  return formatCents(data.lines.reduce((sum, l) => sum + lineCents(l), 0));
}

/** A credit memo settling a claim, or its reversal (a VOID memo referencing the original). */
export function renderCreditMemo(data: CreditMemoData): Promise<Buffer> {
  const layout = loadLayout('credit-memo');
  const reversal = data.reversal;
  const sign = reversal ? -1 : 1;
  const title = reversal ? layout.label('reversalTitle') : layout.title;
  const view = {
    memoNumber: data.memoNumber,
    manufacturer: data.manufacturer.name,
    contractor: data.contractor.name,
    claimNumber: data.claimNumber,
    originalMemoNumber: reversal?.originalMemoNumber ?? '',
    originalDate: reversal ? formatDate(reversal.originalDate, data.locale) : '',
  };
  const pdf = new PdfBuilder({
    date: data.memoDate,
    title,
    reference: data.memoNumber,
    footer: layout.footer(view),
    paper: data.paper,
    content: { kind: 'credit-memo', data },
  });
  const L = (k: string) => layout.label(k);
  const money = (cents: number) => formatAmount(formatCents(cents));
  const totalCents = sign * toCents(memoTotal(data));

  if (reversal) pdf.stamp(L('voidStamp'));
  pdf.title(title, `${L('memoNumber')} ${data.memoNumber} · ${formatDate(data.memoDate, data.locale)}`);

  for (const section of layout.sections(SECTIONS)) {
    switch (section.id) {
      case 'void_notice':
        if (reversal) {
          pdf.callout(section.title ?? '', layout.fill(section.text ?? '', view), 'caution');
          pdf.fields([[L('voidReason'), reversal.reason]], 1);
        }
        break;
      case 'parties': {
        pdf.heading(section.heading ?? '');
        const account = [
          data.contractor.name,
          ...(data.contractor.accountNumber ? [data.contractor.accountNumber] : []),
        ];
        const rows: [string, string][] = [
          [L('memoNumber'), data.memoNumber],
          [L('memoDate'), formatDate(data.memoDate, data.locale)],
          [L('issuer'), [data.manufacturer.name, ...(data.manufacturer.address ?? [])].join('\n')],
          [L('account'), [...account, ...(data.contractor.address ?? [])].join('\n')],
          [L('claimNumber'), data.claimNumber],
          [L('currency'), data.currency],
        ];
        if (reversal)
          rows.push([
            L('originalMemo'),
            `${reversal.originalMemoNumber} (${formatDate(reversal.originalDate, data.locale)})`,
          ]);
        pdf.fields(rows);
        break;
      }
      case 'lines':
        pdf.heading(section.heading ?? '');
        pdf.table(
          [
            { header: L('description'), width: 0.42 },
            { header: L('units'), width: 0.1, align: 'right' },
            { header: `${L('unitCredit')} (${data.currency})`, width: 0.17, align: 'right' },
            { header: L('coverage'), width: 0.12, align: 'right' },
            { header: `${L('lineAmount')} (${data.currency})`, width: 0.19, align: 'right' },
          ],
          [
            ...data.lines.map((l) => [
              l.description,
              String(l.units),
              money(toCents(l.unitCredit)),
              formatPercent(l.coveragePercent),
              money(sign * lineCents(l)),
            ]),
            [L('total'), '', '', '', formatMoney(formatCents(totalCents), data.currency)],
          ],
          { totalRow: true },
        );
        break;
      case 'settles':
        if (!reversal && section.text) pdf.paragraph(layout.fill(section.text, view));
        break;
    }
  }
  return pdf.finish();
}
