// Small pieces the database benchmarks share: throw-away databases on a PostgreSQL server, command
// line arguments, and elapsed time.
import { Client } from 'pg';

/** Runs one statement on the server's maintenance database (create / drop the throw-away database). */
export async function adminQuery(serverUrl: string, sql: string): Promise<void> {
  const client = new Client({ connectionString: `${serverUrl}/postgres` });
  await client.connect();
  try {
    await client.query(sql);
  } finally {
    await client.end();
  }
}

/** The value after `name` on the command line, if any. */
export function argument(name: string): string | undefined {
  const i = process.argv.indexOf(name);
  return i >= 0 ? process.argv[i + 1] : undefined;
}

export const seconds = (since: number) => (performance.now() - since) / 1000;

/** A pipeline runner for benchmarks that never judge a photo. */
export function noPipelines(bench: string) {
  return { run: () => Promise.reject(new Error(`no pipelines in the ${bench} benchmark`)) };
}
