import type { DenialCode, Resolution } from '../../../shared/claims/actions.schema';
import type { Finding, Verdict } from '../../../shared/engine/schema';
import { PdfBuilder, type PaperSize } from './document';
import { formatMoney } from '../../../shared/money';
import { formatDate } from './format';
import { loadLayout } from './layout';

export type Party = { name: string; address?: readonly string[] };

/** What the reviewer decided, as the letter states it (the reviewer and the day are added beside it). */
export type LetterDecision =
  | {
      outcome: 'approved' | 'partly_approved';
      resolution: Resolution;
      amount: string;
      currency: string;
      approvedUnits?: number;
      note?: string;
      overrideReason?: string;
    }
  | { outcome: 'denied'; reasonCodes: readonly DenialCode[]; note: string; overrideReason?: string };

export type DeterminationLetterData = {
  claimNumber: string;
  /** The letter's own date (YYYY-MM-DD). */
  letterDate: string;
  filedOn: string;
  failedOn?: string;
  contractor: Party;
  manufacturer: Party;
  product: { model: string; name: string };
  site: { name: string; address?: readonly string[] };
  installedOn?: string;
  units: { count: number; serials?: readonly string[] };
  evaluation: {
    engineVersion: string;
    verdict: Verdict;
    findings: readonly Pick<Finding, 'code' | 'severity' | 'message' | 'reference'>[];
  };
  decision: LetterDecision & { reviewer: string; decidedOn: string };
  paper?: PaperSize;
  /** The recipient's locale (their organisation's): how dates read. Default en-US. */
  locale?: string;
};

const SECTIONS = [
  'opening',
  'claim',
  'product',
  'screening',
  'decision',
  'repair_caution',
  'closing',
] as const;

// Findings in the order a reader needs them: what failed first, what passed last.
const SEVERITY_ORDER = { fail: 0, warn: 1, info: 2, pass: 3 } as const;

/** The letter that records a claim's decision, for both parties. */
export function renderDeterminationLetter(data: DeterminationLetterData): Promise<Buffer> {
  const layout = loadLayout('determination-letter');
  const view = {
    claimNumber: data.claimNumber,
    manufacturer: data.manufacturer.name,
    contractor: data.contractor.name,
    filedOn: formatDate(data.filedOn, data.locale),
    engineVersion: data.evaluation.engineVersion,
    verdict: layout.word('verdict', data.evaluation.verdict),
  };
  const pdf = new PdfBuilder({
    date: data.letterDate,
    title: layout.title,
    reference: data.claimNumber,
    footer: layout.footer(view),
    paper: data.paper,
    content: { kind: 'determination-letter', data },
  });
  const L = (k: string) => layout.label(k);
  const partyText = (p: Party) => [p.name, ...(p.address ?? [])].join('\n');
  const decision = data.decision;

  for (const section of layout.sections(SECTIONS)) {
    switch (section.id) {
      case 'opening':
        pdf.title(
          layout.title,
          `${L('claimNumber')} ${data.claimNumber} · ${formatDate(data.letterDate, data.locale)}`,
        );
        if (section.text) pdf.paragraph(layout.fill(section.text, view));
        break;
      case 'claim':
        pdf.heading(section.heading ?? '');
        pdf.fields(
          [
            [L('claimNumber'), data.claimNumber],
            [L('filedOn'), formatDate(data.filedOn, data.locale)],
            [L('failedOn'), data.failedOn ? formatDate(data.failedOn, data.locale) : ''],
            [L('contractor'), partyText(data.contractor)],
            [L('manufacturer'), partyText(data.manufacturer)],
            [L('letterDate'), formatDate(data.letterDate, data.locale)],
          ],
          3,
        );
        break;
      case 'product':
        pdf.heading(section.heading ?? '');
        pdf.fields(
          [
            [L('model'), data.product.model],
            [L('productName'), data.product.name],
            [L('installedOn'), data.installedOn ? formatDate(data.installedOn, data.locale) : ''],
            [L('site'), [data.site.name, ...(data.site.address ?? [])].join('\n')],
            [L('units'), String(data.units.count)],
            [L('serials'), (data.units.serials ?? []).join(', ')],
          ],
          3,
        );
        break;
      case 'screening': {
        pdf.heading(section.heading ?? '');
        if (section.text) pdf.paragraph(layout.fill(section.text, view));
        const findings = [...data.evaluation.findings].sort(
          (a, b) => SEVERITY_ORDER[a.severity] - SEVERITY_ORDER[b.severity],
        );
        if (findings.length === 0) pdf.paragraph(L('noFindings'), { muted: true });
        else {
          pdf.table(
            [
              { header: L('severity'), width: 0.13 },
              { header: L('finding'), width: 0.57 },
              { header: L('reference'), width: 0.3 },
            ],
            findings.map((f) => [
              layout.word('severity', f.severity),
              f.message,
              f.reference ?? L('noReference'),
            ]),
          );
        }
        break;
      }
      case 'decision': {
        pdf.heading(section.heading ?? '');
        pdf.paragraph(layout.word('outcome', decision.outcome), { bold: true, size: 14 });
        const rows: [string, string][] = [];
        if (decision.outcome !== 'denied') {
          rows.push([L('resolution'), layout.word('resolution', decision.resolution)]);
          rows.push([L('amount'), formatMoney(decision.amount, decision.currency)]);
          if (decision.approvedUnits !== undefined) {
            rows.push([L('approvedUnits'), `${decision.approvedUnits} of ${data.units.count}`]);
          }
        }
        rows.push(
          [L('reviewer'), decision.reviewer],
          [L('decidedOn'), formatDate(decision.decidedOn, data.locale)],
        );
        pdf.fields(rows, 3);
        if (decision.outcome === 'denied') {
          pdf.paragraph(L('reasons'), { bold: true });
          for (const code of decision.reasonCodes) pdf.paragraph(`•  ${layout.word('denialCode', code)}`);
        }
        if (decision.note) {
          pdf.paragraph(L('note'), { bold: true });
          pdf.paragraph(decision.note);
        }
        if (decision.overrideReason) {
          pdf.paragraph(L('overrideReason'), { bold: true });
          pdf.paragraph(decision.overrideReason);
        }
        break;
      }
      case 'repair_caution':
        // Only where a field-repair allowance is offered.
        if (decision.outcome !== 'denied' && decision.resolution === 'repair_allowance') {
          pdf.callout(section.title ?? '', section.text ?? '', 'caution');
        }
        break;
      case 'closing':
        if (section.text) pdf.paragraph(layout.fill(section.text, view), { muted: true });
        break;
    }
  }
  return pdf.finish();
}
