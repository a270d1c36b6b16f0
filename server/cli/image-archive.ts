/**
 * Copies the image store that the settings name (KW_STORAGE, KW_S3_*, KW_IMAGE_DIR, as the server
 * reads them) to and from a folder in the local store's layout, ab/cd/<sha256>; npm run backup and
 * npm run restore use it when the images live in a bucket.
 *   image-archive export DIR              every image of the store into DIR (new or empty)
 *   image-archive import DIR              every image of DIR into the store; those already there are left alone
 *   image-archive verify DIR | MANIFEST   reads back from the store each image of DIR, or each hash of
 *                                         MANIFEST (one per line, as a backup's images.txt)
 * Every image is checked against its SHA-256 on the way. Names that are not image hashes are skipped
 * and listed. Exit status: 0 done, 1 an image missing or damaged or the store failed, 2 bad arguments.
 */
import crypto from 'node:crypto';
import { createReadStream } from 'node:fs';
import fs from 'node:fs/promises';
import path from 'node:path';
import readline from 'node:readline';
import { loadConfig, type Config } from '../config';
import { HASH_PATTERN, ImageNotFoundError, type ImageStore } from '../lib/storage/image-store';
import { LocalImageStore } from '../lib/storage/local-store';
import { openImageStore } from '../lib/storage/open-store';
import { DamagedImageError } from '../lib/storage/s3-store';

const USAGE = `Usage: image-archive export DIR | import DIR | verify DIR-or-MANIFEST
  export DIR        write every image of the configured store into DIR (new or empty), as ab/cd/<sha256>
  import DIR        put every image of DIR into the configured store, leaving those already there
  verify PATH       read back from the store each image of the folder PATH, or each hash listed in the file PATH
The store is the one the server would use: KW_STORAGE=s3 with KW_S3_*, else the folder KW_IMAGE_DIR.`;

/** Images worked on at once: a bucket answers each request after a round trip, and each image is held whole in memory. */
const IN_FLIGHT = 4;
const PROGRESS_EVERY = 1000;

class ArgumentError extends Error {}

/** One image's bytes do not hash to its name. */
class HashMismatchError extends Error {}

interface Tally {
  done: number;
  alreadyThere: number;
  skippedNames: string[];
  failures: string[];
}

const newTally = (): Tally => ({ done: 0, alreadyThere: 0, skippedNames: [], failures: [] });

function sha256(bytes: Buffer): string {
  return crypto.createHash('sha256').update(bytes).digest('hex');
}

function describeStore(config: Config): string {
  if (!config.s3) return `the folder ${config.imageDir}`;
  return `the bucket ${config.s3.bucket} at ${config.s3.endpoint ?? `the stand-in on port ${config.s3.standInPort}`}`;
}

function failureOf(hash: string, err: unknown): string {
  if (err instanceof ImageNotFoundError) return `image ${hash} is missing`;
  if (err instanceof DamagedImageError || err instanceof HashMismatchError) return `image ${hash} is damaged: its bytes do not hash to its name`;
  return `image ${hash}: ${err instanceof Error ? err.message : String(err)}`;
}

/** Reads an image and checks its bytes against its name, whatever the store checks itself. */
async function readChecked(store: ImageStore, hash: string): Promise<Buffer> {
  const bytes = await store.get(hash);
  if (sha256(bytes) !== hash) throw new HashMismatchError(hash);
  return bytes;
}

/** Runs `work` on each item with at most `limit` at once; `work` must not reject. */
async function forEachBounded<T>(items: AsyncIterable<T>, limit: number, work: (item: T) => Promise<void>): Promise<void> {
  const running = new Set<Promise<void>>();
  for await (const item of items) {
    const task: Promise<void> = work(item).finally(() => running.delete(task));
    running.add(task);
    if (running.size >= limit) await Promise.race(running);
  }
  await Promise.all(running);
}

function progress(verb: string, tally: Tally): void {
  const seen = tally.done + tally.alreadyThere + tally.failures.length;
  if (seen % PROGRESS_EVERY === 0) console.log(`image-archive: ${verb} ${seen} images so far`);
}

/** Copies every image `from` lists into `to`, checked against its hash; images `to` already has are counted, not copied. */
async function copyImages(from: ImageStore, to: ImageStore, verb: string): Promise<Tally> {
  const tally = newTally();
  const hashes = from.list((name) => tally.skippedNames.push(name));
  await forEachBounded(hashes, IN_FLIGHT, async (hash) => {
    try {
      if (await to.has(hash)) {
        tally.alreadyThere += 1;
      } else {
        const stored = await to.put(await readChecked(from, hash));
        if (stored !== hash) throw new HashMismatchError(hash);
        tally.done += 1;
      }
    } catch (err) {
      tally.failures.push(failureOf(hash, err));
    }
    progress(verb, tally);
  });
  return tally;
}

