import { createApp } from './app';
import { loadConfig } from './config';
import { makeDataSource } from './db/data-source';
import { createLogger } from './lib/logger';

async function main() {
  const config = loadConfig();
  const logger = createLogger(config.logLevel);
  const dataSource = makeDataSource(config.databaseUrl);
  await dataSource.initialize();
  const pending = await dataSource.showMigrations();
  if (pending) throw new Error('The database has migrations that have not run; run `npm start` (it migrates) or `npm run db:migrate`');

  const app = createApp({ config, dataSource, logger });
  const server = app.listen(config.port, config.host, () => {
    const url = `http://${config.host === '0.0.0.0' ? 'localhost' : config.host}:${config.port}`;
    logger.info({ url }, 'Kernwright is running');
    process.stdout.write(`\nKernwright is running at ${url}${config.webDir ? '' : ' (API only: the web app is not built)'}\n\n`);
  });

  const shutdown = () => {
    server.close(() => dataSource.destroy().finally(() => process.exit(0)));
    setTimeout(() => process.exit(0), 5000).unref();
  };
  process.on('SIGINT', shutdown);
  process.on('SIGTERM', shutdown);
}

main().catch((err) => {
  process.stderr.write(`Kernwright could not start: ${err instanceof Error ? err.message : String(err)}\n`);
  process.exit(1);
});
