// A store for express-rate-limit kept in PostgreSQL, so that every API process behind a load
// balancer counts against the same limit (an in-memory count would let N processes allow N times
// as many sign-in guesses).
import type { ClientRateLimitInfo, Options, Store } from 'express-rate-limit';
import type { DataSource } from 'typeorm';

/** Expired windows are swept about once in this many counts. */
const SWEEP_EVERY = 500;

/** Fixed windows: a key's first hit opens a window of windowMs; the count restarts after it. */
export class PostgresRateLimitStore implements Store {
  readonly localKeys = false;
  readonly prefix: string;
  private windowMs = 60_000;
  private counted = 0;

  constructor(
    private readonly dataSource: DataSource,
    prefix: string,
  ) {
    this.prefix = `${prefix}:`;
  }

  init(options: Options): void {
    this.windowMs = options.windowMs;
  }

  async get(key: string): Promise<ClientRateLimitInfo | undefined> {
    const [row] = await this.dataSource.query(`select hits, reset_at from rate_limit_hits where key = $1 and reset_at > now()`, [this.prefix + key]);
    return row ? { totalHits: row.hits, resetTime: new Date(row.reset_at) } : undefined;
  }

  async increment(key: string): Promise<ClientRateLimitInfo> {
    const [row] = await this.dataSource.query(
      `insert into rate_limit_hits as r (key, hits, reset_at) values ($1, 1, now() + $2 * interval '1 millisecond')
       on conflict (key) do update set
         hits = case when r.reset_at <= now() then 1 else r.hits + 1 end,
         reset_at = case when r.reset_at <= now() then excluded.reset_at else r.reset_at end
       returning hits, reset_at`,
      [this.prefix + key, this.windowMs],
    );
    if (++this.counted % SWEEP_EVERY === 0) void this.sweep();
    return { totalHits: row.hits, resetTime: new Date(row.reset_at) };
  }

  async decrement(key: string): Promise<void> {
    await this.dataSource.query(`update rate_limit_hits set hits = greatest(hits - 1, 0) where key = $1 and reset_at > now()`, [this.prefix + key]);
  }

  async resetKey(key: string): Promise<void> {
    await this.dataSource.query(`delete from rate_limit_hits where key = $1`, [this.prefix + key]);
  }

  private async sweep(): Promise<void> {
    await this.dataSource.query(`delete from rate_limit_hits where reset_at < now() - interval '1 minute'`).catch(() => undefined);
  }
}
