import type { Writable } from 'node:stream';
import { pipeline } from 'node:stream/promises';
import { stringify } from 'csv-stringify';
import QueryStream from 'pg-query-stream';
import type { DataSource, EntityManager } from 'typeorm';
import { AuditEventEntity } from './entities';
import { chainHash, digestOf, GENESIS_HASH, type ChainedContent } from './chain';

export interface AuditActor {
  id: string | null;
  name: string;
}

export interface AuditInput {
  actor: AuditActor;
  action: string;
  entityType: string;
  entityId?: string | null;
  before?: unknown;
  after?: unknown;
  details?: Record<string, unknown>;
}

export interface ChainVerification {
  ok: boolean;
  checked: number;
  firstBroken: { seq: string; reason: string } | null;
}

// Serialises writers so that each event sees the hash of the one before it.
const CHAIN_LOCK_KEY = 4_242_001;
const VERIFY_BATCH = 2000;

function contentOf(event: AuditEventEntity): ChainedContent {
  return {
    seq: String(event.seq),
    occurredAt: event.occurredAt.toISOString(),
    actorId: event.actorId,
    actorName: event.actorName,
    action: event.action,
    entityType: event.entityType,
    entityId: event.entityId,
    beforeDigest: event.beforeDigest,
    afterDigest: event.afterDigest,
    details: event.details,
  };
}

export class AuditService {
  constructor(private readonly dataSource: DataSource) {}

  /** Appends an event inside the caller's transaction, so the change and its record stand or fall together. */
  async record(manager: EntityManager, input: AuditInput): Promise<AuditEventEntity> {
    if (!manager.queryRunner?.isTransactionActive) throw new Error('audit events are written inside the transaction of the change');
    await manager.query('select pg_advisory_xact_lock($1)', [CHAIN_LOCK_KEY]);
    const [{ seq }] = await manager.query(`select nextval('audit_events_seq') as seq`);
    const last = await manager.getRepository(AuditEventEntity).find({ order: { seq: 'DESC' }, take: 1 });
    const prevHash = last[0]?.hash ?? GENESIS_HASH;
    const event = manager.getRepository(AuditEventEntity).create({
      seq: String(seq),
      occurredAt: new Date(),
      actorId: input.actor.id,
      actorName: input.actor.name,
      action: input.action,
      entityType: input.entityType,
      entityId: input.entityId ?? null,
      beforeDigest: input.before === undefined ? null : digestOf(input.before),
      afterDigest: input.after === undefined ? null : digestOf(input.after),
      details: input.details ?? {},
      prevHash,
    });
    event.hash = chainHash(prevHash, contentOf(event));
    return manager.getRepository(AuditEventEntity).save(event);
  }

  /** Records an event in a transaction of its own (for events that change no other record, such as a failed sign-in). */
  recordAlone(input: AuditInput): Promise<AuditEventEntity> {
    return this.dataSource.transaction((manager) => this.record(manager, input));
  }

  /** The whole trail as CSV (RFC 4180, ISO 8601 UTC), streamed from a cursor; the export is itself an event. */
  async exportCsv(actor: { id: string; username: string }, out: Writable): Promise<void> {
    await this.recordAlone({ actor: { id: actor.id, name: actor.username }, action: 'export.audit-trail-csv', entityType: 'audit-event' });
    const runner = this.dataSource.createQueryRunner('slave');
    const client = (await runner.connect()) as { query: (q: QueryStream) => NodeJS.ReadableStream };
    try {
      const sql = `select seq, to_char(occurred_at at time zone 'UTC', 'YYYY-MM-DD"T"HH24:MI:SS.MS"Z"') as occurred_at_utc, actor_id, actor_name, action,
        entity_type, entity_id, before_digest, after_digest, details::text as details, prev_hash, hash from audit_events order by seq`;
      const columns = ['seq', 'occurred_at_utc', 'actor_id', 'actor_name', 'action', 'entity_type', 'entity_id', 'before_digest', 'after_digest', 'details', 'prev_hash', 'hash'];
      await pipeline(client.query(new QueryStream(sql, [], { batchSize: 2000 })), stringify({ header: true, columns, record_delimiter: 'windows' }), out);
    } finally {
      await runner.release();
    }
  }

  /** Recomputes the whole chain and names the first event whose link or content does not match. */
  async verifyChain(): Promise<ChainVerification> {
    const repo = this.dataSource.getRepository(AuditEventEntity);
    let prevHash = GENESIS_HASH;
    let checked = 0;
    let after = '0';
    for (;;) {
      const batch = await repo
        .createQueryBuilder('e')
        .where('e.seq > :after', { after })
        .orderBy('e.seq', 'ASC')
        .take(VERIFY_BATCH)
        .getMany();
      if (batch.length === 0) return { ok: true, checked, firstBroken: null };
      for (const event of batch) {
        if (event.prevHash !== prevHash)
          return { ok: false, checked, firstBroken: { seq: String(event.seq), reason: 'its link to the previous event does not match (an event before it was removed or altered)' } };
        if (chainHash(prevHash, contentOf(event)) !== event.hash)
          return { ok: false, checked, firstBroken: { seq: String(event.seq), reason: 'its content does not match its hash (the event was altered)' } };
        prevHash = event.hash;
        checked += 1;
      }
      after = String(batch[batch.length - 1].seq);
    }
  }
}
