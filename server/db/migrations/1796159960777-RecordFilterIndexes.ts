import { MigrationInterface, QueryRunner } from "typeorm";

export class RecordFilterIndexes1796159960777 implements MigrationInterface {
    name = 'RecordFilterIndexes1796159960777'

    public async up(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`CREATE INDEX "IDX_inspections_cause_created" ON "inspections"  ("cause", "created_at") WHERE cause IS NOT NULL`);
        await queryRunner.query(`CREATE INDEX "IDX_inspections_verdict_created" ON "inspections"  ("verdict", "created_at") `);
        await queryRunner.query(`CREATE INDEX "IDX_inspections_operator_created" ON "inspections"  ("operator_id", "created_at") `);
        await queryRunner.query(`CREATE INDEX "IDX_inspections_rule_created" ON "inspections"  ("rule_id", "created_at") `);
    }

    public async down(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`DROP INDEX "public"."IDX_inspections_rule_created"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_inspections_operator_created"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_inspections_verdict_created"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_inspections_cause_created"`);
    }

}
