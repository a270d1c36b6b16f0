import { Check, Column, Entity, Index, JoinColumn, ManyToOne, PrimaryColumn, PrimaryGeneratedColumn } from 'typeorm';
import { UserEntity } from '../auth/entities';
import { RuleVersionEntity } from '../rules/entities';
import { StationEntity } from '../stations/entities';

export const VERDICTS = ['PASS', 'FAIL', 'RETAKE'] as const;
export type Verdict = (typeof VERDICTS)[number];

/**
 * One part judged at a station by a released rule version. Append-only (trigger). The table is
 * partitioned by month of created_at (migration PartitionInspectionsByMonth, partitions.ts): the
 * key is (id, created_at), and an idempotency key is unique through the inspection_keys table.
 */
@Entity('inspections')
@Index('IDX_inspections_created_at', ['createdAt'])
@Index('IDX_inspections_idempotency_key', ['idempotencyKey'])
@Index('IDX_inspections_station_created', ['stationId', 'createdAt'])
@Index('IDX_inspections_version_created', ['ruleVersionId', 'createdAt'])
// Keyset pages of the records filtered by a value that may be rare (tests/bench/records.ts measured them).
@Index('IDX_inspections_rule_created', ['ruleId', 'createdAt'])
@Index('IDX_inspections_operator_created', ['operatorId', 'createdAt'])
@Index('IDX_inspections_verdict_created', ['verdict', 'createdAt'])
@Index('IDX_inspections_cause_created', ['cause', 'createdAt'], { where: 'cause IS NOT NULL' })
@Check('CHK_inspections_verdict', `verdict IN ('PASS','FAIL','RETAKE')`)
export class InspectionEntity {
  @PrimaryGeneratedColumn('uuid')
  id: string;

  /** Sent by the client so that a retried upload is stored once (unique through inspection_keys, kept by a trigger). */
  @Column({ name: 'idempotency_key', type: 'varchar', length: 80 })
  idempotencyKey: string;

  @Column({ name: 'rule_version_id', type: 'uuid' })
  ruleVersionId: string;

  @ManyToOne(() => RuleVersionEntity, { onDelete: 'RESTRICT' })
  @JoinColumn({ name: 'rule_version_id' })
  ruleVersion?: RuleVersionEntity;

  @Column({ name: 'rule_id', type: 'uuid' })
  ruleId: string;

  @Column({ name: 'station_id', type: 'uuid' })
  stationId: string;

  @ManyToOne(() => StationEntity, { onDelete: 'RESTRICT' })
  @JoinColumn({ name: 'station_id' })
  station?: StationEntity;

  @Column({ name: 'line_id', type: 'uuid' })
  lineId: string;

  @Column({ name: 'part_type', type: 'varchar', length: 40 })
  partType: string;

  @Column({ name: 'operator_id', type: 'uuid' })
  operatorId: string;

  @ManyToOne(() => UserEntity, { onDelete: 'RESTRICT' })
  @JoinColumn({ name: 'operator_id' })
  operator?: UserEntity;

  @Column({ name: 'image_hash', type: 'char', length: 64 })
  imageHash: string;

  @Column({ name: 'evidence_hash', type: 'char', length: 64, nullable: true })
  evidenceHash: string | null;

  @Column({ type: 'varchar', length: 8 })
  verdict: Verdict;

  /** The gauge that failed first, or the quality figure that asked for a retake. */
  @Column({ type: 'varchar', length: 120, nullable: true })
  cause: string | null;

  @Column({ type: 'jsonb' })
  quality: Record<string, unknown>;

  @Column({ name: 'mm_per_px', type: 'double precision', nullable: true })
  mmPerPx: number | null;

  @Column({ name: 'duration_ms', type: 'double precision' })
  durationMs: number;

  /** Part of the key: the partition key, so every unique constraint must include it. */
  @PrimaryColumn({ name: 'created_at', type: 'timestamptz', default: () => 'now()' })
  createdAt: Date;
}

/** The inspection an inspection's measurement or dispute belongs to, through the partitioned table's key. */
const INSPECTION_KEY = [
  { name: 'inspection_id', referencedColumnName: 'id' },
  { name: 'inspection_created_at', referencedColumnName: 'createdAt' },
];

/** One gauge's value in an inspection, with the limits that applied. Append-only (trigger). */
@Entity('measurements')
export class MeasurementEntity {
  @PrimaryColumn({ name: 'inspection_id', type: 'uuid' })
  inspectionId: string;

  /** The inspection's created_at, for the foreign key into the partitioned inspections. */
  @Column({ name: 'inspection_created_at', type: 'timestamptz' })
  inspectionCreatedAt: Date;

  @ManyToOne(() => InspectionEntity, { onDelete: 'RESTRICT' })
  @JoinColumn(INSPECTION_KEY)
  inspection?: InspectionEntity;

  @PrimaryColumn({ type: 'smallint' })
  position: number;

  @Column({ type: 'varchar', length: 120 })
  gauge: string;

  @Column({ type: 'double precision' })
  value: number;

  @Column({ type: 'varchar', length: 8, default: '' })
  unit: string;

  @Column({ name: 'limit_min', type: 'double precision', nullable: true })
  limitMin: number | null;

  @Column({ name: 'limit_max', type: 'double precision', nullable: true })
  limitMax: number | null;

  @Column({ type: 'boolean' })
  pass: boolean;
}

/** An operator's challenge of a verdict, resolved by a qualified person. */
@Entity('disputes')
@Index('IDX_disputes_open', ['resolvedAt'])
export class DisputeEntity {
  @PrimaryGeneratedColumn('uuid')
  id: string;

  @Column({ name: 'inspection_id', type: 'uuid', unique: true })
  inspectionId: string;

  /** The inspection's created_at, for the foreign key into the partitioned inspections. */
  @Column({ name: 'inspection_created_at', type: 'timestamptz' })
  inspectionCreatedAt: Date;

  @ManyToOne(() => InspectionEntity, { onDelete: 'RESTRICT' })
  @JoinColumn(INSPECTION_KEY)
  inspection?: InspectionEntity;

  @Column({ name: 'raised_by', type: 'uuid' })
  raisedBy: string;

  @Column({ type: 'varchar', length: 2000 })
  note: string;

  @Column({ name: 'raised_at', type: 'timestamptz', default: () => 'now()' })
  raisedAt: Date;

  @Column({ name: 'resolved_by', type: 'uuid', nullable: true })
  resolvedBy: string | null;

  /** The qualified person's judgement of the part: good or defective. */
  @Column({ type: 'varchar', length: 12, nullable: true })
  judgement: 'good' | 'defective' | null;

  @Column({ name: 'resolution_note', type: 'varchar', length: 2000, nullable: true })
  resolutionNote: string | null;

  @Column({ name: 'resolved_at', type: 'timestamptz', nullable: true })
  resolvedAt: Date | null;
}
