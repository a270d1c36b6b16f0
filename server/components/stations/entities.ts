import { Column, CreateDateColumn, Entity, Index, JoinColumn, ManyToOne, PrimaryGeneratedColumn } from 'typeorm';

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

  @Column({ name: 'calibrated_at', type: 'timestamptz', nullable: true })
  calibratedAt: Date | null;

  @Column({ name: 'calibrated_by', type: 'uuid', nullable: true })
  calibratedBy: string | null;

  @Column({ type: 'boolean', default: true })
  active: boolean;

  @CreateDateColumn({ name: 'created_at', type: 'timestamptz' })
  createdAt: Date;
}
