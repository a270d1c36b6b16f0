import PgBoss from 'pg-boss';
import pg from 'pg';

/**
 * pg-boss creates a queue's partition table on first use; two processes doing so at once can
 * deadlock, so creation is serialised across processes by this session-level advisory lock.
 */
const CREATE_QUEUE_LOCK = "select pg_advisory_lock(hashtext('kernwright.pgboss.create_queue'))";
/** pg-boss's default archiveCompletedAfterSeconds. */
const PG_BOSS_ARCHIVE_SECONDS = 12 * 60 * 60;
const CREATE_QUEUE_UNLOCK = "select pg_advisory_unlock(hashtext('kernwright.pgboss.create_queue'))";

export type JobHandler<T> = (data: T) => Promise<void>;

/**
 * Background work through a PostgreSQL-backed queue (pg-boss), so that queued work survives a
 * restart and any number of processes can share it.
 */
export class JobQueue {
  private readonly boss: PgBoss;
  private started = false;
  private readonly timers: NodeJS.Timeout[] = [];
  private readonly declared = new Map<string, Promise<void>>();
  private readonly lockPool: pg.Pool;

  constructor(connectionString: string) {
    this.lockPool = new pg.Pool({ connectionString, max: 1, idleTimeoutMillis: 10_000 });
    this.lockPool.on('error', (err) => process.stderr.write(`job queue: ${err.message}\n`));
    this.boss = new PgBoss({ connectionString, schema: 'pgboss', max: 4, supervise: true, schedule: false });
    this.boss.on('error', (err) => process.stderr.write(`job queue: ${err.message}\n`));
  }

  async start(): Promise<this> {
    await this.boss.start();
    this.started = true;
    return this;
  }

  /** Creates the queue if it does not exist yet; each process asks the database once per queue. */
  declare(queue: string): Promise<void> {
    let declaring = this.declared.get(queue);
    if (!declaring) {
      declaring = this.createQueue(queue);
      this.declared.set(queue, declaring);
      declaring.catch(() => this.declared.delete(queue));
    }
    return declaring;
  }

  private async createQueue(queue: string): Promise<void> {
    if (await this.boss.getQueue(queue)) return;
    const client = await this.lockPool.connect();
    try {
      await client.query(CREATE_QUEUE_LOCK);
      try {
        await this.boss.createQueue(queue);
      } finally {
        await client.query(CREATE_QUEUE_UNLOCK);
      }
    } finally {
      client.release();
    }
  }

  async send<T extends object>(queue: string, data: T, options: { retryLimit?: number; singletonKey?: string; singletonSeconds?: number } = {}): Promise<void> {
    await this.declare(queue);
    await this.boss.send(queue, data, {
      retryLimit: options.retryLimit ?? 3,
      retryDelay: 5,
      retryBackoff: true,
      singletonKey: options.singletonKey,
      singletonSeconds: options.singletonSeconds,
    });
  }

  /**
   * Sends an empty job to the queue now and every `minutes` after. Every process may do so: the queue
   * keeps one job per period of `minutes` (pg-boss singletonSeconds), so the work runs once per period.
   */
  async repeat(queue: string, minutes: number): Promise<void> {
    const seconds = minutes * 60;
    // pg-boss refuses a singleton period longer than the time it keeps finished jobs (12 h by
    // default); longer periods run at most twice as often across processes, so their work must be idempotent.
    const singletonSeconds = Math.min(seconds, PG_BOSS_ARCHIVE_SECONDS);
    const sendOne = () => this.send(queue, {}, { singletonKey: queue, singletonSeconds, retryLimit: 2 });
    await sendOne();
    const timer = setInterval(() => {
      sendOne().catch((err: Error) => process.stderr.write(`job queue: could not send ${queue}: ${err.message}\n`));
    }, seconds * 1000);
    timer.unref();
    this.timers.push(timer);
  }

  /** Handles one job at a time per worker; a thrown error makes pg-boss retry the job later. */
  async work<T extends object>(queue: string, handler: JobHandler<T>, options: { workers?: number } = {}): Promise<void> {
    await this.declare(queue);
    for (let i = 0; i < (options.workers ?? 1); i++) {
      await this.boss.work<T>(queue, { batchSize: 1, pollingIntervalSeconds: 1 }, async ([job]) => handler(job.data));
    }
  }

  async stop(): Promise<void> {
    for (const timer of this.timers.splice(0)) clearInterval(timer);
    if (this.started) await this.boss.stop({ graceful: true, wait: true, timeout: 10_000 });
    this.started = false;
    await this.lockPool.end().catch(() => undefined);
  }
}
