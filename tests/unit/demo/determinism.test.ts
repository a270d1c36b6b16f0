import { createHash } from 'node:crypto';
import { mkdtemp, readdir, readFile, rm } from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import { generateDataset, writeDataset, type DatasetOptions } from '../../../server/demo';

const options: DatasetOptions = {
  count: 6,
  seed: 7,
  sizes: [{ width: 640, height: 480 }, { width: 1024, height: 768 }],
  colourShare: 0.5,
  sixteenBitShare: 0.3,
  jpegShare: 0.5,
  retakeShare: 0.2,
};

async function fileHashes(datasetOptions: DatasetOptions): Promise<Map<string, string>> {
  const hashes = new Map<string, string>();
  for await (const image of generateDataset(datasetOptions)) {
    hashes.set(image.fileName, createHash('sha256').update(image.buffer).digest('hex'));
  }
  return hashes;
}

describe('demo photo sets are reproducible', () => {
  jest.setTimeout(120_000);

  it('the same seed gives byte-identical files', async () => {
    const first = await fileHashes(options);
    const second = await fileHashes(options);
    expect(first.size).toBe(options.count);
    expect([...second.entries()]).toEqual([...first.entries()]);
  });

  it('a different seed gives different files', async () => {
    const first = await fileHashes(options);
    const other = await fileHashes({ ...options, seed: 8 });
    const shared = new Set(first.values());
    expect([...other.values()].filter((hash) => shared.has(hash))).toEqual([]);
  });

  it('writes the same folder twice, truth.json included, and truth.json lists every photo written', async () => {
    const dirs = [await mkdtemp(path.join(os.tmpdir(), 'demo-a-')), await mkdtemp(path.join(os.tmpdir(), 'demo-b-'))];
    try {
      for (const dir of dirs) await writeDataset(dir, options);
      const names = (await readdir(dirs[0])).sort();
      expect((await readdir(dirs[1])).sort()).toEqual(names);
      for (const name of names) {
        const [a, b] = await Promise.all(dirs.map((dir) => readFile(path.join(dir, name))));
        expect(a.equals(b)).toBe(true);
      }
      const truth = JSON.parse(await readFile(path.join(dirs[0], 'truth.json'), 'utf8'));
      expect(truth.seed).toBe(options.seed);
      expect(typeof truth.generator).toBe('string');
      expect(truth.images.map((image: { file: string }) => image.file).sort()).toEqual(
        names.filter((name) => name !== 'truth.json'),
      );
    } finally {
      await Promise.all(dirs.map((dir) => rm(dir, { recursive: true, force: true })));
    }
  });
});
