import type { DataSource, EntityMetadata, EntityTarget, ObjectLiteral } from 'typeorm';
import { isoOfDateTime } from './read';

// Entities out of written-out SQL (server/db/read.ts), with TypeORM's own metadata and value conversion: the
// columns an entity maps, selected under `<alias>_<column>`, and turned back into an instance the way TypeORM's
// query builder does it (the driver's prepareHydratedValue: JSON, simple arrays, enums, dates, transformers). What
// this skips is building the SQL and grouping rows on every call, which is most of a record page's time in Node.

type Mapped = { metadata: EntityMetadata; columns: EntityMetadata['columns'] };
const mapped = new WeakMap<DataSource, Map<EntityTarget<ObjectLiteral>, Mapped>>();

function mappingOf(ds: DataSource, target: EntityTarget<ObjectLiteral>): Mapped {
  let byTarget = mapped.get(ds);
  if (!byTarget) mapped.set(ds, (byTarget = new Map()));
  let m = byTarget.get(target);
  if (!m) {
    const metadata = ds.getMetadata(target);
    m = { metadata, columns: metadata.columns.filter((c) => !c.isVirtual && c.isSelect) };
    byTarget.set(target, m);
  }
  return m;
}

/** The select list of an entity's columns under an alias: `alias.col AS alias_col, …`. */
export function selectColumns(ds: DataSource, target: EntityTarget<ObjectLiteral>, alias: string) {
  return mappingOf(ds, target)
    .columns.map((c) => `${alias}.\`${c.databaseName}\` AS \`${alias}_${c.databaseName}\``)
    .join(', ');
}

/**
 * A JSON object of an entity's columns under the keys `selectColumns` uses, for `JSON_ARRAYAGG` of a to-many
 * relation inside the parent's own statement (one row for the parent, not one per child); `extra` adds keys of
 * other expressions. JSON has no dates and no exact big numbers, so those travel as text: times as MariaDB writes
 * them (UTC, as stored), big integers and decimals as their digits. Turn each object back with `hydrateJson`.
 */
export function jsonObjectOf(
  ds: DataSource,
  target: EntityTarget<ObjectLiteral>,
  alias: string,
  extra: Record<string, string> = {},
) {
  const pairs = mappingOf(ds, target).columns.map((c) => {
    const col = `${alias}.\`${c.databaseName}\``;
    const type = String(c.type);
    const value =
      type === 'datetime' || type === 'timestamp'
        ? `DATE_FORMAT(${col}, '%Y-%m-%d %H:%i:%s.%f')`
        : type === 'date'
          ? `DATE_FORMAT(${col}, '%Y-%m-%d')`
          : type === 'bigint' || type === 'decimal'
            ? `CAST(${col} AS CHAR)`
            : type === 'json'
              ? `JSON_EXTRACT(${col}, '$')`
              : col;
    return `'${alias}_${c.databaseName}', ${value}`;
  });
  for (const [key, expr] of Object.entries(extra)) pairs.push(`'${key}', ${expr}`);
  return `JSON_OBJECT(${pairs.join(', ')})`;
}

/** An entity from one object of a `jsonObjectOf` array (its times read as UTC). */
export function hydrateJson<T extends ObjectLiteral>(
  ds: DataSource,
  target: EntityTarget<T>,
  obj: Record<string, unknown>,
  alias: string,
): T | null {
  const row: Record<string, unknown> = { ...obj };
  for (const c of mappingOf(ds, target as EntityTarget<ObjectLiteral>).columns) {
    const key = `${alias}_${c.databaseName}`;
    const type = String(c.type);
    if ((type === 'datetime' || type === 'timestamp') && typeof row[key] === 'string')
      row[key] = new Date(isoOfDateTime(row[key] as string));
  }
  return hydrate(ds, target, row, alias);
}

/** A JSON array a statement returned (mysql2 parses JSON columns itself, or leaves them as text). */
export const jsonArrayOf = (v: unknown) =>
  (v == null ? [] : typeof v === 'string' ? JSON.parse(v) : v) as Record<string, unknown>[];

/**
 * The entity an alias's columns hold in a row, or null when they are all null (a left join that found nothing).
 * Relations are not set: the caller puts the joined entities in place.
 */
export function hydrate<T extends ObjectLiteral>(
  ds: DataSource,
  target: EntityTarget<T>,
  row: Record<string, unknown>,
  alias: string,
): T | null {
  const { metadata, columns } = mappingOf(ds, target as EntityTarget<ObjectLiteral>);
  const entity = metadata.create() as T;
  let hasData = false;
  for (const c of columns) {
    const value = row[`${alias}_${c.databaseName}`];
    if (value === undefined) continue;
    if (value !== null) hasData = true;
    c.setEntityValue(entity, ds.driver.prepareHydratedValue(value, c));
  }
  return hasData ? entity : null;
}
