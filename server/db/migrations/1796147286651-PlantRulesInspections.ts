import { MigrationInterface, QueryRunner } from "typeorm";

export class PlantRulesInspections1796147286651 implements MigrationInterface {
    name = 'PlantRulesInspections1796147286651'

    public async up(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`CREATE TABLE "part_types" ("code" character varying(40) NOT NULL, "name" character varying(80) NOT NULL, "family" character varying(40) NOT NULL, CONSTRAINT "PK_a90518311a4c5e8491be69e4df0" PRIMARY KEY ("code"))`);
        await queryRunner.query(`CREATE TABLE "defect_kinds" ("code" character varying(40) NOT NULL, "name" character varying(80) NOT NULL, CONSTRAINT "PK_eda48c429852217803af72acbc8" PRIMARY KEY ("code"))`);
        await queryRunner.query(`CREATE TABLE "rules" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "name" character varying(120) NOT NULL, "part_type" character varying(40) NOT NULL, "smallest_defect_mm" double precision, "created_by" uuid NOT NULL, "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), CONSTRAINT "UQ_7cd7a3ee6293cff472c1e56db3f" UNIQUE ("name"), CONSTRAINT "PK_10fef696a7d61140361b1b23608" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE TABLE "rule_versions" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "rule_id" uuid NOT NULL, "number" integer NOT NULL, "state" character varying(20) NOT NULL DEFAULT 'draft', "document" jsonb NOT NULL, "content_hash" character(64) NOT NULL, "author_id" uuid NOT NULL, "author_note" character varying(2000) NOT NULL DEFAULT '', "edited_at" TIMESTAMP WITH TIME ZONE NOT NULL, "submitted_at" TIMESTAMP WITH TIME ZONE, "submitted_trial_id" uuid, "reviewer_id" uuid, "reviewed_at" TIMESTAMP WITH TIME ZONE, "review_note" character varying(2000), "released_at" TIMESTAMP WITH TIME ZONE, "ended_at" TIMESTAMP WITH TIME ZONE, "withdraw_reason" character varying(2000), "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), "updated_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), CONSTRAINT "CHK_rule_versions_state" CHECK (state IN ('draft','in-review','released','superseded','withdrawn')), CONSTRAINT "PK_f94078d9fb0f85dcdf3ceaec3ec" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE INDEX "IDX_rule_versions_state" ON "rule_versions"  ("state") `);
        await queryRunner.query(`CREATE UNIQUE INDEX "UQ_rule_versions_rule_number" ON "rule_versions"  ("rule_id", "number") `);
        await queryRunner.query(`CREATE TABLE "signatures" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "rule_version_id" uuid NOT NULL, "signer_id" uuid NOT NULL, "signer_name" character varying(80) NOT NULL, "meaning" character varying(20) NOT NULL, "signed_at" TIMESTAMP WITH TIME ZONE NOT NULL, "content_hash" character(64) NOT NULL, "signature_hash" character(64) NOT NULL, CONSTRAINT "PK_f56eb3cd344ce7f9ae28ce814eb" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE INDEX "IDX_signatures_version" ON "signatures"  ("rule_version_id") `);
        await queryRunner.query(`CREATE TABLE "lines" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "name" character varying(80) NOT NULL, "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), CONSTRAINT "UQ_e00c638fdac01816ea68e225bb5" UNIQUE ("name"), CONSTRAINT "PK_155ad34738bc0e1aab0ca198dea" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE TABLE "stations" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "line_id" uuid NOT NULL, "name" character varying(80) NOT NULL, "camera_note" character varying(500) NOT NULL DEFAULT '', "mm_per_px" double precision, "calibrated_at" TIMESTAMP WITH TIME ZONE, "calibrated_by" uuid, "active" boolean NOT NULL DEFAULT true, "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), CONSTRAINT "PK_f047974bd453c85b08bab349367" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE UNIQUE INDEX "UQ_stations_line_name" ON "stations"  ("line_id", "name") `);
        await queryRunner.query(`CREATE TABLE "inspections" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "idempotency_key" character varying(80) NOT NULL, "rule_version_id" uuid NOT NULL, "rule_id" uuid NOT NULL, "station_id" uuid NOT NULL, "line_id" uuid NOT NULL, "part_type" character varying(40) NOT NULL, "operator_id" uuid NOT NULL, "image_hash" character(64) NOT NULL, "evidence_hash" character(64), "verdict" character varying(8) NOT NULL, "cause" character varying(120), "quality" jsonb NOT NULL, "mm_per_px" double precision, "duration_ms" double precision NOT NULL, "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), CONSTRAINT "UQ_dbc0dee7821137daa40e2bf28ff" UNIQUE ("idempotency_key"), CONSTRAINT "CHK_inspections_verdict" CHECK (verdict IN ('PASS','FAIL','RETAKE')), CONSTRAINT "PK_a484980015782324454d8c88abe" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE INDEX "IDX_inspections_version_created" ON "inspections"  ("rule_version_id", "created_at") `);
        await queryRunner.query(`CREATE INDEX "IDX_inspections_station_created" ON "inspections"  ("station_id", "created_at") `);
        await queryRunner.query(`CREATE INDEX "IDX_inspections_created_at" ON "inspections"  ("created_at") `);
        await queryRunner.query(`CREATE TABLE "measurements" ("inspection_id" uuid NOT NULL, "position" smallint NOT NULL, "gauge" character varying(120) NOT NULL, "value" double precision NOT NULL, "unit" character varying(8) NOT NULL DEFAULT '', "limit_min" double precision, "limit_max" double precision, "pass" boolean NOT NULL, CONSTRAINT "PK_7e741389a89e8444dfccaeb2591" PRIMARY KEY ("inspection_id", "position"))`);
        await queryRunner.query(`CREATE TABLE "disputes" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "inspection_id" uuid NOT NULL, "raised_by" uuid NOT NULL, "note" character varying(2000) NOT NULL, "raised_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), "resolved_by" uuid, "judgement" character varying(12), "resolution_note" character varying(2000), "resolved_at" TIMESTAMP WITH TIME ZONE, CONSTRAINT "UQ_bfa92e8460dba6b9ab8c16b7131" UNIQUE ("inspection_id"), CONSTRAINT "PK_3c97580d01c1a4b0b345c42a107" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE INDEX "IDX_disputes_open" ON "disputes"  ("resolved_at") `);
        await queryRunner.query(`CREATE TABLE "custom_kernels" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "name" character varying(60) NOT NULL, "matrix" jsonb NOT NULL, "divisor" double precision NOT NULL DEFAULT '1', "offset" double precision NOT NULL DEFAULT '0', "description" character varying(1000) NOT NULL, "created_by" uuid NOT NULL, "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), CONSTRAINT "UQ_edd636749fe465139fee92fe471" UNIQUE ("name"), CONSTRAINT "PK_898e4f75498f28b138d43c89784" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE TABLE "reference_sets" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "name" character varying(120) NOT NULL, "part_type" character varying(40) NOT NULL, "description" character varying(2000) NOT NULL DEFAULT '', "created_by" uuid NOT NULL, "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), CONSTRAINT "UQ_7ca03ca6b7c8f7e164795586511" UNIQUE ("name"), CONSTRAINT "PK_591e4a35369487b952db92da8c6" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE TABLE "reference_images" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "set_id" uuid NOT NULL, "content_hash" character(64) NOT NULL, "thumbnail_hash" character(64), "file_name" character varying(255) NOT NULL, "media_type" character varying(40) NOT NULL, "width" integer NOT NULL, "height" integer NOT NULL, "bit_depth" smallint NOT NULL, "label" character varying(12) NOT NULL DEFAULT 'unlabelled', "defect_kind" character varying(40), "part_type" character varying(40) NOT NULL, "note" character varying(2000) NOT NULL DEFAULT '', "uploaded_by" uuid NOT NULL, "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), "updated_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), CONSTRAINT "CHK_reference_images_defect_kind" CHECK ((label = 'defective') OR defect_kind IS NULL), CONSTRAINT "CHK_reference_images_label" CHECK (label IN ('unlabelled','good','defective','retake')), CONSTRAINT "PK_609ed4909305e3955ed5e019c1e" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE INDEX "IDX_reference_images_set_label" ON "reference_images"  ("set_id", "label") `);
        await queryRunner.query(`CREATE UNIQUE INDEX "UQ_reference_images_set_hash" ON "reference_images"  ("set_id", "content_hash") `);
        await queryRunner.query(`CREATE TABLE "trials" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "rule_version_id" uuid NOT NULL, "reference_set_id" uuid NOT NULL, "content_hash" character(64) NOT NULL, "mm_per_px" double precision, "state" character varying(12) NOT NULL DEFAULT 'queued', "total" integer NOT NULL DEFAULT '0', "processed" integer NOT NULL DEFAULT '0', "summary" jsonb, "error" character varying(2000), "started_by" uuid NOT NULL, "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), "finished_at" TIMESTAMP WITH TIME ZONE, CONSTRAINT "CHK_trials_state" CHECK (state IN ('queued','running','done','failed')), CONSTRAINT "PK_afe5dc86ce7253d239c3dfea2d3" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE INDEX "IDX_trials_version" ON "trials"  ("rule_version_id", "created_at") `);
        await queryRunner.query(`CREATE TABLE "trial_results" ("trial_id" uuid NOT NULL, "image_id" uuid NOT NULL, "verdict" character varying(8) NOT NULL, "label" character varying(12) NOT NULL, "agrees" boolean, "measurements" jsonb NOT NULL, "quality" jsonb NOT NULL, "duration_ms" double precision NOT NULL, CONSTRAINT "PK_d4ddbe380932883a06953d80a45" PRIMARY KEY ("trial_id", "image_id"))`);
        await queryRunner.query(`ALTER TABLE "rule_versions" ADD CONSTRAINT "FK_d13d4a69ecdb5acf7b1df3bbf6c" FOREIGN KEY ("rule_id") REFERENCES "rules"("id") ON DELETE RESTRICT ON UPDATE NO ACTION`);
        await queryRunner.query(`ALTER TABLE "signatures" ADD CONSTRAINT "FK_242aed11e89c81c91a1f5711117" FOREIGN KEY ("rule_version_id") REFERENCES "rule_versions"("id") ON DELETE RESTRICT ON UPDATE NO ACTION`);
        await queryRunner.query(`ALTER TABLE "stations" ADD CONSTRAINT "FK_eaea2f17c886ab96e5f6616d951" FOREIGN KEY ("line_id") REFERENCES "lines"("id") ON DELETE RESTRICT ON UPDATE NO ACTION`);
        await queryRunner.query(`ALTER TABLE "inspections" ADD CONSTRAINT "FK_d931b05c277fbe27dbefdbfa205" FOREIGN KEY ("rule_version_id") REFERENCES "rule_versions"("id") ON DELETE RESTRICT ON UPDATE NO ACTION`);
        await queryRunner.query(`ALTER TABLE "inspections" ADD CONSTRAINT "FK_15b8a18b96010462cb0eb1ed68a" FOREIGN KEY ("station_id") REFERENCES "stations"("id") ON DELETE RESTRICT ON UPDATE NO ACTION`);
        await queryRunner.query(`ALTER TABLE "inspections" ADD CONSTRAINT "FK_fc7bfd9cf03203fadaad717a2c3" FOREIGN KEY ("operator_id") REFERENCES "users"("id") ON DELETE RESTRICT ON UPDATE NO ACTION`);
        await queryRunner.query(`ALTER TABLE "measurements" ADD CONSTRAINT "FK_0ef9020e3ac1df2c57202029410" FOREIGN KEY ("inspection_id") REFERENCES "inspections"("id") ON DELETE RESTRICT ON UPDATE NO ACTION`);
        await queryRunner.query(`ALTER TABLE "disputes" ADD CONSTRAINT "FK_bfa92e8460dba6b9ab8c16b7131" FOREIGN KEY ("inspection_id") REFERENCES "inspections"("id") ON DELETE RESTRICT ON UPDATE NO ACTION`);
        await queryRunner.query(`ALTER TABLE "reference_images" ADD CONSTRAINT "FK_91f1770ecb14f46dcca7dc0a7b8" FOREIGN KEY ("set_id") REFERENCES "reference_sets"("id") ON DELETE CASCADE ON UPDATE NO ACTION`);
        await queryRunner.query(`ALTER TABLE "trials" ADD CONSTRAINT "FK_91998508d3b66016af5c22ab507" FOREIGN KEY ("rule_version_id") REFERENCES "rule_versions"("id") ON DELETE RESTRICT ON UPDATE NO ACTION`);
        await queryRunner.query(`ALTER TABLE "trials" ADD CONSTRAINT "FK_da7875320d65594e737f3d98311" FOREIGN KEY ("reference_set_id") REFERENCES "reference_sets"("id") ON DELETE CASCADE ON UPDATE NO ACTION`);
        await queryRunner.query(`ALTER TABLE "trial_results" ADD CONSTRAINT "FK_9ef26af3a06f0dd6c211a2c6b1c" FOREIGN KEY ("trial_id") REFERENCES "trials"("id") ON DELETE CASCADE ON UPDATE NO ACTION`);
        await queryRunner.query(`ALTER TABLE "trial_results" ADD CONSTRAINT "FK_3aaf8e0f4ced704a34d4b64a5b4" FOREIGN KEY ("image_id") REFERENCES "reference_images"("id") ON DELETE CASCADE ON UPDATE NO ACTION`);
        // Released, superseded and withdrawn versions are frozen: only the allowed state changes pass.
        await queryRunner.query(`CREATE FUNCTION kw_guard_rule_version() RETURNS trigger LANGUAGE plpgsql AS $$
            BEGIN
              IF TG_OP = 'DELETE' THEN
                IF OLD.state <> 'draft' THEN
                  RAISE EXCEPTION 'rule version % is %, not a draft: it cannot be deleted', OLD.id, OLD.state USING ERRCODE = 'insufficient_privilege';
                END IF;
                RETURN OLD;
              END IF;
              IF OLD.state IN ('released', 'superseded', 'withdrawn') THEN
                IF NEW.document IS DISTINCT FROM OLD.document OR NEW.content_hash IS DISTINCT FROM OLD.content_hash
                   OR NEW.rule_id IS DISTINCT FROM OLD.rule_id OR NEW.number IS DISTINCT FROM OLD.number
                   OR NEW.author_id IS DISTINCT FROM OLD.author_id OR NEW.reviewer_id IS DISTINCT FROM OLD.reviewer_id
                   OR NEW.released_at IS DISTINCT FROM OLD.released_at OR NEW.submitted_trial_id IS DISTINCT FROM OLD.submitted_trial_id THEN
                  RAISE EXCEPTION 'rule version % is %: its content is frozen', OLD.id, OLD.state USING ERRCODE = 'insufficient_privilege';
                END IF;
                IF NEW.state IS DISTINCT FROM OLD.state AND NOT (
                     (OLD.state = 'released' AND NEW.state IN ('superseded', 'withdrawn'))
                  OR (OLD.state = 'superseded' AND NEW.state = 'withdrawn')) THEN
                  RAISE EXCEPTION 'rule version % cannot go from % to %', OLD.id, OLD.state, NEW.state USING ERRCODE = 'insufficient_privilege';
                END IF;
                IF OLD.state = 'withdrawn' AND ROW(NEW.*) IS DISTINCT FROM ROW(OLD.*) THEN
                  RAISE EXCEPTION 'rule version % is withdrawn: it cannot change', OLD.id USING ERRCODE = 'insufficient_privilege';
                END IF;
              END IF;
              RETURN NEW;
            END $$`);
        await queryRunner.query(`CREATE TRIGGER "rule_versions_frozen" BEFORE UPDATE OR DELETE ON "rule_versions" FOR EACH ROW EXECUTE FUNCTION kw_guard_rule_version()`);
        // Signatures, inspections and measurements are append-only (kw_refuse_change comes with the audit trail).
        for (const table of ['signatures', 'inspections', 'measurements']) {
            await queryRunner.query(`CREATE TRIGGER "${table}_append_only" BEFORE UPDATE OR DELETE ON "${table}" FOR EACH ROW EXECUTE FUNCTION kw_refuse_change()`);
            await queryRunner.query(`CREATE TRIGGER "${table}_no_truncate" BEFORE TRUNCATE ON "${table}" FOR EACH STATEMENT EXECUTE FUNCTION kw_refuse_change()`);
        }
    }

    public async down(queryRunner: QueryRunner): Promise<void> {
        for (const table of ['signatures', 'inspections', 'measurements']) {
            await queryRunner.query(`DROP TRIGGER "${table}_no_truncate" ON "${table}"`);
            await queryRunner.query(`DROP TRIGGER "${table}_append_only" ON "${table}"`);
        }
        await queryRunner.query(`DROP TRIGGER "rule_versions_frozen" ON "rule_versions"`);
        await queryRunner.query(`DROP FUNCTION kw_guard_rule_version()`);
        await queryRunner.query(`ALTER TABLE "trial_results" DROP CONSTRAINT "FK_3aaf8e0f4ced704a34d4b64a5b4"`);
        await queryRunner.query(`ALTER TABLE "trial_results" DROP CONSTRAINT "FK_9ef26af3a06f0dd6c211a2c6b1c"`);
        await queryRunner.query(`ALTER TABLE "trials" DROP CONSTRAINT "FK_da7875320d65594e737f3d98311"`);
        await queryRunner.query(`ALTER TABLE "trials" DROP CONSTRAINT "FK_91998508d3b66016af5c22ab507"`);
        await queryRunner.query(`ALTER TABLE "reference_images" DROP CONSTRAINT "FK_91f1770ecb14f46dcca7dc0a7b8"`);
        await queryRunner.query(`ALTER TABLE "disputes" DROP CONSTRAINT "FK_bfa92e8460dba6b9ab8c16b7131"`);
        await queryRunner.query(`ALTER TABLE "measurements" DROP CONSTRAINT "FK_0ef9020e3ac1df2c57202029410"`);
        await queryRunner.query(`ALTER TABLE "inspections" DROP CONSTRAINT "FK_fc7bfd9cf03203fadaad717a2c3"`);
        await queryRunner.query(`ALTER TABLE "inspections" DROP CONSTRAINT "FK_15b8a18b96010462cb0eb1ed68a"`);
        await queryRunner.query(`ALTER TABLE "inspections" DROP CONSTRAINT "FK_d931b05c277fbe27dbefdbfa205"`);
        await queryRunner.query(`ALTER TABLE "stations" DROP CONSTRAINT "FK_eaea2f17c886ab96e5f6616d951"`);
        await queryRunner.query(`ALTER TABLE "signatures" DROP CONSTRAINT "FK_242aed11e89c81c91a1f5711117"`);
        await queryRunner.query(`ALTER TABLE "rule_versions" DROP CONSTRAINT "FK_d13d4a69ecdb5acf7b1df3bbf6c"`);
        await queryRunner.query(`DROP TABLE "trial_results"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_trials_version"`);
        await queryRunner.query(`DROP TABLE "trials"`);
        await queryRunner.query(`DROP INDEX "public"."UQ_reference_images_set_hash"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_reference_images_set_label"`);
        await queryRunner.query(`DROP TABLE "reference_images"`);
        await queryRunner.query(`DROP TABLE "reference_sets"`);
        await queryRunner.query(`DROP TABLE "custom_kernels"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_disputes_open"`);
        await queryRunner.query(`DROP TABLE "disputes"`);
        await queryRunner.query(`DROP TABLE "measurements"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_inspections_created_at"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_inspections_station_created"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_inspections_version_created"`);
        await queryRunner.query(`DROP TABLE "inspections"`);
        await queryRunner.query(`DROP INDEX "public"."UQ_stations_line_name"`);
        await queryRunner.query(`DROP TABLE "stations"`);
        await queryRunner.query(`DROP TABLE "lines"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_signatures_version"`);
        await queryRunner.query(`DROP TABLE "signatures"`);
        await queryRunner.query(`DROP INDEX "public"."UQ_rule_versions_rule_number"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_rule_versions_state"`);
        await queryRunner.query(`DROP TABLE "rule_versions"`);
        await queryRunner.query(`DROP TABLE "rules"`);
        await queryRunner.query(`DROP TABLE "defect_kinds"`);
        await queryRunner.query(`DROP TABLE "part_types"`);
    }

}
