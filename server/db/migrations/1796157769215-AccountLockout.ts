import type { MigrationInterface, QueryRunner } from 'typeorm';

/** Counts consecutive failed sign-ins per account and locks it for a while after too many. */
export class AccountLockout1796157769215 implements MigrationInterface {
  name = 'AccountLockout1796157769215';

  public async up(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(`ALTER TABLE "users" ADD "failed_sign_ins" integer NOT NULL DEFAULT '0'`);
    await queryRunner.query(`ALTER TABLE "users" ADD "locked_until" TIMESTAMP WITH TIME ZONE`);
  }

  public async down(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(`ALTER TABLE "users" DROP COLUMN "locked_until"`);
    await queryRunner.query(`ALTER TABLE "users" DROP COLUMN "failed_sign_ins"`);
  }
}
