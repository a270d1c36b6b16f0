// Builds a migrated template database once per run; each test file copies it (see db.ts).
import { Client } from 'pg';
import { makeDataSource } from '../../server/db/data-source';
import { TEMPLATE_DB, testServerUrl } from './env';

export default async function globalSetup(): Promise<void> {
  if (process.env.KW_TEMPLATE_READY === '1') return;
  const base = testServerUrl();
  const admin = new Client({ connectionString: `${base}/postgres` });
  await admin.connect();
  try {
    const stale = await admin.query("select datname from pg_database where datname like 'kw_t_%' or datname = $1", [TEMPLATE_DB]);
    for (const row of stale.rows) await admin.query(`drop database if exists "${row.datname}" with (force)`);
    await admin.query(`create database "${TEMPLATE_DB}"`);
  } finally {
    await admin.end();
  }
  const dataSource = makeDataSource(`${base}/${TEMPLATE_DB}`, { poolSize: 1 });
  await dataSource.initialize();
  await dataSource.runMigrations({ transaction: 'each' });
  await dataSource.destroy();
  process.env.KW_TEMPLATE_READY = '1';
}
