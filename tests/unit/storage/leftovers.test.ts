// A process killed in the middle of writing an image leaves a temporary file; the next start
// removes it, but never a file another process may still be writing, nor a stored image.
import fs from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import { LocalImageStore } from '../../../server/lib/storage/local-store';

test('old temporary files are removed; fresh ones and stored images stay', async () => {
  const root = await fs.mkdtemp(path.join(os.tmpdir(), 'kw-leftovers-'));
  try {
    const store = new LocalImageStore(root);
    const hash = await store.put(Buffer.from('a stored photo'));
    const folder = path.join(root, hash.slice(0, 2), hash.slice(2, 4));
    const stale = path.join(folder, `${hash}.1234.abcd.tmp`);
    const fresh = path.join(folder, `${hash}.5678.ef01.tmp`);
    await fs.writeFile(stale, 'half a photo');
    await fs.writeFile(fresh, 'being written');
    const hourAgo = new Date(Date.now() - 60 * 60 * 1000);
    await fs.utimes(stale, hourAgo, hourAgo);

    expect(await store.removeLeftovers(10 * 60 * 1000)).toBe(1);
    expect((await fs.readdir(folder)).sort()).toEqual([hash, path.basename(fresh)].sort());
    expect((await store.get(hash)).toString()).toBe('a stored photo');
  } finally {
    await fs.rm(root, { recursive: true, force: true });
  }
});
