import PgBoss from 'pg-boss';

export type JobHandler<T> = (data: T) => Promise<void>;

/**
 * Background work through a PostgreSQL-backed queue (pg-boss), so that queued work survives a
 * restart and any number of processes can share it.
 */
export class JobQueue {
  private readonly boss: PgBoss;
  private started = false;

  constructor(connectionString: string) {
    this.boss = new PgBoss({ connectionString, schema: 'pgboss', max: 4, supervise: true, schedule: false });
    this.boss.on('error', (err) => process.stderr.write(`job queue: ${err.message}\n`));
  }

  async start(): Promise<this> {
    await this.boss.start();
    this.started = true;
    return this;
  }

  async send<T extends object>(queue: string, data: T, options: { retryLimit?: number; singletonKey?: string } = {}): Promise<void> {
    await this.boss.createQueue(queue);
    await this.boss.send(queue, data, { retryLimit: options.retryLimit ?? 3, retryDelay: 5, retryBackoff: true, singletonKey: options.singletonKey });
  }

  /** Handles one job at a time per worker; a thrown error makes pg-boss retry the job later. */
  async work<T extends object>(queue: string, handler: JobHandler<T>, options: { workers?: number } = {}): Promise<void> {
    await this.boss.createQueue(queue);
    for (let i = 0; i < (options.workers ?? 1); i++) {
      await this.boss.work<T>(queue, { batchSize: 1, pollingIntervalSeconds: 1 }, async ([job]) => handler(job.data));
    }
  }

  async stop(): Promise<void> {
    if (this.started) await this.boss.stop({ graceful: true, wait: true, timeout: 10_000 });
    this.started = false;
  }
}
