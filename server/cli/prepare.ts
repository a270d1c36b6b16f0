// Migrates the database and seeds the demo plant; prints the demo accounts the first time.
import { loadConfig } from '../config';
import { makeDataSource } from '../db/data-source';
import { DEMO_PASSWORD, DEMO_USERS, seedDemoUsers } from '../seed/demo-users';

async function prepare() {
  const config = loadConfig();
  const dataSource = makeDataSource(config.databaseUrl, { poolSize: 4 });
  await dataSource.initialize();
  try {
    const ran = await dataSource.runMigrations({ transaction: 'each' });
    if (ran.length) console.log(`[kernwright] ran ${ran.length} migration(s): ${ran.map((m) => m.name).join(', ')}`);
    const created = await seedDemoUsers(dataSource);
    if (created.length) {
      console.log('\n[kernwright] Demo accounts (password for each: ' + DEMO_PASSWORD + ')');
      for (const person of DEMO_USERS.filter((p) => created.includes(p.username)))
        console.log(`  ${person.username.padEnd(11)} ${person.roles.join(', ').padEnd(11)} ${person.displayName}`);
      console.log('');
    }
  } finally {
    await dataSource.destroy();
  }
}

prepare().catch((err) => {
  console.error(`[kernwright] preparing the database failed: ${err instanceof Error ? err.message : String(err)}`);
  process.exit(1);
});
