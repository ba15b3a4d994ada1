// npm run -s evaluate -- FILE.json   (or - for standard input)
// Prints the evaluation as one JSON object and exits 0. On invalid input prints nothing on standard
// output, one line per bad field (`path.to.field: message`) on standard error, and exits 2.
import { readFileSync } from 'node:fs';

import { safeEvaluateClaim } from '../shared/engine';

const USAGE = 'usage: npm run -s evaluate -- FILE.json   (or - to read standard input)';

function fail(message: string): never {
  process.stderr.write(`${message}\n`);
  process.exit(2);
}

function readSource(arg: string): string {
  try {
    return readFileSync(arg === '-' ? 0 : arg, 'utf8');
  } catch (error) {
    return fail(`cannot read ${arg === '-' ? 'standard input' : arg}: ${(error as Error).message}`);
  }
}

const args = process.argv.slice(2);
if (args.length !== 1) fail(USAGE);

const text = readSource(args[0]);
let data: unknown;
try {
  data = JSON.parse(text);
} catch (error) {
  fail(`invalid JSON: ${(error as Error).message}`);
}

const result = safeEvaluateClaim(data);
if (!result.ok) {
  fail(
    result.issues
      .map((issue) => `${issue.path === '' ? '(input)' : issue.path}: ${issue.message}`)
      .join('\n'),
  );
}
process.stdout.write(`${JSON.stringify(result.evaluation)}\n`);
