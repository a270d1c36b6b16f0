// Child-process entry: calls an exported async function of a module and prints its JSON result.
// Usage: node -r ts-node/register/transpile-only tests/support/node-runner.ts <module> <export> '<json args>'
import path from 'node:path';

const [modulePath, exportName, json] = process.argv.slice(2);
// eslint-disable-next-line @typescript-eslint/no-require-imports
const fn = require(path.resolve(modulePath))[exportName] as (...args: unknown[]) => unknown;
Promise.resolve(fn(...(JSON.parse(json ?? '[]') as unknown[])))
  .then((result) => process.stdout.write(`\n${MARKER}${JSON.stringify(result)}\n`))
  .catch((err) => {
    process.stderr.write(String(err?.stack ?? err));
    process.exit(1);
  });

const MARKER = '@@kernwright-result@@';
