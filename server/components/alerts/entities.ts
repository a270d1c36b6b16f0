import { Check, Column, Entity, Index, JoinColumn, ManyToOne, PrimaryColumn, PrimaryGeneratedColumn } from 'typeorm';
import { UserEntity } from '../auth/entities';
import { RuleEntity } from '../rules/entities';
import { StationEntity } from '../stations/entities';

export type AlertKind = 'run-rule' | 'limit';

/**
 * A run rule that fired, or a limit that was passed, for a rule at a station on one day. The unique key
 * makes each signal one row however often (or however concurrently) the check runs; the row is kept for
 * good: a trigger allows only its acknowledgement to be filled in, once.
 */
@Entity('alerts')
@Index('UQ_alerts_signal', ['ruleId', 'stationId', 'signal', 'periodStart'], { unique: true })
@Index('IDX_alerts_created', ['createdAt', 'id'])
@Check('CHK_alerts_kind', `kind IN ('run-rule','limit')`)
@Check('CHK_alerts_acknowledgement', `(acknowledged_at IS NULL) = (acknowledged_by IS NULL) AND (acknowledged_at IS NULL) = (acknowledgement_note IS NULL)`)
export class AlertEntity {
  @PrimaryGeneratedColumn('uuid')
  id: string;

  @Column({ type: 'varchar', length: 12 })
  kind: AlertKind;

  @Column({ name: 'rule_id', type: 'uuid' })
  ruleId: string;

  @ManyToOne(() => RuleEntity, { onDelete: 'RESTRICT' })
  @JoinColumn({ name: 'rule_id' })
  rule?: RuleEntity;

  @Column({ name: 'station_id', type: 'uuid' })
  stationId: string;

  @ManyToOne(() => StationEntity, { onDelete: 'RESTRICT' })
  @JoinColumn({ name: 'station_id' })
  station?: StationEntity;

  /** "WE1" … "WE4" for a run rule, "limit" for a supervisor's limit. */
  @Column({ type: 'varchar', length: 8 })
  signal: string;

  @Column({ name: 'period_start', type: 'timestamptz' })
  periodStart: Date;

  @Column({ name: 'period_end', type: 'timestamptz' })
  periodEnd: Date;

  @Column({ type: 'varchar', length: 500 })
  description: string;

  @Column({ name: 'created_at', type: 'timestamptz', default: () => 'now()' })
  createdAt: Date;

  @Column({ name: 'acknowledged_at', type: 'timestamptz', nullable: true })
  acknowledgedAt: Date | null;

  @Column({ name: 'acknowledged_by', type: 'uuid', nullable: true })
  acknowledgedBy: string | null;

  @ManyToOne(() => UserEntity, { onDelete: 'RESTRICT' })
  @JoinColumn({ name: 'acknowledged_by' })
  acknowledger?: UserEntity;

  @Column({ name: 'acknowledgement_note', type: 'varchar', length: 2000, nullable: true })
  acknowledgementNote: string | null;
}

/** A supervisor's limit on a rule's daily defect fraction, at one station or (station null) at every station. */
@Entity('alert_limits')
@Index('IDX_alert_limits_rule', ['ruleId'])
@Check('CHK_alert_limits_fraction', `max_defect_fraction > 0 AND max_defect_fraction <= 1`)
export class AlertLimitEntity {
  @PrimaryGeneratedColumn('uuid')
  id: string;

  @Column({ name: 'rule_id', type: 'uuid' })
  ruleId: string;

  @ManyToOne(() => RuleEntity, { onDelete: 'RESTRICT' })
  @JoinColumn({ name: 'rule_id' })
  rule?: RuleEntity;

  @Column({ name: 'station_id', type: 'uuid', nullable: true })
  stationId: string | null;

  @ManyToOne(() => StationEntity, { onDelete: 'RESTRICT' })
  @JoinColumn({ name: 'station_id' })
  station?: StationEntity;

  @Column({ name: 'max_defect_fraction', type: 'double precision' })
  maxDefectFraction: number;

  @Column({ name: 'created_by', type: 'uuid' })
  createdBy: string;

  @ManyToOne(() => UserEntity, { onDelete: 'RESTRICT' })
  @JoinColumn({ name: 'created_by' })
  creator?: UserEntity;

  @Column({ name: 'created_at', type: 'timestamptz', default: () => 'now()' })
  createdAt: Date;
}

/** Whether a supervisor receives alert e-mails; a supervisor without a row is subscribed. */
@Entity('alert_subscriptions')
export class AlertSubscriptionEntity {
  @PrimaryColumn({ name: 'user_id', type: 'uuid' })
  userId: string;

  @ManyToOne(() => UserEntity, { onDelete: 'RESTRICT' })
  @JoinColumn({ name: 'user_id' })
  user?: UserEntity;

  @Column({ type: 'boolean' })
  subscribed: boolean;

  @Column({ name: 'updated_at', type: 'timestamptz', default: () => 'now()' })
  updatedAt: Date;
}
