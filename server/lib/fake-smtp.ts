import fs from 'node:fs';
import path from 'node:path';
import { SMTPServer } from 'smtp-server';

export interface ReceivedMail {
  from: string;
  to: string[];
  raw: string;
}

/**
 * A stand-in mail server on loopback for the demo and the tests: it accepts every message and keeps
 * it (in memory, and as .eml files when a folder is given) so people can read what Kernwright sent.
 */
export async function startFakeSmtp(options: { port: number; dir?: string }): Promise<{ port: number; received: ReceivedMail[]; close(): Promise<void> }> {
  const received: ReceivedMail[] = [];
  if (options.dir) fs.mkdirSync(options.dir, { recursive: true });
  const server = new SMTPServer({
    authOptional: true,
    disabledCommands: ['STARTTLS', 'AUTH'],
    logger: false,
    onData(stream, session, callback) {
      const chunks: Buffer[] = [];
      stream.on('data', (c: Buffer) => chunks.push(c));
      stream.on('end', () => {
        const raw = Buffer.concat(chunks).toString('utf8');
        const mail = { from: session.envelope.mailFrom ? session.envelope.mailFrom.address : '', to: session.envelope.rcptTo.map((r) => r.address), raw };
        received.push(mail);
        if (options.dir) fs.writeFileSync(path.join(options.dir, `${new Date().toISOString().replace(/[:.]/g, '-')}-${received.length}.eml`), raw);
        callback();
      });
    },
  });
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(options.port, '127.0.0.1', () => resolve());
  });
  const address = server.server.address();
  return {
    port: typeof address === 'object' && address ? address.port : options.port,
    received,
    close: () => new Promise<void>((resolve) => server.close(() => resolve())),
  };
}
