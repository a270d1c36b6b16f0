// The committed WebAssembly module is what its AssemblyScript sources build to: rebuilding with the
// project's own build step (scripts/build-wasm.mjs) gives the same bytes, so they never drift apart.
import { execFile } from 'node:child_process';
import path from 'node:path';

const ROOT = path.join(__dirname, '..', '..', '..');

test('rebuilding shared/vision/wasm/assembly gives the committed module.generated.ts', async () => {
  const outcome = await new Promise<{ code: number; output: string }>((resolve) => {
    execFile(process.execPath, [path.join(ROOT, 'scripts', 'build-wasm.mjs'), '--check'], { cwd: ROOT }, (err, stdout, stderr) =>
      resolve({ code: err ? ((err as { code?: number }).code ?? 1) : 0, output: stdout + stderr }),
    );
  });
  expect(outcome).toEqual({ code: 0, output: 'shared/vision/wasm/module.generated.ts matches its sources\n' });
}, 120_000);
