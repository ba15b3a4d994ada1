import type { DataSource, EntityMetadata, EntityTarget, ObjectLiteral } from 'typeorm';

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
    m = { metadata, columns: metadata.columns.filter((c) => !c.isVirtual) };
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

const JSON_SAFE = new Set([
  'uuid',
  'varchar',
  'char',
  'text',
  'int',
  'integer',
  'smallint',
  'tinyint',
  'enum',
]);

/**
 * A JSON object of an entity's columns under the keys `selectColumns` uses, for `JSON_ARRAYAGG` of a to-many
 * relation inside the parent's own statement (one row for the parent, not one per child). Only for entities of text
 * and whole-number columns: JSON would lose a date's type and a decimal's digits, so any other column refuses.
 */
export function jsonObjectOf(ds: DataSource, target: EntityTarget<ObjectLiteral>, alias: string) {
  const { metadata, columns } = mappingOf(ds, target);
  const unsafe = columns.filter((c) => !JSON_SAFE.has(String(c.type)));
  if (unsafe.length)
    throw new Error(
      `${metadata.name}: ${unsafe.map((c) => c.propertyName).join(', ')} cannot travel as JSON`,
    );
  return `JSON_OBJECT(${columns.map((c) => `'${alias}_${c.databaseName}', ${alias}.\`${c.databaseName}\``).join(', ')})`;
}

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
