import { MigrationInterface, QueryRunner } from "typeorm";

/**
 * Rate-limit counters shared by every API process (server/lib/rate-limit-store.ts). UNLOGGED: the
 * counts are worth nothing after a crash, and not writing them to the WAL keeps each count cheap.
 */
export class SharedRateLimits1796170734337 implements MigrationInterface {
    name = 'SharedRateLimits1796170734337'

    public async up(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`CREATE UNLOGGED TABLE "rate_limit_hits" ("key" text NOT NULL, "hits" integer NOT NULL, "reset_at" TIMESTAMP WITH TIME ZONE NOT NULL, CONSTRAINT "PK_rate_limit_hits" PRIMARY KEY ("key"))`);
        await queryRunner.query(`CREATE INDEX "IDX_rate_limit_hits_reset_at" ON "rate_limit_hits" ("reset_at")`);
    }

    public async down(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`DROP TABLE "rate_limit_hits"`);
    }

}
