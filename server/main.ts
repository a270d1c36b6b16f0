import type { Server } from 'node:http';
import path from 'node:path';
import { createApp } from './app';
import { loadConfig } from './config';
import { makeDataSource } from './db/data-source';
import { ensureFakeS3 } from './lib/fake-s3';
import { startFakeSmtp } from './lib/fake-smtp';
import { JobQueue } from './lib/jobs';
import { createLogger } from './lib/logger';
import { standInDir } from './lib/storage/open-store';
import { createServices } from './services';
import { loadKernelLibrary } from './vision/kernel-library';
import { missingPoolFlags, VisionPool } from './vision/pool';
import { startWorkers } from './workers';

/**
 * One Kernwright process. KW_ROLE=all (the default) serves the API and runs the queued jobs;
 * `api` only serves HTTP (inspections and previews run in its own vision pool, queued work is only
 * sent), `worker` only runs queued jobs (trials, e-mail, alerts). Any number of each may share one
 * PostgreSQL and one image bucket.
 */
async function main() {
  const config = loadConfig();
  const role = config.role ?? 'all';
  const serves = role !== 'worker';
  const works = role !== 'api';
  const logger = createLogger(config.logLevel);
  const dataSource = makeDataSource(config.databaseUrl);
  await dataSource.initialize();
  if (await dataSource.showMigrations()) throw new Error('The database has migrations that have not run; run `npm start` (it migrates) or `npm run db:migrate`');

  // E-mail leaves from the processes that run jobs, so the stand-in mail server runs there.
  if (config.fakeSmtp && works) {
    const dir = path.join(config.dataDir, 'mail');
    await startFakeSmtp({ port: config.smtp.port, dir });
    logger.info({ port: config.smtp.port, dir }, 'stand-in mail server on loopback; messages are kept as .eml files');
  }
  if (config.s3 && config.s3.endpoint === null) {
    const dir = standInDir(config);
    const fake = await ensureFakeS3({ port: config.s3.standInPort, dir, bucket: config.s3.bucket });
    logger.info({ port: config.s3.standInPort, dir, startedHere: fake !== null }, 'stand-in S3 server on loopback for the image bucket');
  }
  const pool = new VisionPool({ kernels: await loadKernelLibrary(), threads: config.visionThreads });
  const missingFlags = missingPoolFlags();
  if (missingFlags.length > 0) logger.warn({ missing: missingFlags }, `started without ${missingFlags.join(' ')}: the worker pool loses a share of its throughput (see server/vision/pool.ts)`);
  const jobs = await new JobQueue(config.databaseUrl).start();
  const services = createServices({ config, dataSource, pool, jobs });
  if (works) await startWorkers(jobs, services);

  let server: Server | null = null;
  if (serves) {
    const app = createApp({ config, services, logger });
    server = app.listen(config.port, config.host, () => {
      const url = `http://${config.host === '0.0.0.0' ? 'localhost' : config.host}:${config.port}`;
      logger.info({ url, role }, 'Kernwright is running');
      process.stdout.write(`\nKernwright is running at ${url}${config.webDir ? '' : ' (API only: the web app is not built)'}${role === 'api' ? ' (queued jobs run elsewhere)' : ''}\n\n`);
    });
  } else {
    logger.info({ role, pid: process.pid, threads: pool.threads }, 'Kernwright worker is running');
    process.stdout.write(`\nKernwright worker ${process.pid} is running trials, e-mail and alert checks from the queue\n\n`);
  }

  let stopping = false;
  const shutdown = () => {
    if (stopping) return;
    stopping = true;
    setTimeout(() => process.exit(0), 10_000).unref();
    const stopRest = () => {
      void jobs
        .stop()
        .then(() => pool.destroy())
        .then(() => dataSource.destroy())
        .finally(() => process.exit(0));
    };
    if (server) server.close(stopRest);
    else stopRest();
  };
  process.on('SIGINT', shutdown);
  process.on('SIGTERM', shutdown);
}

main().catch((err) => {
  process.stderr.write(`Kernwright could not start: ${err instanceof Error ? err.message : String(err)}\n`);
  process.exit(1);
});
