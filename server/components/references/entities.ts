import { Check, Column, CreateDateColumn, Entity, Index, JoinColumn, ManyToOne, PrimaryGeneratedColumn, UpdateDateColumn } from 'typeorm';

export const IMAGE_LABELS = ['unlabelled', 'good', 'defective', 'retake'] as const;
export type ImageLabel = (typeof IMAGE_LABELS)[number];

/** A named collection of labelled photos that rules are tried on. */
@Entity('reference_sets')
export class ReferenceSetEntity {
  @PrimaryGeneratedColumn('uuid')
  id: string;

  @Column({ type: 'varchar', length: 120, unique: true })
  name: string;

  @Column({ name: 'part_type', type: 'varchar', length: 40 })
  partType: string;

  @Column({ type: 'varchar', length: 2000, default: '' })
  description: string;

  @Column({ name: 'created_by', type: 'uuid' })
  createdBy: string;

  @CreateDateColumn({ name: 'created_at', type: 'timestamptz' })
  createdAt: Date;
}

/** One labelled photo of a reference set; the image itself lives in the image store under its SHA-256. */
@Entity('reference_images')
@Index('UQ_reference_images_set_hash', ['setId', 'contentHash'], { unique: true })
@Index('IDX_reference_images_set_label', ['setId', 'label'])
@Check('CHK_reference_images_label', `label IN ('unlabelled','good','defective','retake')`)
@Check('CHK_reference_images_defect_kind', `(label = 'defective') OR defect_kind IS NULL`)
export class ReferenceImageEntity {
  @PrimaryGeneratedColumn('uuid')
  id: string;

  @Column({ name: 'set_id', type: 'uuid' })
  setId: string;

  @ManyToOne(() => ReferenceSetEntity, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'set_id' })
  set?: ReferenceSetEntity;

  @Column({ name: 'content_hash', type: 'char', length: 64 })
  contentHash: string;

  @Column({ name: 'thumbnail_hash', type: 'char', length: 64, nullable: true })
  thumbnailHash: string | null;

  @Column({ name: 'file_name', type: 'varchar', length: 255 })
  fileName: string;

  @Column({ name: 'media_type', type: 'varchar', length: 40 })
  mediaType: string;

  @Column({ type: 'integer' })
  width: number;

  @Column({ type: 'integer' })
  height: number;

  @Column({ name: 'bit_depth', type: 'smallint' })
  bitDepth: number;

  @Column({ type: 'varchar', length: 12, default: 'unlabelled' })
  label: ImageLabel;

  @Column({ name: 'defect_kind', type: 'varchar', length: 40, nullable: true })
  defectKind: string | null;

  @Column({ name: 'part_type', type: 'varchar', length: 40 })
  partType: string;

  @Column({ type: 'varchar', length: 2000, default: '' })
  note: string;

  @Column({ name: 'uploaded_by', type: 'uuid' })
  uploadedBy: string;

  @CreateDateColumn({ name: 'created_at', type: 'timestamptz' })
  createdAt: Date;

  @UpdateDateColumn({ name: 'updated_at', type: 'timestamptz' })
  updatedAt: Date;
}
