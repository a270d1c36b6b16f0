// A loopback port for a server a test stops and starts again. It lies below the kernel's ephemeral
// range, so that no outgoing connection or listen(0) of the rest of the suite can take it while the
// server is down (a restart then failed to bind under the full suite's load).
import crypto from 'node:crypto';
import fs from 'node:fs';
import net from 'node:net';

/** The first port the kernel hands out on its own (Linux's default range starts at 32768). */
function ephemeralLow(): number {
  try {
    const low = Number(fs.readFileSync('/proc/sys/net/ipv4/ip_local_port_range', 'utf8').trim().split(/\s+/)[0]);
    return Number.isInteger(low) && low > 1024 ? low : 32768;
  } catch {
    return 32768;
  }
}

function isFree(port: number): Promise<boolean> {
  return new Promise((resolve) => {
    const probe = net.createServer();
    probe.once('error', () => resolve(false));
    probe.listen(port, '127.0.0.1', () => probe.close(() => resolve(true)));
  });
}

/** A free 127.0.0.1 port in [20000, ephemeral low), picked at random so that parallel suites rarely meet. */
export async function restartablePort(): Promise<number> {
  const low = 20000;
  const high = Math.max(low + 100, ephemeralLow());
  for (let attempt = 0; attempt < 50; attempt++) {
    const port = crypto.randomInt(low, high);
    if (await isFree(port)) return port;
  }
  throw new Error(`no free loopback port between ${low} and ${high}`);
}
