import fs from 'node:fs';
import type { Server } from 'node:http';

/** The one account the stand-in knows (s3rver's built-in key pair); a real bucket takes the SDK's usual credentials. */
export const FAKE_S3_CREDENTIALS = { accessKeyId: 'S3RVER', secretAccessKey: 'S3RVER' } as const;

interface S3rverInstance {
  run(): Promise<{ port: number }>;
  close(): Promise<void>;
  httpServer?: Server;
}
type S3rverClass = new (options: Record<string, unknown>) => S3rverInstance;

export interface FakeS3 {
  endpoint: string;
  port: number;
  close(): Promise<void>;
}

/**
 * A stand-in S3 server on loopback for the demo and the tests (s3rver, in this process): it keeps
 * objects as files in `dir` and creates the bucket. Port 0 picks a free port. Unlike S3 it writes
 * objects in place, so it is no model of S3's all-or-nothing PUT.
 */
export async function startFakeS3(options: { port: number; dir: string; bucket: string }): Promise<FakeS3> {
  // Loaded only when wanted: s3rver is a development package, absent where a real bucket is used.
  // eslint-disable-next-line @typescript-eslint/no-require-imports
  const S3rver = require('s3rver') as S3rverClass;
  fs.mkdirSync(options.dir, { recursive: true });
  const server = new S3rver({ address: '127.0.0.1', port: options.port, silent: true, directory: options.dir, configureBuckets: [{ name: options.bucket }] });
  const { port } = await server.run();
  // The server it stands in for lives elsewhere: it never keeps this process alive by itself.
  server.httpServer?.unref();
  return { endpoint: `http://127.0.0.1:${port}`, port, close: () => server.close() };
}

const running = new Map<number, Promise<FakeS3 | null>>();

/**
 * Makes sure a stand-in answers on the port: starts one in this process unless the port is already
 * taken (by this process or by another Kernwright process of the same checkout, e.g. the server
 * while `npm run demo:reset` seeds). Resolves with the server when this process started it.
 */
export function ensureFakeS3(options: { port: number; dir: string; bucket: string }): Promise<FakeS3 | null> {
  let started = running.get(options.port);
  if (!started) {
    started = startFakeS3(options).then(
      (fake) => fake,
      (err: NodeJS.ErrnoException) => {
        if (err.code === 'EADDRINUSE') return null;
        running.delete(options.port);
        throw err;
      },
    );
    running.set(options.port, started);
  }
  return started;
}
