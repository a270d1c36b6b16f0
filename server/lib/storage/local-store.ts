import crypto from 'node:crypto';
import fs from 'node:fs/promises';
import path from 'node:path';
import { HASH_PATTERN, ImageNotFoundError, type ImageStore } from './image-store';

/**
 * Image store in a local folder: <root>/ab/cd/<sha256>. A file is written to a temporary name in the
 * same folder and renamed into place, so a reader never sees half a file and a crash leaves no
 * file under a real name.
 */
export class LocalImageStore implements ImageStore {
  constructor(private readonly root: string) {}

  private pathOf(hash: string): string {
    if (!HASH_PATTERN.test(hash)) throw new Error(`Not an image hash: ${hash}`);
    return path.join(this.root, hash.slice(0, 2), hash.slice(2, 4), hash);
  }

  async put(bytes: Buffer): Promise<string> {
    const hash = crypto.createHash('sha256').update(bytes).digest('hex');
    const target = this.pathOf(hash);
    if (await this.has(hash)) return hash;
    await fs.mkdir(path.dirname(target), { recursive: true });
    const temp = `${target}.${process.pid}.${crypto.randomBytes(4).toString('hex')}.tmp`;
    const handle = await fs.open(temp, 'wx');
    try {
      await handle.writeFile(bytes);
      await handle.sync();
    } finally {
      await handle.close();
    }
    await fs.rename(temp, target);
    return hash;
  }

  async get(hash: string): Promise<Buffer> {
    try {
      return await fs.readFile(this.pathOf(hash));
    } catch (err) {
      if ((err as NodeJS.ErrnoException).code === 'ENOENT') throw new ImageNotFoundError(hash);
      throw err;
    }
  }

  async has(hash: string): Promise<boolean> {
    try {
      await fs.access(this.pathOf(hash));
      return true;
    } catch {
      return false;
    }
  }
}