async function* manifestHashes(file: string): AsyncGenerator<string> {
  let lineNumber = 0;
  for await (const line of readline.createInterface({ input: createReadStream(file, 'utf8'), crlfDelay: Infinity })) {
    lineNumber += 1;
    const hash = line.trim();
    if (hash === '') continue;
    if (!HASH_PATTERN.test(hash)) throw new ArgumentError(`line ${lineNumber} of ${file} is not an image hash: "${hash.slice(0, 80)}"`);
    yield hash;
  }
}

async function verifyImages(store: ImageStore, hashes: AsyncIterable<string>, tally: Tally): Promise<Tally> {
  await forEachBounded(hashes, IN_FLIGHT, async (hash) => {
    try {
      await readChecked(store, hash);
      tally.done += 1;
    } catch (err) {
      tally.failures.push(failureOf(hash, err));
    }
    progress('verified', tally);
  });
  return tally;
}

async function statOrNull(target: string) {
  return fs.stat(target).catch((err: NodeJS.ErrnoException) => {
    if (err.code === 'ENOENT') return null;
    throw err;
  });
}

async function existingFolder(dir: string): Promise<string> {
  const stat = await statOrNull(dir);
  if (!stat?.isDirectory()) throw new ArgumentError(`${dir} is not a folder`);
  return dir;
}

async function newOrEmptyFolder(dir: string): Promise<string> {
  const stat = await statOrNull(dir);
  if (stat && !stat.isDirectory()) throw new ArgumentError(`${dir} is not a folder`);
  if (stat && (await fs.readdir(dir)).length > 0) throw new ArgumentError(`${dir} is not empty; choose a new folder`);
  return dir;
}

function report(summary: string, tally: Tally): number {
  if (tally.skippedNames.length > 0) {
    const count = tally.skippedNames.length;
    console.error(`image-archive: skipped ${count} ${count === 1 ? 'name' : 'names'} that ${count === 1 ? 'is' : 'are'} not an image hash:`);
    for (const name of tally.skippedNames) console.error(`  ${name}`);
  }
  for (const failure of tally.failures) console.error(`image-archive: ${failure}`);
  console.log(`image-archive: ${summary}${tally.failures.length ? `; ${tally.failures.length} failed` : ''}`);
  return tally.failures.length ? 1 : 0;
}

async function run(command: string | undefined, target: string | undefined): Promise<number> {
  if (!command || !target || !['export', 'import', 'verify'].includes(command)) throw new ArgumentError(`expected export, import or verify and a path`);
  const config = loadConfig();
  const store = openImageStore(config);
  const where = describeStore(config);
  const dir = path.resolve(target);
  if (command === 'export') {
    const tally = await copyImages(store, new LocalImageStore(await newOrEmptyFolder(dir)), 'exported');
    return report(`${tally.done} images of ${where} written to ${dir}`, tally);
  }
  if (command === 'import') {
    const tally = await copyImages(new LocalImageStore(await existingFolder(dir)), store, 'imported');
    return report(`${tally.done} images of ${dir} put into ${where}, ${tally.alreadyThere} were there already`, tally);
  }
  const stat = await statOrNull(dir);
  if (!stat) throw new ArgumentError(`${dir} does not exist`);
  const tally = newTally();
  const hashes = stat.isDirectory() ? new LocalImageStore(dir).list((name) => tally.skippedNames.push(name)) : manifestHashes(dir);
  await verifyImages(store, hashes, tally);
  return report(`${tally.done} images read back from ${where}, each matching its SHA-256`, tally);
}

async function main(argv: string[]): Promise<number> {
  if (argv.includes('--help') || argv.includes('-h')) {
    console.log(USAGE);
    return 0;
  }
  try {
    if (argv.length > 2) throw new ArgumentError(`unexpected argument "${argv[2]}"`);
    return await run(argv[0], argv[1]);
  } catch (err) {
    if (err instanceof ArgumentError) {
      console.error(`image-archive: ${err.message}\n\n${USAGE}`);
      return 2;
    }
    console.error(`image-archive: failed: ${err instanceof Error ? err.message : String(err)}`);
    return 1;
  }
}

// Exits at once: a stand-in S3 server started in this process would hold its idle connections for seconds more.
main(process.argv.slice(2)).then((code) => process.exit(code));
