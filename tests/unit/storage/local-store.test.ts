import crypto from 'node:crypto';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { ImageNotFoundError } from '../../../server/lib/storage/image-store';
import { LocalImageStore } from '../../../server/lib/storage/local-store';

let root: string;
let store: LocalImageStore;
beforeEach(() => {
  root = fs.mkdtempSync(path.join(os.tmpdir(), 'kw-store-'));
  store = new LocalImageStore(root);
});
afterEach(() => fs.rmSync(root, { recursive: true, force: true }));

test('bytes are addressed by their SHA-256 and read back unchanged', async () => {
  const bytes = crypto.randomBytes(1000);
  const hash = await store.put(bytes);
  expect(hash).toBe(crypto.createHash('sha256').update(bytes).digest('hex'));
  expect((await store.get(hash)).equals(bytes)).toBe(true);
  expect(fs.existsSync(path.join(root, hash.slice(0, 2), hash.slice(2, 4), hash))).toBe(true);
});

test('the empty input hashes to the FIPS 180-4 value for the empty message', async () => {
  // SHA-256("") from NIST's published examples (common test vector).
  expect(await store.put(Buffer.alloc(0))).toBe('e3b0c44298fc1c149afbf4c8996fb92427ae41e4649b934ca495991b7852b855');
});

test('storing the same bytes twice keeps one file and leaves no temporary files', async () => {
  const bytes = Buffer.from('same photo');
  const [a, b] = await Promise.all([store.put(bytes), store.put(bytes)]);
  expect(a).toBe(b);
  const dir = path.join(root, a.slice(0, 2), a.slice(2, 4));
  expect(fs.readdirSync(dir)).toEqual([a]);
});

test('a missing image is a clear error, and a malformed hash never reaches the file system', async () => {
  await expect(store.get('0'.repeat(64))).rejects.toBeInstanceOf(ImageNotFoundError);
  await expect(store.get('../../etc/passwd')).rejects.toThrow(/Not an image hash/);
  expect(await store.has('f'.repeat(64))).toBe(false);
});
