import type { MigrationInterface, QueryRunner } from 'typeorm';

/** Counts how often a worker took a trial up, so a trial whose workers keep stopping ends as failed. */
export class TrialAttempts1796159530837 implements MigrationInterface {
  name = 'TrialAttempts1796159530837';

  public async up(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(`ALTER TABLE "trials" ADD "attempts" integer NOT NULL DEFAULT '0'`);
  }

  public async down(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(`ALTER TABLE "trials" DROP COLUMN "attempts"`);
  }
}
