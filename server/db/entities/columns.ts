import { CreateDateColumn, UpdateDateColumn } from 'typeorm';

// Timestamps are datetime(3) (milliseconds, like a JS Date). TypeORM's defaults for MariaDB are
// CURRENT_TIMESTAMP(6), which MariaDB stores as CURRENT_TIMESTAMP(3) on a datetime(3) column; declared
// as TypeORM expects, every generated migration would "change" every timestamp column again. Declare the
// default as the database holds it. tests/server/schema-drift.test.ts fails on any such drift.
const NOW_MS = 'CURRENT_TIMESTAMP(3)';

/** Set by the database when the row is inserted. */
export const CreatedAtColumn = (name = 'created_at') =>
  CreateDateColumn({ type: 'datetime', precision: 3, name, default: () => NOW_MS });

/** Set by the database on insert and on every update of the row. */
export const UpdatedAtColumn = (name = 'updated_at') =>
  UpdateDateColumn({ type: 'datetime', precision: 3, name, default: () => NOW_MS, onUpdate: NOW_MS });
