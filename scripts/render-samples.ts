// npm exec tsx scripts/render-samples.ts
// Writes the sample documents to .data/samples/ so a person can look at them; with pdftoppm on the PATH,
// also a PNG of each page.
import { execFileSync } from 'node:child_process';
import { mkdirSync, writeFileSync } from 'node:fs';
import path from 'node:path';

import { renderCreditMemo } from '../server/lib/pdf/credit-memo';
import { renderDeterminationLetter } from '../server/lib/pdf/determination-letter';
import { sha256Hex } from '../server/lib/pdf/hash';
import { renderPackingSlip } from '../server/lib/pdf/packing-slip';
import {
  sampleApprovalLetter,
  sampleCreditMemo,
  sampleCreditReversal,
  sampleDenialLetter,
  samplePackingSlip,
  sampleRepairLetter,
} from './lib/document-samples';

const OUT = path.resolve('.data/samples');

function hasPdftoppm(): boolean {
  try {
    execFileSync('pdftoppm', ['-v'], { stdio: 'ignore' });
    return true;
  } catch {
    return false;
  }
}

async function main() {
  mkdirSync(OUT, { recursive: true });
  const docs: [string, Promise<Buffer>][] = [
    ['determination-approved', renderDeterminationLetter(sampleApprovalLetter)],
    ['determination-repair-allowance', renderDeterminationLetter(sampleRepairLetter)],
    ['determination-denied', renderDeterminationLetter(sampleDenialLetter)],
    ['packing-slip', renderPackingSlip(samplePackingSlip)],
    ['credit-memo', renderCreditMemo(sampleCreditMemo)],
    ['credit-memo-reversal', renderCreditMemo(sampleCreditReversal)],
  ];
  const png = hasPdftoppm();
  for (const [name, render] of docs) {
    const file = path.join(OUT, `${name}.pdf`);
    const bytes = await render;
    writeFileSync(file, bytes);
    if (png) execFileSync('pdftoppm', ['-png', '-r', '60', file, path.join(OUT, name)]);
    console.log(`${file}  ${bytes.length} bytes  sha256 ${sha256Hex(bytes)}`);
  }
  if (!png) console.log('pdftoppm not found: PDFs only.');
}

main().catch((err) => {
  console.error(err);
  process.exit(1);
});
