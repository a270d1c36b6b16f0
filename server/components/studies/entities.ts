import { Check, Column, Entity, Index, JoinColumn, ManyToOne, PrimaryColumn, PrimaryGeneratedColumn } from 'typeorm';
import { UserEntity } from '../auth/entities';
import { RuleVersionEntity } from '../rules/entities';
import { StationEntity } from '../stations/entities';

/** One part photographed N times at a station and judged each time by one rule version. Append-only (trigger). */
@Entity('repeatability_studies')
@Index('IDX_repeatability_studies_created', ['createdAt', 'id'])
@Check('CHK_repeatability_studies_known_label', `known_label IN ('good','defective','unknown')`)
export class RepeatabilityStudyEntity {
  @PrimaryGeneratedColumn('uuid')
  id: string;

  @Column({ name: 'rule_version_id', type: 'uuid' })
  ruleVersionId: string;

  @ManyToOne(() => RuleVersionEntity, { onDelete: 'RESTRICT' })
  @JoinColumn({ name: 'rule_version_id' })
  ruleVersion?: RuleVersionEntity;

  @Column({ name: 'station_id', type: 'uuid' })
  stationId: string;

  @ManyToOne(() => StationEntity, { onDelete: 'RESTRICT' })
  @JoinColumn({ name: 'station_id' })
  station?: StationEntity;

  /** The station's calibration when the photos were judged. */
  @Column({ name: 'mm_per_px', type: 'double precision', nullable: true })
  mmPerPx: number | null;

  @Column({ name: 'part_label', type: 'varchar', length: 120 })
  partLabel: string;

  @Column({ name: 'known_label', type: 'varchar', length: 12 })
  knownLabel: 'good' | 'defective' | 'unknown';

  @Column({ name: 'created_by', type: 'uuid' })
  createdBy: string;

  @ManyToOne(() => UserEntity, { onDelete: 'RESTRICT' })
  @JoinColumn({ name: 'created_by' })
  creator?: UserEntity;

  @Column({ name: 'created_at', type: 'timestamptz', default: () => 'now()' })
  createdAt: Date;
}

/** One photo of a repeatability study and what the rule made of it. Append-only (trigger). */
@Entity('repeatability_photos')
@Check('CHK_repeatability_photos_verdict', `verdict IN ('PASS','FAIL','RETAKE')`)
export class RepeatabilityPhotoEntity {
  @PrimaryColumn({ name: 'study_id', type: 'uuid' })
  studyId: string;

  @ManyToOne(() => RepeatabilityStudyEntity, { onDelete: 'RESTRICT' })
  @JoinColumn({ name: 'study_id' })
  study?: RepeatabilityStudyEntity;

  /** 1-based, in the order the photos were sent. */
  @PrimaryColumn({ type: 'smallint' })
  position: number;

  @Column({ name: 'image_hash', type: 'char', length: 64 })
  imageHash: string;

  @Column({ type: 'varchar', length: 8 })
  verdict: 'PASS' | 'FAIL' | 'RETAKE';

  @Column({ type: 'varchar', length: 120, nullable: true })
  cause: string | null;

  /** Each gauge's name, value, unit, limits and pass, in the rule's order. */
  @Column({ type: 'jsonb' })
  measurements: unknown[];

  @Column({ type: 'jsonb' })
  quality: Record<string, unknown>;
}
