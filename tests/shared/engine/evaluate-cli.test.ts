import { spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { describe, expect, it } from 'vitest';

import { evaluationSchema } from '../../../shared/engine';

const root = resolve(__dirname, '../../..');
const tsx = join(root, 'node_modules/.bin/tsx');
const script = join(root, 'scripts/evaluate.ts');
const validFile = join(__dirname, 'fixtures/valid-claim.json');
const validText = readFileSync(validFile, 'utf8');
const dir = mkdtempSync(join(tmpdir(), 'lumenproof-cli-'));

function run(args: string[], stdin?: string) {
  const r = spawnSync(tsx, [script, ...args], { cwd: root, input: stdin, encoding: 'utf8', timeout: 30_000 });
  return { code: r.status, stdout: r.stdout, stderr: r.stderr };
}

function file(name: string, text: string): string {
  const path = join(dir, name);
  writeFileSync(path, text);
  return path;
}

function withoutField(path: string[]): string {
  const data = JSON.parse(validText);
  let node = data;
  for (const key of path.slice(0, -1)) node = node[key];
  delete node[path[path.length - 1]];
  return JSON.stringify(data);
}

describe('npm run evaluate', { timeout: 30_000 }, () => {
  it('prints one JSON evaluation for a valid file and exits 0', () => {
    const r = run([validFile]);
    expect(r.code).toBe(0);
    expect(r.stderr).toBe('');
    expect(r.stdout.endsWith('\n')).toBe(true);
    expect(r.stdout.trim().split('\n')).toHaveLength(1);
    const evaluation = JSON.parse(r.stdout);
    expect(evaluationSchema.safeParse(evaluation).success).toBe(true);
    expect(evaluation.computed).toMatchObject({
      ageMonths: 16,
      operatingHours: 6144,
      driverEfficiency: 0.8276,
    });
  });

  it('reads standard input with -', () => {
    const r = run(['-'], validText);
    expect(r.code).toBe(0);
    expect(JSON.parse(r.stdout).engineVersion).toBeTypeOf('string');
  });

  it('refuses bad JSON: nothing on stdout, "invalid JSON" on stderr, exit 2', () => {
    const r = run([file('bad.json', '{ "product": ')]);
    expect(r.code).toBe(2);
    expect(r.stdout).toBe('');
    expect(r.stderr).toMatch(/^invalid JSON: /);
    const fromStdin = run(['-'], 'not json');
    expect(fromStdin.code).toBe(2);
    expect(fromStdin.stdout).toBe('');
  });

  it('names a missing field by path', () => {
    const r = run([file('missing.json', withoutField(['claim', 'failedOn']))]);
    expect(r.code).toBe(2);
    expect(r.stdout).toBe('');
    expect(r.stderr).toMatch(/^claim\.failedOn: /m);
  });

  it('names each field of the wrong type by path, one line each', () => {
    const data = JSON.parse(validText);
    data.product.ratedInputWatts = '24';
    data.claim.measurements.strings[1].amps = 'lots';
    data.installation.location = 'underwater';
    const r = run([file('types.json', JSON.stringify(data))]);
    expect(r.code).toBe(2);
    expect(r.stdout).toBe('');
    const lines = r.stderr.trim().split('\n');
    expect(lines).toHaveLength(3);
    expect(lines.map((l) => l.split(':')[0]).sort()).toEqual(
      ['claim.measurements.strings.1.amps', 'installation.location', 'product.ratedInputWatts'].sort(),
    );
  });

  it('refuses a file that cannot be read, and a missing argument', () => {
    const missing = run([join(dir, 'nope.json')]);
    expect(missing.code).toBe(2);
    expect(missing.stdout).toBe('');
    expect(missing.stderr).toMatch(/cannot read/);
    const none = run([]);
    expect(none.code).toBe(2);
    expect(none.stderr).toMatch(/usage/);
  });
});
