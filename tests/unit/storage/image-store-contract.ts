import crypto from 'node:crypto';
import { ImageNotFoundError, type ImageStore } from '../../../server/lib/storage/image-store';

const sha256 = (bytes: Buffer) => crypto.createHash('sha256').update(bytes).digest('hex');

/**
 * What every image store promises, whatever keeps the bytes: content addressing by SHA-256, a
 * second put of the same bytes changes nothing, a missing image is ImageNotFoundError, and a
 * malformed hash never reaches the storage. Each driver's test file runs it with its own store.
 */
export function imageStoreContract(driver: string, open: () => Promise<ImageStore>): void {
  describe(`${driver} image store`, () => {
    let store: ImageStore;
    beforeEach(async () => {
      store = await open();
    });

    test('bytes are addressed by their SHA-256 and read back unchanged', async () => {
      const bytes = crypto.randomBytes(1000);
      const hash = await store.put(bytes);
      expect(hash).toBe(sha256(bytes));
      expect((await store.get(hash)).equals(bytes)).toBe(true);
      expect(await store.has(hash)).toBe(true);
    });

    test('a photo-sized object of several megabytes comes back byte for byte', async () => {
      const bytes = crypto.randomBytes(6 * 1024 * 1024 + 17);
      const hash = await store.put(bytes);
      expect((await store.get(hash)).equals(bytes)).toBe(true);
    });

    test('the hashes are those of the FIPS 180-4 examples: the empty message and "abc"', async () => {
      // SHA-256 test vectors from NIST's published examples for FIPS 180 (common test vectors).
      expect(await store.put(Buffer.alloc(0))).toBe('e3b0c44298fc1c149afbf4c8996fb92427ae41e4649b934ca495991b7852b855');
      expect(await store.put(Buffer.from('abc'))).toBe('ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad');
      expect((await store.get('ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad')).toString()).toBe('abc');
    });

    test('storing the same bytes twice, even at once, gives one name and the same bytes', async () => {
      const bytes = crypto.randomBytes(5000);
      const [a, b] = await Promise.all([store.put(bytes), store.put(bytes)]);
      expect(a).toBe(b);
      expect(await store.put(bytes)).toBe(a);
      expect((await store.get(a)).equals(bytes)).toBe(true);
    });

    test('a missing image is ImageNotFoundError and has() says no', async () => {
      await expect(store.get('0'.repeat(64))).rejects.toBeInstanceOf(ImageNotFoundError);
      expect(await store.has('f'.repeat(64))).toBe(false);
    });

    test('a malformed hash is refused by get() and is never stored according to has()', async () => {
      await expect(store.get('../../etc/passwd')).rejects.toThrow(/Not an image hash/);
      expect(await store.has('A'.repeat(64))).toBe(false);
    });
  });
}
