import { execFile } from 'node:child_process';
import path from 'node:path';

const ROOT = path.join(__dirname, '..', '..');
const MARKER = '@@kernwright-result@@';

/**
 * Runs a heavy computation (rendering and judging hundreds of photos) in a plain Node process:
 * inside Jest's module sandbox the same typed-array code runs several times slower.
 */
export function runInNode<T>(modulePath: string, exportName: string, args: unknown[] = []): Promise<T> {
  return new Promise((resolve, reject) => {
    execFile(
      process.execPath,
      ['-r', 'ts-node/register/transpile-only', path.join(__dirname, 'node-runner.ts'), path.join(ROOT, modulePath), exportName, JSON.stringify(args)],
      { cwd: ROOT, env: { ...process.env, TS_NODE_PROJECT: path.join(ROOT, 'server', 'tsconfig.json') }, maxBuffer: 64 * 1024 * 1024 },
      (err, stdout, stderr) => {
        if (err) return reject(new Error(`${modulePath}#${exportName} failed: ${stderr || err.message}`));
        const line = stdout.split('\n').find((l) => l.startsWith(MARKER));
        if (!line) return reject(new Error(`${modulePath}#${exportName} printed no result`));
        resolve(JSON.parse(line.slice(MARKER.length)) as T);
      },
    );
  });
}
