import { Column, CreateDateColumn, Entity, PrimaryGeneratedColumn } from 'typeorm';

/** A kernel an engineer added to the library (the built-in ones are files in kernels/). */
@Entity('custom_kernels')
export class CustomKernelEntity {
  @PrimaryGeneratedColumn('uuid')
  id: string;

  @Column({ type: 'varchar', length: 60, unique: true })
  name: string;

  @Column({ type: 'jsonb' })
  matrix: number[][];

  @Column({ type: 'double precision', default: 1 })
  divisor: number;

  @Column({ type: 'double precision', default: 0 })
  offset: number;

  @Column({ type: 'varchar', length: 1000 })
  description: string;

  @Column({ name: 'created_by', type: 'uuid' })
  createdBy: string;

  @CreateDateColumn({ name: 'created_at', type: 'timestamptz' })
  createdAt: Date;
}
