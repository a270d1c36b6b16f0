import { Column, Entity, Index, PrimaryColumn } from 'typeorm';

/**
 * One audit event: who did what to which record, when (server clock, UTC), with digests of the
 * record before and after. Each event's hash covers the previous event's hash (a hash chain), and
 * the database refuses UPDATE, DELETE and TRUNCATE on the table.
 */
@Entity('audit_events')
@Index('IDX_audit_events_entity', ['entityType', 'entityId'])
@Index('IDX_audit_events_occurred_at', ['occurredAt'])
export class AuditEventEntity {
  @PrimaryColumn({ type: 'bigint' })
  seq: string;

  @Column({ name: 'occurred_at', type: 'timestamptz' })
  occurredAt: Date;

  @Column({ name: 'actor_id', type: 'uuid', nullable: true })
  actorId: string | null;

  @Column({ name: 'actor_name', type: 'varchar', length: 80 })
  actorName: string;

  @Column({ type: 'varchar', length: 60 })
  action: string;

  @Column({ name: 'entity_type', type: 'varchar', length: 40 })
  entityType: string;

  @Column({ name: 'entity_id', type: 'varchar', length: 80, nullable: true })
  entityId: string | null;

  @Column({ name: 'before_digest', type: 'char', length: 64, nullable: true })
  beforeDigest: string | null;

  @Column({ name: 'after_digest', type: 'char', length: 64, nullable: true })
  afterDigest: string | null;

  /** What changed, in words a reviewer can read (field names, old and new values; never secrets). */
  @Column({ type: 'jsonb' })
  details: Record<string, unknown>;

  @Column({ name: 'prev_hash', type: 'char', length: 64 })
  prevHash: string;

  @Column({ type: 'char', length: 64 })
  hash: string;
}
