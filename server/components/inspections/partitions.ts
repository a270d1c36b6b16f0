import type { DataSource } from 'typeorm';

/** The queue of the daily partition check (server/workers.ts). */
export const PARTITION_QUEUE = 'inspection-partitions';

/** Months made ahead of the current one, so that a missed day or two of the daily check costs nothing. */
export const MONTHS_AHEAD = 2;

/** The first instant (UTC) of the month that contains `at`, moved by `months`. */
export function monthStart(at: Date, months = 0): Date {
  return new Date(Date.UTC(at.getUTCFullYear(), at.getUTCMonth() + months, 1));
}

/** The partition that holds the inspections of the month (UTC) containing `at`. */
export function partitionName(at: Date): string {
  return `inspections_y${String(at.getUTCFullYear()).padStart(4, '0')}m${String(at.getUTCMonth() + 1).padStart(2, '0')}`;
}

/**
 * Makes sure every month (UTC) from `from` to `to` has its partition of inspections; rows of such a
 * month that had landed in the DEFAULT partition move into it (kw_ensure_inspection_month, migration
 * PartitionInspectionsByMonth). Returns the partitions' names, oldest first.
 */
export async function ensureInspectionMonths(dataSource: DataSource, from: Date, to: Date): Promise<string[]> {
  const names: string[] = [];
  for (let month = monthStart(from); month <= to; month = monthStart(month, 1)) {
    const [{ name }] = await dataSource.query('select kw_ensure_inspection_month($1) as name', [month.toISOString()]);
    names.push(name);
  }
  await validateInspectionReferences(dataSource);
  return names;
}

/** This month's partition and the next ones' (MONTHS_AHEAD), at process start and once a day. */
export function ensureInspectionPartitions(dataSource: DataSource, now = new Date()): Promise<string[]> {
  return ensureInspectionMonths(dataSource, now, monthStart(now, MONTHS_AHEAD));
}

/**
 * Moving rows out of DEFAULT brings the foreign keys into inspections back NOT VALID (checked for new
 * rows only); validating the existing rows takes no lock that stops inserts, so it runs here, after
 * the move has committed, and again on any later run if a process stopped in between.
 */
async function validateInspectionReferences(dataSource: DataSource): Promise<void> {
  const pending: { referencing: string; name: string }[] = await dataSource.query(
    `select c.conrelid::regclass::text as referencing, c.conname as name from pg_constraint c
     where c.confrelid = 'inspections'::regclass and c.contype = 'f' and c.conparentid = 0 and not c.convalidated`,
  );
  for (const { referencing, name } of pending) await dataSource.query(`alter table ${referencing} validate constraint "${name.replace(/"/g, '""')}"`);
}
