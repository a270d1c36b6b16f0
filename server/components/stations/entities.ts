import { Check, Column, CreateDateColumn, Entity, Index, JoinColumn, ManyToOne, PrimaryColumn, PrimaryGeneratedColumn } from 'typeorm';
import { PartTypeEntity } from '../catalogue/entities';

@Entity('lines')
export class LineEntity {
  @PrimaryGeneratedColumn('uuid')
  id: string;

  @Column({ type: 'varchar', length: 80, unique: true })
  name: string;

  @CreateDateColumn({ name: 'created_at', type: 'timestamptz' })
  createdAt: Date;
}

/** A place on a line where parts are photographed; gauges in mm use its calibration. */
@Entity('stations')
@Index('UQ_stations_line_name', ['lineId', 'name'], { unique: true })
@Check('CHK_stations_photo_size', `(photo_width_px IS NULL) = (photo_height_px IS NULL) AND (photo_width_px IS NULL OR (photo_width_px > 0 AND photo_height_px > 0))`)
export class StationEntity {
  @PrimaryGeneratedColumn('uuid')
  id: string;

  @Column({ name: 'line_id', type: 'uuid' })
  lineId: string;

  @ManyToOne(() => LineEntity, { onDelete: 'RESTRICT' })
  @JoinColumn({ name: 'line_id' })
  line?: LineEntity;

  @Column({ type: 'varchar', length: 80 })
  name: string;

  @Column({ name: 'camera_note', type: 'varchar', length: 500, default: '' })
  cameraNote: string;

  /** Millimetres per pixel; null until the station is calibrated. */
  @Column({ name: 'mm_per_px', type: 'double precision', nullable: true })
  mmPerPx: number | null;

  /** The photo size the scale holds for; null when the calibration did not record it (inspections then skip the size check). */
  @Column({ name: 'photo_width_px', type: 'integer', nullable: true })
  photoWidthPx: number | null;

  @Column({ name: 'photo_height_px', type: 'integer', nullable: true })
  photoHeightPx: number | null;

  @Column({ name: 'calibrated_at', type: 'timestamptz', nullable: true })
  calibratedAt: Date | null;

  @Column({ name: 'calibrated_by', type: 'uuid', nullable: true })
  calibratedBy: string | null;

  @Column({ type: 'boolean', default: true })
  active: boolean;

  @CreateDateColumn({ name: 'created_at', type: 'timestamptz' })
  createdAt: Date;
}

/** A part type a station inspects: operators there are offered only the released rules for its part types. */
@Entity('station_part_types')
export class StationPartTypeEntity {
  @PrimaryColumn({ name: 'station_id', type: 'uuid' })
  stationId: string;

  @ManyToOne(() => StationEntity, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'station_id' })
  station?: StationEntity;

  @PrimaryColumn({ name: 'part_type', type: 'varchar', length: 40 })
  partType: string;

  // A part type still inspected somewhere cannot leave the catalogue.
  @ManyToOne(() => PartTypeEntity, { onDelete: 'RESTRICT' })
  @JoinColumn({ name: 'part_type' })
  partTypeEntry?: PartTypeEntity;
}
