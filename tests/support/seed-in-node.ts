// Seeds the demo plant into a database from a plain Node process (see in-node.ts), as `npm start` does.
import { makeDataSource } from '../../server/db/data-source';
import { createServices } from '../../server/services';
import { seedDemoPlant, type DemoPlantOptions } from '../../server/seed/demo-plant';
import { seedDemoUsers } from '../../server/seed/demo-users';
import { MemoizingRunner } from '../../server/seed/memo-runner';
import { loadKernelLibrary } from '../../server/vision/kernel-library';
import { VisionPool } from '../../server/vision/pool';
import { testConfig } from './app';

export async function seedPlantInto(databaseUrl: string, imageDir: string, options: DemoPlantOptions): Promise<{ seconds: number }> {
  const started = Date.now();
  const dataSource = makeDataSource(databaseUrl, { poolSize: 6 });
  await dataSource.initialize();
  const pool = new VisionPool({ kernels: await loadKernelLibrary(), threads: 2 });
  try {
    await seedDemoUsers(dataSource);
    const services = createServices({ config: testConfig({ databaseUrl, imageDir }), dataSource, pool: new MemoizingRunner(pool), jobs: null });
    await seedDemoPlant(services, options);
  } finally {
    await pool.destroy();
    await dataSource.destroy();
  }
  return { seconds: (Date.now() - started) / 1000 };
}
