import { rulesToAST } from '@casl/ability/extra';
import type { Action, AppAbility, SubjectName } from '../../shared/abilities';

// Which rows of a table a list may show, derived from the same CASL rules (shared/abilities.ts) that authorise one
// loaded record, so that the organisation filters and the draft rule are written once. The rules become a
// condition tree (rulesToAST from @casl/ability/extra) and the tree becomes SQL with `?` placeholders for
// server/db/read.ts's Conditions. Only what the rules use is translated (equality, inequality, lists, and, or,
// not); anything else throws rather than quietly widening a list.

/** A part of a WHERE clause and its parameters, in order (for `Conditions.and(sql, ...params)`). */
export type ScopePart = { sql: string; params: unknown[] };

type Condition = NonNullable<ReturnType<typeof rulesToAST>>;

const snake = (field: string) => field.replace(/[A-Z]/g, (ch) => `_${ch.toLowerCase()}`);

function toSql(c: Condition, column: (field: string) => string): ScopePart {
  const { operator } = c;
  if (operator === 'and' || operator === 'or') {
    const parts = (c.value as Condition[]).map((x) => toSql(x, column));
    if (!parts.length) return { sql: operator === 'and' ? '1 = 1' : '1 = 0', params: [] };
    if (parts.length === 1) return parts[0];
    return {
      sql: `(${parts.map((p) => p.sql).join(operator === 'and' ? ' AND ' : ' OR ')})`,
      params: parts.flatMap((p) => p.params),
    };
  }
  if (operator === 'not') {
    const inner = toSql((c.value as Condition[])[0], column);
    return { sql: `NOT ${inner.sql}`, params: inner.params };
  }
  const { field, value } = c as Condition & { field: string; value: unknown };
  const col = column(field);
  switch (operator) {
    case 'eq':
      return value === null ? { sql: `${col} IS NULL`, params: [] } : { sql: `${col} = ?`, params: [value] };
    case 'ne':
      return value === null
        ? { sql: `${col} IS NOT NULL`, params: [] }
        : { sql: `${col} <> ?`, params: [value] };
    case 'in':
    case 'nin': {
      const list = value as unknown[];
      if (!list.length) return { sql: operator === 'in' ? '1 = 0' : '1 = 1', params: [] };
      return { sql: `${col} ${operator === 'in' ? 'IN' : 'NOT IN'} (?)`, params: [list] };
    }
    default:
      throw new Error(`tenant scope: the rule operator "${operator}" has no SQL translation`);
  }
}

/**
 * The rows of `subject` the user may `action` (read by default) as SQL over the table aliased `alias`: e.g. a
 * manufacturer's reviewer on Claim gives `(c.manufacturer_id = ? AND c.stage <> ?)`, a contractor
 * `c.contractor_id = ?`. No rule at all gives `1 = 0` (an empty list, never everything); an unconditional rule
 * `1 = 1`. A field's column is its snake_case name unless `columns` names it.
 */
export function scopeConditions(
  ability: AppAbility,
  subject: Exclude<SubjectName, 'all'>,
  alias: string,
  opts: { action?: Action; columns?: Record<string, string> } = {},
): ScopePart {
  const ast = rulesToAST(ability, opts.action ?? 'read', subject);
  if (!ast) return { sql: '1 = 0', params: [] };
  return toSql(ast, (field) => `${alias}.${opts.columns?.[field] ?? snake(field)}`);
}

/**
 * The same part for TypeORM's query builder, whose parameters are named: `?` becomes `:<prefix>0`, `:<prefix>1`, …
 * (a list `(:...<prefix>n)`).
 */
export function namedScope(
  part: ScopePart,
  prefix = 'scope',
): { sql: string; params: Record<string, unknown> } {
  let i = 0;
  const params: Record<string, unknown> = {};
  const sql = part.sql.replace(/\(\?\)|\?/g, (match) => {
    const key = `${prefix}${i}`;
    params[key] = part.params[i++];
    return match === '(?)' && Array.isArray(params[key]) ? `(:...${key})` : `:${key}`;
  });
  return { sql, params };
}
