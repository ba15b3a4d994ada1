// SQL fragments for the reliability analytics, built from the definitions in shared/ so that the database
// counts exactly what the shared functions would count from the rows ("the SQL matches the shared definitions" in
// tests/server/analytics.api.test.ts).
// Every fragment here is made from constants of ours, never from request input: values go in as parameters.

import { APPROVED_STAGES, COVERED_IF_VERDICT_STAGES } from '../../../shared/analytics/covered';
import { FAILURE_MODE_RULES, OTHER_FAILURE_MODE } from '../../../shared/analytics/failure-mode-rules';
import { ambientBand } from '../../../shared/analytics/failure-modes';

const SAFE_LITERAL = /^[A-Za-z0-9_.\- °]+$/;
function literal(value: string): string {
  if (!SAFE_LITERAL.test(value)) throw new Error(`Not a safe SQL literal: ${value}`);
  return `'${value}'`;
}
const list = (values: readonly string[]) => values.map(literal).join(', ');

/** A covered claim (shared/analytics/covered.ts) of claims alias `c`. */
export function coveredClaimSql(c = 'c'): string {
  return `(${c}.stage IN (${list(APPROVED_STAGES)}) OR (${c}.stage IN (${list(COVERED_IF_VERDICT_STAGES)}) AND ${c}.verdict = 'covered'))`;
}

/** The claim's failure mode (shared/analytics/failure-mode-rules.ts), first matching rule first. */
export function failureModeSql(c = 'c'): string {
  const cases = FAILURE_MODE_RULES.map((rule) => {
    const tests = [
      ...rule.findings.map(
        (f) => `JSON_SEARCH(${c}.evaluation, 'one', ${literal(f)}, NULL, '$.findings[*].code') IS NOT NULL`,
      ),
      ...(rule.observations ?? []).map(
        (o) =>
          `COALESCE(JSON_CONTAINS(${c}.observations, 'true', '$.${o.replace(/[^A-Za-z]/g, '')}'), 0) = 1`,
      ),
      ...rule.symptoms.map((s) => `JSON_CONTAINS(${c}.symptoms, '"${s.replace(/[^a-z_]/g, '')}"')`),
    ];
    return `WHEN ${tests.join(' OR ')} THEN ${literal(rule.mode)}`;
  });
  return `(CASE ${cases.join(' ')} ELSE ${literal(OTHER_FAILURE_MODE.mode)} END)`;
}

/**
 * Whole calendar months completed from `from` to `to` (the engine's wholeMonthsBetween): an anniversary on a day
 * the month lacks moves to its last day, and never below 0. MariaDB's TIMESTAMPDIFF(MONTH) counts Jan 31 to
 * Feb 28 as 0 months; the engine counts 1, so this spells the rule out.
 */
export function wholeMonthsSql(from: string, to: string): string {
  return `GREATEST(0, (YEAR(${to}) - YEAR(${from})) * 12 + MONTH(${to}) - MONTH(${from}) - (DAY(${to}) < LEAST(DAY(${from}), DAY(LAST_DAY(${to})))))`;
}

/** An age in the life data (shared/analytics/life-data.ts): whole months, or whole days x hours a day. */
export function ageSql(
  unit: 'months' | 'hours',
  from: string,
  to: string,
  hoursPerDay: string,
  midpoint: boolean,
): string {
  const half = midpoint ? ' + 0.5' : '';
  if (unit === 'months') return `(${wholeMonthsSql(from, to)}${half})`;
  return `((GREATEST(0, DATEDIFF(${to}, ${from}))${half}) * ${hoursPerDay})`;
}

/** The ambient band of ambientBand() with its default edges, as a CASE over a column in °C. */
export function ambientBandSql(column: string, edges: readonly number[] = [25, 35, 45]): string {
  const parts = [
    `WHEN ${column} IS NULL THEN NULL`,
    `WHEN ${column} < ${edges[0]} THEN ${literal(ambientBand(edges[0] - 1, edges)!)}`,
  ];
  for (let i = 1; i < edges.length; i++)
    parts.push(`WHEN ${column} < ${edges[i]} THEN ${literal(ambientBand(edges[i - 1], edges)!)}`);
  parts.push(`ELSE ${literal(ambientBand(edges[edges.length - 1], edges)!)}`);
  return `(CASE ${parts.join(' ')} END)`;
}
