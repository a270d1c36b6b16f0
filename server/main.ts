import { createApp } from './app';
import { loadConfig } from './config';
import { makeDataSource } from './db/data-source';
import { JobQueue } from './lib/jobs';
import { startFakeSmtp } from './lib/fake-smtp';
import { createLogger } from './lib/logger';
import path from 'node:path';
import { createServices } from './services';
import { loadKernelLibrary } from './vision/kernel-library';
import { VisionPool } from './vision/pool';
import { startWorkers } from './workers';

async function main() {
  const config = loadConfig();
  const logger = createLogger(config.logLevel);
  const dataSource = makeDataSource(config.databaseUrl);
  await dataSource.initialize();
  if (await dataSource.showMigrations()) throw new Error('The database has migrations that have not run; run `npm start` (it migrates) or `npm run db:migrate`');

  if (config.fakeSmtp) {
    const dir = path.join(config.dataDir, 'mail');
    await startFakeSmtp({ port: config.smtp.port, dir });
    logger.info({ port: config.smtp.port, dir }, 'stand-in mail server on loopback; messages are kept as .eml files');
  }
  const pool = new VisionPool({ kernels: await loadKernelLibrary() });
  const jobs = await new JobQueue(config.databaseUrl).start();
  const services = createServices({ config, dataSource, pool, jobs });
  await startWorkers(jobs, services);

  const app = createApp({ config, services, logger });
  const server = app.listen(config.port, config.host, () => {
    const url = `http://${config.host === '0.0.0.0' ? 'localhost' : config.host}:${config.port}`;
    logger.info({ url }, 'Kernwright is running');
    process.stdout.write(`\nKernwright is running at ${url}${config.webDir ? '' : ' (API only: the web app is not built)'}\n\n`);
  });

  let stopping = false;
  const shutdown = () => {
    if (stopping) return;
    stopping = true;
    setTimeout(() => process.exit(0), 10_000).unref();
    server.close(() => {
      void jobs
        .stop()
        .then(() => pool.destroy())
        .then(() => dataSource.destroy())
        .finally(() => process.exit(0));
    });
  };
  process.on('SIGINT', shutdown);
  process.on('SIGTERM', shutdown);
}

main().catch((err) => {
  process.stderr.write(`Kernwright could not start: ${err instanceof Error ? err.message : String(err)}\n`);
  process.exit(1);
});
