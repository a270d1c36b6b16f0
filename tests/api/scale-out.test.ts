import type { ScaleProofReport } from '../../scripts/scale-proof';
import { createTestDatabase, type TestDatabase } from '../support/db';
import { runInNode } from '../support/in-node';

// Four server processes and the seed run in plain Node children; on 2 busy cores this takes a few minutes at worst.
jest.setTimeout(600_000);

let db: TestDatabase;
beforeAll(async () => {
  db = await createTestDatabase();
});
afterAll(() => db.drop());

test('two API and two worker processes on one database and one bucket store every inspection once and count every trial photo once', async () => {
  const inspections = 30;
  const trials = 3;
  const report = await runInNode<ScaleProofReport>('scripts/scale-proof.ts', 'runScaleProof', [
    { databaseUrl: db.url, inspections, trials, referencePhotos: 8, concurrency: 6, apiPorts: [8110, 8111] },
  ]);
  expect(report.failures).toEqual([]);
  const i = report.inspections;
  // Every fourth key was sent a second time, to the other API process.
  expect(i.resentToOtherNode).toBe(Math.ceil(inspections / 4));
  expect(i.sent).toBe(inspections + i.resentToOtherNode);
  expect(i).toMatchObject({ stored: inspections, distinctKeys: inspections, keysAnsweredWithOneInspection: inspections, keysCreatedOnce: inspections, photosInBucket: inspections });
  expect(i.answeredPerNode[0]).toBeGreaterThan(0);
  expect(i.answeredPerNode[1]).toBeGreaterThan(0);
  const t = report.trials;
  // The trial queued while only the API processes ran waited for a worker: API processes run no jobs.
  expect(t).toMatchObject({ started: trials, stayedQueuedWithoutWorkers: true, done: trials, everyPhotoCountedOnce: true });
  expect(t.resultRows).toBe(t.photos);
  expect(t.distinctResults).toBe(t.photos);
  expect(t.workersThatRanTrials).toEqual(['worker-1', 'worker-2']);
  expect(report.localImageFiles).toBe(0);
});
