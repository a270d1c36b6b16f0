import crypto from 'node:crypto';
import { Client } from 'pg';
import type { DataSource } from 'typeorm';
import { makeDataSource } from '../../server/db/data-source';
import { TEMPLATE_DB, testServerUrl } from './env';

export interface TestDatabase {
  url: string;
  dataSource: DataSource;
  drop(): Promise<void>;
}

async function adminQuery(sql: string): Promise<void> {
  const admin = new Client({ connectionString: `${testServerUrl()}/postgres` });
  await admin.connect();
  try {
    await admin.query(sql);
  } finally {
    await admin.end();
  }
}

/** A database of its own for one test file: an empty one, or a copy of the migrated template. */
export async function createTestDatabase(options: { empty?: boolean } = {}): Promise<TestDatabase> {
  const name = `kw_t_${crypto.randomBytes(6).toString('hex')}`;
  await adminQuery(options.empty ? `create database "${name}"` : `create database "${name}" template "${TEMPLATE_DB}"`);
  const url = `${testServerUrl()}/${name}`;
  const dataSource = makeDataSource(url, { poolSize: 4 });
  await dataSource.initialize();
  return {
    url,
    dataSource,
    async drop() {
      if (dataSource.isInitialized) await dataSource.destroy();
      await adminQuery(`drop database if exists "${name}" with (force)`);
    },
  };
}
