// Several processes start at once and each declares the queues it uses: pg-boss creates a queue's
// partition table on first use, and two processes creating queues together can deadlock in
// PostgreSQL. Every process must still start.
import { JobQueue } from '../../server/lib/jobs';
import { createTestDatabase, type TestDatabase } from '../support/db';

jest.setTimeout(120_000);

let db: TestDatabase;
const queues: JobQueue[] = [];

beforeAll(async () => {
  db = await createTestDatabase();
});

afterAll(async () => {
  await Promise.all(queues.map((q) => q.stop()));
  await db.drop();
});

test('four processes declaring the same new queues at the same moment all succeed', async () => {
  const processes = await Promise.all([1, 2, 3, 4].map(() => new JobQueue(db.url).start()));
  queues.push(...processes);
  for (let round = 0; round < 5; round++) {
    const names = ['a', 'b', 'c', 'd'].map((letter) => `race-${round}-${letter}`);
    // Each process declares the names in its own order, as workers registering handlers would.
    await Promise.all(processes.map((q, i) => Promise.all(names.map((_, k) => q.declare(names[(k + i) % names.length])))));
  }
  const [{ count }] = await db.dataSource.query(`select count(*)::int as count from pgboss.queue where name like 'race-%'`);
  expect(count).toBe(20);
});

test('a job sent by one process is worked by another once its queue exists', async () => {
  const [sender, worker] = queues;
  const seen: string[] = [];
  await worker.work<{ tag: string }>('race-handover', async ({ tag }) => {
    seen.push(tag);
  });
  await sender.send('race-handover', { tag: 'part-17' });
  const deadline = Date.now() + 30_000;
  while (seen.length === 0 && Date.now() < deadline) await new Promise((r) => setTimeout(r, 200));
  expect(seen).toEqual(['part-17']);
});

test('work repeated once a day is accepted (pg-boss keeps finished jobs only 12 hours)', async () => {
  const [q] = queues;
  await q.repeat('race-daily', 24 * 60);
  const [{ count }] = await db.dataSource.query(`select count(*)::int as count from pgboss.job where name = 'race-daily'`);
  expect(count).toBe(1);
});
