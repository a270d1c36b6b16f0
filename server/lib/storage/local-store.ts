import crypto from 'node:crypto';
import type { Dir } from 'node:fs';
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

  /**
   * Deletes temporary files a crashed or killed process left behind in the middle of a write. Only
   * files older than `olderThanMs` go, so that another process's write in progress is left alone.
   */
  async removeLeftovers(olderThanMs = 10 * 60 * 1000): Promise<number> {
    const entries = await fs.readdir(this.root, { recursive: true, withFileTypes: true }).catch(() => []);
    const cutoff = Date.now() - olderThanMs;
    let removed = 0;
    for (const entry of entries) {
      if (!entry.isFile() || !entry.name.endsWith('.tmp')) continue;
      const file = path.join(entry.parentPath ?? entry.path, entry.name);
      const stat = await fs.stat(file).catch(() => null);
      if (stat && stat.mtimeMs < cutoff && (await fs.rm(file, { force: true }).then(() => true, () => false))) removed += 1;
    }
    return removed;
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

  async *list(skipped: (name: string) => void = () => undefined): AsyncIterable<string> {
    for await (const relative of entriesUnder(this.root, '')) {
      const name = path.basename(relative);
      if (HASH_PATTERN.test(name) && relative === path.join(name.slice(0, 2), name.slice(2, 4), name)) yield name;
      else skipped(relative);
    }
  }
}

/** Paths (relative to root) of everything under root that is not a folder, read folder by folder; nothing when root is absent. */
async function* entriesUnder(root: string, relative: string): AsyncGenerator<string> {
  let folder: Dir;
  try {
    folder = await fs.opendir(path.join(root, relative));
  } catch (err) {
    if (relative === '' && (err as NodeJS.ErrnoException).code === 'ENOENT') return;
    throw err;
  }
  for await (const entry of folder) {
    const child = path.join(relative, entry.name);
    if (entry.isDirectory()) yield* entriesUnder(root, child);
    else yield child;
  }
}
