import { Check, Column, CreateDateColumn, Entity, PrimaryGeneratedColumn, UpdateDateColumn } from 'typeorm';
import type { Role } from '../../../shared/roles';

@Entity('users')
@Check('CHK_users_roles', `cardinality(roles) > 0 AND roles <@ ARRAY['engineer','operator','supervisor','auditor','admin']::text[]`)
export class UserEntity {
  @PrimaryGeneratedColumn('uuid')
  id: string;

  @Column({ type: 'varchar', length: 40, unique: true })
  username: string;

  @Column({ name: 'display_name', type: 'varchar', length: 80 })
  displayName: string;

  @Column({ type: 'varchar', length: 200, nullable: true })
  email: string | null;

  @Column({ name: 'password_hash', type: 'varchar', length: 100 })
  passwordHash: string;

  @Column({ type: 'text', array: true })
  roles: Role[];

  @Column({ type: 'boolean', default: true })
  active: boolean;

  /** Raised to revoke every token issued before (sign-out, deactivation, password change). */
  @Column({ name: 'token_version', type: 'integer', default: 0 })
  tokenVersion: number;

  /** Failed sign-ins since the last successful one; reaching the plant's limit locks the account. */
  @Column({ name: 'failed_sign_ins', type: 'integer', default: 0 })
  failedSignIns: number;

  @Column({ name: 'locked_until', type: 'timestamptz', nullable: true })
  lockedUntil: Date | null;

  @CreateDateColumn({ name: 'created_at', type: 'timestamptz' })
  createdAt: Date;

  @UpdateDateColumn({ name: 'updated_at', type: 'timestamptz' })
  updatedAt: Date;
}
