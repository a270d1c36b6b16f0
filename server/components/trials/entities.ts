import { Check, Column, CreateDateColumn, Entity, Index, JoinColumn, ManyToOne, PrimaryColumn, PrimaryGeneratedColumn } from 'typeorm';
import { ReferenceImageEntity, ReferenceSetEntity } from '../references/entities';
import { RuleVersionEntity } from '../rules/entities';

export const TRIAL_STATES = ['queued', 'running', 'done', 'failed'] as const;
export type TrialState = (typeof TRIAL_STATES)[number];

/** A rule version run over a reference set, image by image, compared with the labels. */
@Entity('trials')
@Index('IDX_trials_version', ['ruleVersionId', 'createdAt'])
@Check('CHK_trials_state', `state IN ('queued','running','done','failed')`)
export class TrialEntity {
  @PrimaryGeneratedColumn('uuid')
  id: string;

  @Column({ name: 'rule_version_id', type: 'uuid' })
  ruleVersionId: string;

  @ManyToOne(() => RuleVersionEntity, { onDelete: 'RESTRICT' })
  @JoinColumn({ name: 'rule_version_id' })
  ruleVersion?: RuleVersionEntity;

  @Column({ name: 'reference_set_id', type: 'uuid' })
  referenceSetId: string;

  @ManyToOne(() => ReferenceSetEntity, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'reference_set_id' })
  referenceSet?: ReferenceSetEntity;

  /** Hash of the rule document the trial ran, so a later edit makes the trial stale. */
  @Column({ name: 'content_hash', type: 'char', length: 64 })
  contentHash: string;

  /** Station whose calibration converts px to mm during the trial (optional). */
  @Column({ name: 'mm_per_px', type: 'double precision', nullable: true })
  mmPerPx: number | null;

  @Column({ type: 'varchar', length: 12, default: 'queued' })
  state: TrialState;

  @Column({ type: 'integer', default: 0 })
  total: number;

  @Column({ type: 'integer', default: 0 })
  processed: number;

  /** How many times a worker took the trial up; one that stops again and again is failed (MAX_TRIAL_ATTEMPTS). */
  @Column({ type: 'integer', default: 0 })
  attempts: number;

  /** Confusion matrix, rates with intervals, kappa: filled when the trial is done. */
  @Column({ type: 'jsonb', nullable: true })
  summary: Record<string, unknown> | null;

  @Column({ type: 'varchar', length: 2000, nullable: true })
  error: string | null;

  @Column({ name: 'started_by', type: 'uuid' })
  startedBy: string;

  @CreateDateColumn({ name: 'created_at', type: 'timestamptz' })
  createdAt: Date;

  @Column({ name: 'finished_at', type: 'timestamptz', nullable: true })
  finishedAt: Date | null;
}

/** One image's outcome in a trial. The primary key makes every image count once, even after a retry. */
@Entity('trial_results')
export class TrialResultEntity {
  @PrimaryColumn({ name: 'trial_id', type: 'uuid' })
  trialId: string;

  @ManyToOne(() => TrialEntity, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'trial_id' })
  trial?: TrialEntity;

  @PrimaryColumn({ name: 'image_id', type: 'uuid' })
  imageId: string;

  @ManyToOne(() => ReferenceImageEntity, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'image_id' })
  image?: ReferenceImageEntity;

  @Column({ type: 'varchar', length: 8 })
  verdict: 'PASS' | 'FAIL' | 'RETAKE';

  /** The image's label when the trial ran. */
  @Column({ type: 'varchar', length: 12 })
  label: string;

  /** Whether the verdict agrees with the label (null for unlabelled images). */
  @Column({ type: 'boolean', nullable: true })
  agrees: boolean | null;

  @Column({ type: 'jsonb' })
  measurements: unknown[];

  @Column({ type: 'jsonb' })
  quality: Record<string, unknown>;

  @Column({ name: 'duration_ms', type: 'double precision' })
  durationMs: number;
}
