// Runs one CSV export in a process of its own so that a test can give it a hard heap ceiling
// (node --max-old-space-size): an export that held its rows in memory would run out and crash.
import { Writable } from 'node:stream';
import { UserEntity } from '../../server/components/auth/entities';
import { makeDataSource } from '../../server/db/data-source';
import { createServices } from '../../server/services';
import { testConfig } from './app';

async function main() {
  const [url, username, to] = process.argv.slice(2);
  const dataSource = makeDataSource(url, { poolSize: 2 });
  await dataSource.initialize();
  const unusedRunner = { run: () => Promise.reject(new Error('no pipelines in this process')) };
  const services = createServices({ config: testConfig({ databaseUrl: url }), dataSource, pool: unusedRunner, jobs: null });
  const actor = await dataSource.getRepository(UserEntity).findOneByOrFail({ username });
  let bytes = 0;
  let lines = 0;
  let peak = 0;
  const sink = new Writable({
    write(chunk: Buffer, _enc, done) {
      bytes += chunk.length;
      for (const b of chunk) if (b === 10) lines += 1;
      peak = Math.max(peak, process.memoryUsage().heapUsed);
      done();
    },
  });
  await services.records.exportCsv(actor, { to, order: 'newest' }, sink);
  await dataSource.destroy();
  process.stdout.write(JSON.stringify({ bytes, lines, peakHeap: peak }) + '\n');
}

main().catch((err) => {
  process.stderr.write(String(err?.stack ?? err));
  process.exit(1);
});
