import type { AppDataSource } from '../../db/data-source';

/** Whether the database answers at all (the health check's one statement). */
export async function databaseUp(ds: AppDataSource): Promise<boolean> {
  try {
    await ds.query('SELECT 1');
    return true;
  } catch {
    return false;
  }
}
