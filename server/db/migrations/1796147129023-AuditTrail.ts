import { MigrationInterface, QueryRunner } from "typeorm";

export class AuditTrail1796147129023 implements MigrationInterface {
    name = 'AuditTrail1796147129023'

    public async up(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`CREATE TABLE "audit_events" ("seq" bigint NOT NULL, "occurred_at" TIMESTAMP WITH TIME ZONE NOT NULL, "actor_id" uuid, "actor_name" character varying(80) NOT NULL, "action" character varying(60) NOT NULL, "entity_type" character varying(40) NOT NULL, "entity_id" character varying(80), "before_digest" character(64), "after_digest" character(64), "details" jsonb NOT NULL, "prev_hash" character(64) NOT NULL, "hash" character(64) NOT NULL, CONSTRAINT "PK_6e299f5706e715265416fefe53e" PRIMARY KEY ("seq"))`);
        await queryRunner.query(`CREATE INDEX "IDX_audit_events_occurred_at" ON "audit_events"  ("occurred_at") `);
        await queryRunner.query(`CREATE INDEX "IDX_audit_events_entity" ON "audit_events"  ("entity_type", "entity_id") `);
        await queryRunner.query(`CREATE SEQUENCE "audit_events_seq" AS bigint START 1`);
        // Append-only: no role, owner or administrator can change or remove an event through SQL.
        await queryRunner.query(`CREATE FUNCTION kw_refuse_change() RETURNS trigger LANGUAGE plpgsql AS $$
            BEGIN
              RAISE EXCEPTION '% on % is not allowed: the records are append-only', TG_OP, TG_TABLE_NAME
                USING ERRCODE = 'insufficient_privilege';
            END $$`);
        await queryRunner.query(`CREATE TRIGGER "audit_events_append_only" BEFORE UPDATE OR DELETE ON "audit_events" FOR EACH ROW EXECUTE FUNCTION kw_refuse_change()`);
        await queryRunner.query(`CREATE TRIGGER "audit_events_no_truncate" BEFORE TRUNCATE ON "audit_events" FOR EACH STATEMENT EXECUTE FUNCTION kw_refuse_change()`);
    }

    public async down(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`DROP TRIGGER "audit_events_no_truncate" ON "audit_events"`);
        await queryRunner.query(`DROP TRIGGER "audit_events_append_only" ON "audit_events"`);
        await queryRunner.query(`DROP FUNCTION kw_refuse_change()`);
        await queryRunner.query(`DROP SEQUENCE "audit_events_seq"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_audit_events_entity"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_audit_events_occurred_at"`);
        await queryRunner.query(`DROP TABLE "audit_events"`);
    }

}
