import { Column, Entity, PrimaryColumn } from 'typeorm';

/** The plant's part types (e.g. a washer size); rules and reference images name one. */
@Entity('part_types')
export class PartTypeEntity {
  @PrimaryColumn({ type: 'varchar', length: 40 })
  code: string;

  @Column({ type: 'varchar', length: 80 })
  name: string;

  /** Family of parts, e.g. washer, bracket, gasket. */
  @Column({ type: 'varchar', length: 40 })
  family: string;
}

/** The plant-editable list of defect kinds used in labels and Pareto charts. */
@Entity('defect_kinds')
export class DefectKindEntity {
  @PrimaryColumn({ type: 'varchar', length: 40 })
  code: string;

  @Column({ type: 'varchar', length: 80 })
  name: string;
}
