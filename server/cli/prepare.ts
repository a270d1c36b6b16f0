// Migrates the database and seeds the demo plant; prints the demo accounts the first time.
// Settings: KW_DEMO=0 skips the plant (users only); KW_DEMO_DAYS and KW_DEMO_PER_STATION_PER_DAY size the history.
import { loadConfig } from '../config';
import { makeDataSource } from '../db/data-source';
import { createServices } from '../services';
import { seedDemoPlant } from '../seed/demo-plant';
import { MemoizingRunner } from '../seed/memo-runner';
import { DEMO_PASSWORD, DEMO_USERS, seedDemoUsers } from '../seed/demo-users';
import { loadKernelLibrary } from '../vision/kernel-library';
import { VisionPool } from '../vision/pool';

function whole(name: string, fallback: number): number {
  const value = process.env[name];
  if (value === undefined || value === '') return fallback;
  const n = Number(value);
  if (!Number.isInteger(n) || n < 0) throw new Error(`${name} must be a whole number, got "${value}"`);
  return n;
}

async function prepare() {
  const config = loadConfig();
  const dataSource = makeDataSource(config.databaseUrl, { poolSize: 8 });
  await dataSource.initialize();
  const pool = new VisionPool({ kernels: await loadKernelLibrary() });
  try {
    const ran = await dataSource.runMigrations({ transaction: 'each' });
    if (ran.length) console.log(`[kernwright] ran ${ran.length} migration(s): ${ran.map((m) => m.name).join(', ')}`);
    const created = await seedDemoUsers(dataSource);
    if (process.env.KW_DEMO !== '0') {
      const started = Date.now();
      const services = createServices({ config, dataSource, pool: new MemoizingRunner(pool), jobs: null });
      await seedDemoPlant(services, {
        historyDays: whole('KW_DEMO_DAYS', 30),
        perStationPerDay: whole('KW_DEMO_PER_STATION_PER_DAY', 25),
        log: (line) => console.log(`[kernwright] demo plant: ${line}`),
      });
      const seconds = (Date.now() - started) / 1000;
      if (seconds > 1) console.log(`[kernwright] demo plant ready in ${seconds.toFixed(1)} s`);
    }
    if (created.length) {
      console.log('\n[kernwright] Demo accounts (password for each: ' + DEMO_PASSWORD + ')');
      for (const person of DEMO_USERS.filter((p) => created.includes(p.username)))
        console.log(`  ${person.username.padEnd(11)} ${person.roles.join(', ').padEnd(11)} ${person.displayName}`);
      console.log('');
    }
  } finally {
    await pool.destroy();
    await dataSource.destroy();
  }
}

prepare().catch((err) => {
  console.error(`[kernwright] preparing the database failed: ${err instanceof Error ? err.stack ?? err.message : String(err)}`);
  process.exit(1);
});
