import crypto from 'node:crypto';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { LocalImageStore } from '../../../server/lib/storage/local-store';
import { imageStoreContract } from './image-store-contract';

const roots: string[] = [];
function freshStore(): { root: string; store: LocalImageStore } {
  const root = fs.mkdtempSync(path.join(os.tmpdir(), 'kw-store-'));
  roots.push(root);
  return { root, store: new LocalImageStore(root) };
}
afterAll(() => {
  for (const root of roots) fs.rmSync(root, { recursive: true, force: true });
});

imageStoreContract('local folder', async () => freshStore().store);

test('an image is one file under <root>/ab/cd/<sha256>', async () => {
  const { root, store } = freshStore();
  const hash = await store.put(crypto.randomBytes(1000));
  expect(fs.existsSync(path.join(root, hash.slice(0, 2), hash.slice(2, 4), hash))).toBe(true);
});

test('storing the same bytes twice at once keeps one file and leaves no temporary files', async () => {
  const { root, store } = freshStore();
  const bytes = Buffer.from('same photo');
  const [a] = await Promise.all([store.put(bytes), store.put(bytes)]);
  expect(fs.readdirSync(path.join(root, a.slice(0, 2), a.slice(2, 4)))).toEqual([a]);
});
