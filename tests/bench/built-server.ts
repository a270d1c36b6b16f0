// The server compiled as `npm start` compiles it, for the benchmarks that run the real server or its
// worker pool. From the TypeScript sources (ts-node in the server and in every pool worker) their
// heaps would hold the compiler, and each collection would cost more than in production.
import { spawnSync } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';

const ROOT = path.join(__dirname, '..', '..');

let built: string | null = process.env.KW_BENCH_BUILT_SERVER ?? null;

/**
 * The folder of the compiled server: dist-bench/ (git-ignored), beside dist-server/ so that it finds
 * node_modules, the kernels and package.json the same way. Compiled once per process;
 * KW_BENCH_BUILT_SERVER hands the folder to a benchmark's child processes.
 */
export function builtServerDir(): string {
  if (built) return built;
  const outDir = path.join(ROOT, 'dist-bench');
  fs.rmSync(outDir, { recursive: true, force: true });
  // Type errors elsewhere in the repository do not stop tsc from writing the files.
  spawnSync('npx', ['tsc', '-p', 'server/tsconfig.build.json', '--outDir', outDir], { cwd: ROOT, stdio: 'ignore' });
  if (!fs.existsSync(path.join(outDir, 'server', 'main.js'))) throw new Error(`compiling the server into ${outDir} gave no server/main.js`);
  built = outDir;
  return outDir;
}
