// Runs pending migrations (npm run db:migrate).
import { loadConfig } from '../config';
import { makeDataSource } from '../db/data-source';

async function migrate() {
  const dataSource = makeDataSource(loadConfig().databaseUrl, { poolSize: 2 });
  await dataSource.initialize();
  try {
    const ran = await dataSource.runMigrations({ transaction: 'each' });
    console.log(ran.length ? `ran ${ran.map((m) => m.name).join(', ')}` : 'the database is up to date');
  } finally {
    await dataSource.destroy();
  }
}

migrate().catch((err) => {
  console.error(`migration failed: ${err instanceof Error ? err.message : String(err)}`);
  process.exit(1);
});
