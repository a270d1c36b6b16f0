import { Column, Entity, JoinColumn, ManyToOne, PrimaryColumn } from 'typeorm';
import { LineEntity, StationEntity } from '../stations/entities';
import { RuleEntity } from '../rules/entities';

/** The key both hourly count tables share: the hour (UTC), rule, station, line and part type. */
abstract class HourKey {
  @PrimaryColumn({ type: 'timestamptz' })
  hour: Date;

  @PrimaryColumn({ name: 'rule_id', type: 'uuid' })
  ruleId: string;

  @ManyToOne(() => RuleEntity, { onDelete: 'RESTRICT' })
  @JoinColumn({ name: 'rule_id' })
  rule?: RuleEntity;

  @PrimaryColumn({ name: 'station_id', type: 'uuid' })
  stationId: string;

  @ManyToOne(() => StationEntity, { onDelete: 'RESTRICT' })
  @JoinColumn({ name: 'station_id' })
  station?: StationEntity;

  @PrimaryColumn({ name: 'line_id', type: 'uuid' })
  lineId: string;

  @ManyToOne(() => LineEntity, { onDelete: 'RESTRICT' })
  @JoinColumn({ name: 'line_id' })
  line?: LineEntity;

  @PrimaryColumn({ name: 'part_type', type: 'varchar', length: 40 })
  partType: string;
}

/**
 * Inspections counted per hour (UTC) by rule, station, line and part type. A statement trigger on
 * inspections keeps the counts in the transaction that stores the inspections, so trend charts add up
 * thousands of rows instead of millions; shifts start on whole hours, so days and shifts are sums of hours.
 */
@Entity('inspection_hours')
export class InspectionHourEntity extends HourKey {
  /** PASS + FAIL: parts judged. */
  @Column({ type: 'integer' })
  judged: number;

  @Column({ type: 'integer' })
  failed: number;

  @Column({ type: 'integer' })
  retakes: number;
}

/** Failed inspections counted per hour (UTC) by cause (the first failing gauge), for the Pareto chart. */
@Entity('inspection_failure_hours')
export class InspectionFailureHourEntity extends HourKey {
  /** The failing gauge as stored on the inspection ('' when none was stored). */
  @PrimaryColumn({ type: 'varchar', length: 120 })
  cause: string;

  @Column({ type: 'integer' })
  failures: number;
}
