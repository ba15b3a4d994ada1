// npm run bench:pdf
// Determination letters and credit memos rendered per second (server/lib/pdf, the fictional samples), beside
// the baseline of a bare one-page pdfkit document with one line of text in the same fonts, in the same run.
// BENCH_SECONDS (2) a measurement. Asserts nothing.
import PDFDocument from 'pdfkit';
import { renderCreditMemo } from '../../server/lib/pdf/credit-memo';
import { renderDeterminationLetter } from '../../server/lib/pdf/determination-letter';
import { FONTS } from '../../server/lib/pdf/document';
import { sampleApprovalLetter, sampleCreditMemo, sampleDenialLetter } from '../lib/document-samples';
import { report } from './lib/bench-db';

const SECONDS = Number(process.env.BENCH_SECONDS_PDF ?? 2);

function barePdf(): Promise<Buffer> {
  return new Promise((resolve, reject) => {
    const doc = new PDFDocument({ size: 'LETTER', font: FONTS.sans });
    const parts: Buffer[] = [];
    doc.on('data', (c: Buffer) => parts.push(c));
    doc.on('end', () => resolve(Buffer.concat(parts)));
    doc.on('error', reject);
    doc.fontSize(11).text('Lumenproof');
    doc.end();
  });
}

async function rate(label: string, render: () => Promise<Buffer>) {
  for (let i = 0; i < 3; i++) await render();
  let n = 0;
  let bytes = 0;
  const t0 = performance.now();
  while (performance.now() - t0 < SECONDS * 1000) {
    bytes += (await render()).length;
    n++;
  }
  const perSecond = n / ((performance.now() - t0) / 1000);
  console.log(
    `${label.padEnd(40)} ${perSecond.toFixed(1).padStart(8)} /s   ${(bytes / n / 1024).toFixed(1)} KB each`,
  );
  return perSecond;
}

async function main() {
  const base = await rate('baseline: bare one-page pdfkit document', barePdf);
  const approval = await rate('determination letter (approval)', () =>
    renderDeterminationLetter(sampleApprovalLetter),
  );
  const denial = await rate('determination letter (denial)', () =>
    renderDeterminationLetter(sampleDenialLetter),
  );
  const memo = await rate('credit memo', () => renderCreditMemo(sampleCreditMemo));
  report({ part: 'pdf', figure: 'bare one-page pdfkit document (baseline)', value: base, unit: '/s' });
  // Ratios as time per document against the baseline's.
  report({
    part: 'pdf',
    figure: 'determination letter (approval)',
    value: approval,
    unit: '/s',
    baseline: base,
  });
  report({ part: 'pdf', figure: 'determination letter (denial)', value: denial, unit: '/s', baseline: base });
  report({ part: 'pdf', figure: 'credit memo', value: memo, unit: '/s', baseline: base });
}

main().catch((err) => {
  console.error(err);
  process.exit(1);
});
