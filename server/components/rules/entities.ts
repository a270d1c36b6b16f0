import { Check, Column, CreateDateColumn, Entity, Index, JoinColumn, ManyToOne, PrimaryGeneratedColumn, UpdateDateColumn } from 'typeorm';
import type { RuleDocument } from '../../../shared/rules/schema';

export const RULE_VERSION_STATES = ['draft', 'in-review', 'released', 'superseded', 'withdrawn'] as const;
export type RuleVersionState = (typeof RULE_VERSION_STATES)[number];

@Entity('rules')
export class RuleEntity {
  @PrimaryGeneratedColumn('uuid')
  id: string;

  @Column({ type: 'varchar', length: 120, unique: true })
  name: string;

  @Column({ name: 'part_type', type: 'varchar', length: 40 })
  partType: string;

  /** The smallest defect the rule must catch, for the sampling check. */
  @Column({ name: 'smallest_defect_mm', type: 'double precision', nullable: true })
  smallestDefectMm: number | null;

  @Column({ name: 'created_by', type: 'uuid' })
  createdBy: string;

  @CreateDateColumn({ name: 'created_at', type: 'timestamptz' })
  createdAt: Date;
}

/**
 * One version of a rule: the rule document (format kernwright-rule/1) and its life:
 * draft -> in-review -> released -> superseded / withdrawn. Once released, the document and its
 * hash are frozen; the database refuses changes to them (trigger).
 */
@Entity('rule_versions')
@Index('UQ_rule_versions_rule_number', ['ruleId', 'number'], { unique: true })
@Index('IDX_rule_versions_state', ['state'])
@Check('CHK_rule_versions_state', `state IN ('draft','in-review','released','superseded','withdrawn')`)
export class RuleVersionEntity {
  @PrimaryGeneratedColumn('uuid')
  id: string;

  @Column({ name: 'rule_id', type: 'uuid' })
  ruleId: string;

  @ManyToOne(() => RuleEntity, { onDelete: 'RESTRICT' })
  @JoinColumn({ name: 'rule_id' })
  rule?: RuleEntity;

  @Column({ type: 'integer' })
  number: number;

  @Column({ type: 'varchar', length: 20, default: 'draft' })
  state: RuleVersionState;

  @Column({ type: 'jsonb' })
  document: RuleDocument;

  /** SHA-256 of the canonical JSON of the document (RFC 8785). */
  @Column({ name: 'content_hash', type: 'char', length: 64 })
  contentHash: string;

  @Column({ name: 'author_id', type: 'uuid' })
  authorId: string;

  @Column({ name: 'author_note', type: 'varchar', length: 2000, default: '' })
  authorNote: string;

  @Column({ name: 'edited_at', type: 'timestamptz' })
  editedAt: Date;

  @Column({ name: 'submitted_at', type: 'timestamptz', nullable: true })
  submittedAt: Date | null;

  @Column({ name: 'submitted_trial_id', type: 'uuid', nullable: true })
  submittedTrialId: string | null;

  @Column({ name: 'reviewer_id', type: 'uuid', nullable: true })
  reviewerId: string | null;

  @Column({ name: 'reviewed_at', type: 'timestamptz', nullable: true })
  reviewedAt: Date | null;

  @Column({ name: 'review_note', type: 'varchar', length: 2000, nullable: true })
  reviewNote: string | null;

  @Column({ name: 'released_at', type: 'timestamptz', nullable: true })
  releasedAt: Date | null;

  @Column({ name: 'ended_at', type: 'timestamptz', nullable: true })
  endedAt: Date | null;

  @Column({ name: 'withdraw_reason', type: 'varchar', length: 2000, nullable: true })
  withdrawReason: string | null;

  @CreateDateColumn({ name: 'created_at', type: 'timestamptz' })
  createdAt: Date;

  @UpdateDateColumn({ name: 'updated_at', type: 'timestamptz' })
  updatedAt: Date;
}

export const SIGNATURE_MEANINGS = ['authorship', 'review', 'approval', 'responsibility'] as const;
export type SignatureMeaning = (typeof SIGNATURE_MEANINGS)[number];

/**
 * An electronic signature on a rule version: printed name, date and time, meaning (21 CFR 11.50),
 * bound to the version's content hash (11.70 describes the idea). Append-only.
 */
@Entity('signatures')
@Index('IDX_signatures_version', ['ruleVersionId'])
export class SignatureEntity {
  @PrimaryGeneratedColumn('uuid')
  id: string;

  @Column({ name: 'rule_version_id', type: 'uuid' })
  ruleVersionId: string;

  @ManyToOne(() => RuleVersionEntity, { onDelete: 'RESTRICT' })
  @JoinColumn({ name: 'rule_version_id' })
  ruleVersion?: RuleVersionEntity;

  @Column({ name: 'signer_id', type: 'uuid' })
  signerId: string;

  @Column({ name: 'signer_name', type: 'varchar', length: 80 })
  signerName: string;

  @Column({ type: 'varchar', length: 20 })
  meaning: SignatureMeaning;

  @Column({ name: 'signed_at', type: 'timestamptz' })
  signedAt: Date;

  @Column({ name: 'content_hash', type: 'char', length: 64 })
  contentHash: string;

  /** SHA-256 over version id, content hash, signer, time and meaning. */
  @Column({ name: 'signature_hash', type: 'char', length: 64 })
  signatureHash: string;
}
