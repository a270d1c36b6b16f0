import { MigrationInterface, QueryRunner } from "typeorm";

export class TrendsAlertsStudies1796157815152 implements MigrationInterface {
    name = 'TrendsAlertsStudies1796157815152'

    public async up(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`CREATE TABLE "alerts" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "kind" character varying(12) NOT NULL, "rule_id" uuid NOT NULL, "station_id" uuid NOT NULL, "signal" character varying(8) NOT NULL, "period_start" TIMESTAMP WITH TIME ZONE NOT NULL, "period_end" TIMESTAMP WITH TIME ZONE NOT NULL, "description" character varying(500) NOT NULL, "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), "acknowledged_at" TIMESTAMP WITH TIME ZONE, "acknowledged_by" uuid, "acknowledgement_note" character varying(2000), CONSTRAINT "CHK_alerts_acknowledgement" CHECK ((acknowledged_at IS NULL) = (acknowledged_by IS NULL) AND (acknowledged_at IS NULL) = (acknowledgement_note IS NULL)), CONSTRAINT "CHK_alerts_kind" CHECK (kind IN ('run-rule','limit')), CONSTRAINT "PK_60f895662df096bfcdfab7f4b96" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE INDEX "IDX_alerts_created" ON "alerts"  ("created_at", "id") `);
        await queryRunner.query(`CREATE UNIQUE INDEX "UQ_alerts_signal" ON "alerts"  ("rule_id", "station_id", "signal", "period_start") `);
        await queryRunner.query(`CREATE TABLE "alert_limits" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "rule_id" uuid NOT NULL, "station_id" uuid, "max_defect_fraction" double precision NOT NULL, "created_by" uuid NOT NULL, "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), CONSTRAINT "CHK_alert_limits_fraction" CHECK (max_defect_fraction > 0 AND max_defect_fraction <= 1), CONSTRAINT "PK_b5b08151fb4ebc61212713d27b8" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE INDEX "IDX_alert_limits_rule" ON "alert_limits"  ("rule_id") `);
        await queryRunner.query(`CREATE TABLE "alert_subscriptions" ("user_id" uuid NOT NULL, "subscribed" boolean NOT NULL, "updated_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), CONSTRAINT "PK_f1ab5e4a7a07ebe3e8d2217cefa" PRIMARY KEY ("user_id"))`);
        await queryRunner.query(`CREATE TABLE "repeatability_studies" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "rule_version_id" uuid NOT NULL, "station_id" uuid NOT NULL, "mm_per_px" double precision, "part_label" character varying(120) NOT NULL, "known_label" character varying(12) NOT NULL, "created_by" uuid NOT NULL, "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), CONSTRAINT "CHK_repeatability_studies_known_label" CHECK (known_label IN ('good','defective','unknown')), CONSTRAINT "PK_adf940745403f13392c285fb50f" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE INDEX "IDX_repeatability_studies_created" ON "repeatability_studies"  ("created_at", "id") `);
        await queryRunner.query(`CREATE TABLE "repeatability_photos" ("study_id" uuid NOT NULL, "position" smallint NOT NULL, "image_hash" character(64) NOT NULL, "verdict" character varying(8) NOT NULL, "cause" character varying(120), "measurements" jsonb NOT NULL, "quality" jsonb NOT NULL, CONSTRAINT "CHK_repeatability_photos_verdict" CHECK (verdict IN ('PASS','FAIL','RETAKE')), CONSTRAINT "PK_36fef6c12411c96381fdd970f6a" PRIMARY KEY ("study_id", "position"))`);
        await queryRunner.query(`CREATE TABLE "inspection_hours" ("hour" TIMESTAMP WITH TIME ZONE NOT NULL, "rule_id" uuid NOT NULL, "station_id" uuid NOT NULL, "line_id" uuid NOT NULL, "part_type" character varying(40) NOT NULL, "judged" integer NOT NULL, "failed" integer NOT NULL, "retakes" integer NOT NULL, CONSTRAINT "PK_f6c6ad3ac13c6b51d78caa53a0a" PRIMARY KEY ("hour", "rule_id", "station_id", "line_id", "part_type"))`);
        await queryRunner.query(`CREATE TABLE "inspection_failure_hours" ("hour" TIMESTAMP WITH TIME ZONE NOT NULL, "rule_id" uuid NOT NULL, "station_id" uuid NOT NULL, "line_id" uuid NOT NULL, "part_type" character varying(40) NOT NULL, "cause" character varying(120) NOT NULL, "failures" integer NOT NULL, CONSTRAINT "PK_3cbaf957e52d8068c88f33e8332" PRIMARY KEY ("hour", "rule_id", "station_id", "line_id", "part_type", "cause"))`);
        await queryRunner.query(`ALTER TABLE "alerts" ADD CONSTRAINT "FK_a03c8afb3e29b85c8feccd730ef" FOREIGN KEY ("rule_id") REFERENCES "rules"("id") ON DELETE RESTRICT ON UPDATE NO ACTION`);
        await queryRunner.query(`ALTER TABLE "alerts" ADD CONSTRAINT "FK_18d3f17a656917713f338855504" FOREIGN KEY ("station_id") REFERENCES "stations"("id") ON DELETE RESTRICT ON UPDATE NO ACTION`);
        await queryRunner.query(`ALTER TABLE "alerts" ADD CONSTRAINT "FK_70e5404e97a308f93a591991dbd" FOREIGN KEY ("acknowledged_by") REFERENCES "users"("id") ON DELETE RESTRICT ON UPDATE NO ACTION`);
        await queryRunner.query(`ALTER TABLE "alert_limits" ADD CONSTRAINT "FK_e46af45e9a0858cf7339e094235" FOREIGN KEY ("rule_id") REFERENCES "rules"("id") ON DELETE RESTRICT ON UPDATE NO ACTION`);
        await queryRunner.query(`ALTER TABLE "alert_limits" ADD CONSTRAINT "FK_bf16f22bbee6ddf53b3e940500f" FOREIGN KEY ("station_id") REFERENCES "stations"("id") ON DELETE RESTRICT ON UPDATE NO ACTION`);
        await queryRunner.query(`ALTER TABLE "alert_limits" ADD CONSTRAINT "FK_a1c419e087981ba003fedc3ee20" FOREIGN KEY ("created_by") REFERENCES "users"("id") ON DELETE RESTRICT ON UPDATE NO ACTION`);
        await queryRunner.query(`ALTER TABLE "alert_subscriptions" ADD CONSTRAINT "FK_f1ab5e4a7a07ebe3e8d2217cefa" FOREIGN KEY ("user_id") REFERENCES "users"("id") ON DELETE RESTRICT ON UPDATE NO ACTION`);
        await queryRunner.query(`ALTER TABLE "repeatability_studies" ADD CONSTRAINT "FK_dc6f32eef97523f370be494efbf" FOREIGN KEY ("rule_version_id") REFERENCES "rule_versions"("id") ON DELETE RESTRICT ON UPDATE NO ACTION`);
        await queryRunner.query(`ALTER TABLE "repeatability_studies" ADD CONSTRAINT "FK_68e4942f846d8c0490c32fabeee" FOREIGN KEY ("station_id") REFERENCES "stations"("id") ON DELETE RESTRICT ON UPDATE NO ACTION`);
        await queryRunner.query(`ALTER TABLE "repeatability_studies" ADD CONSTRAINT "FK_5be8f3b729b1334d84c92c6a29c" FOREIGN KEY ("created_by") REFERENCES "users"("id") ON DELETE RESTRICT ON UPDATE NO ACTION`);
        await queryRunner.query(`ALTER TABLE "repeatability_photos" ADD CONSTRAINT "FK_25e0be362fe22bd6ea1f6bbc853" FOREIGN KEY ("study_id") REFERENCES "repeatability_studies"("id") ON DELETE RESTRICT ON UPDATE NO ACTION`);
        await queryRunner.query(`ALTER TABLE "inspection_hours" ADD CONSTRAINT "FK_cdd82e32cf1f1543e1d059591a1" FOREIGN KEY ("rule_id") REFERENCES "rules"("id") ON DELETE RESTRICT ON UPDATE NO ACTION`);
        await queryRunner.query(`ALTER TABLE "inspection_hours" ADD CONSTRAINT "FK_93ebab565bf8c1b743f5b8cffba" FOREIGN KEY ("station_id") REFERENCES "stations"("id") ON DELETE RESTRICT ON UPDATE NO ACTION`);
        await queryRunner.query(`ALTER TABLE "inspection_hours" ADD CONSTRAINT "FK_e2758c46cc05780428def35504f" FOREIGN KEY ("line_id") REFERENCES "lines"("id") ON DELETE RESTRICT ON UPDATE NO ACTION`);
        await queryRunner.query(`ALTER TABLE "inspection_failure_hours" ADD CONSTRAINT "FK_8ba94d3afa90bc3081f487663fe" FOREIGN KEY ("rule_id") REFERENCES "rules"("id") ON DELETE RESTRICT ON UPDATE NO ACTION`);
        await queryRunner.query(`ALTER TABLE "inspection_failure_hours" ADD CONSTRAINT "FK_b607e7d92ab1f3a4bf94cd1fd70" FOREIGN KEY ("station_id") REFERENCES "stations"("id") ON DELETE RESTRICT ON UPDATE NO ACTION`);
        await queryRunner.query(`ALTER TABLE "inspection_failure_hours" ADD CONSTRAINT "FK_8814db1d69b457abfb391ab515c" FOREIGN KEY ("line_id") REFERENCES "lines"("id") ON DELETE RESTRICT ON UPDATE NO ACTION`);
        // Hourly counts of inspections, kept in the transaction that stores them: one statement trigger
        // adds up the inserted rows (a bulk insert costs one upsert per hour and key, not one per row).
        await queryRunner.query(`CREATE FUNCTION kw_count_inspections() RETURNS trigger LANGUAGE plpgsql AS $$
            BEGIN
              INSERT INTO inspection_hours AS h (hour, rule_id, station_id, line_id, part_type, judged, failed, retakes)
                SELECT date_trunc('hour', created_at, 'UTC'), rule_id, station_id, line_id, part_type,
                       count(*) FILTER (WHERE verdict <> 'RETAKE'), count(*) FILTER (WHERE verdict = 'FAIL'), count(*) FILTER (WHERE verdict = 'RETAKE')
                FROM added GROUP BY 1, 2, 3, 4, 5 ORDER BY 1, 2, 3, 4, 5
                ON CONFLICT (hour, rule_id, station_id, line_id, part_type)
                DO UPDATE SET judged = h.judged + EXCLUDED.judged, failed = h.failed + EXCLUDED.failed, retakes = h.retakes + EXCLUDED.retakes;
              INSERT INTO inspection_failure_hours AS f (hour, rule_id, station_id, line_id, part_type, cause, failures)
                SELECT date_trunc('hour', created_at, 'UTC'), rule_id, station_id, line_id, part_type, coalesce(cause, ''), count(*)
                FROM added WHERE verdict = 'FAIL' GROUP BY 1, 2, 3, 4, 5, 6 ORDER BY 1, 2, 3, 4, 5, 6
                ON CONFLICT (hour, rule_id, station_id, line_id, part_type, cause) DO UPDATE SET failures = f.failures + EXCLUDED.failures;
              RETURN NULL;
            END $$`);
        await queryRunner.query(`CREATE TRIGGER "inspections_count_hours" AFTER INSERT ON "inspections" REFERENCING NEW TABLE AS added FOR EACH STATEMENT EXECUTE FUNCTION kw_count_inspections()`);
        // A year of hours is some 10^5 rows: parallel workers cost more to start than they save (EXPLAIN ANALYZE over 1 000 000 inspections).
        await queryRunner.query(`ALTER TABLE "inspection_hours" SET (parallel_workers = 0)`);
        await queryRunner.query(`ALTER TABLE "inspection_failure_hours" SET (parallel_workers = 0)`);
        // The history there is already, counted once.
        await queryRunner.query(`LOCK TABLE "inspections" IN SHARE MODE`);
        await queryRunner.query(`INSERT INTO inspection_hours (hour, rule_id, station_id, line_id, part_type, judged, failed, retakes)
            SELECT date_trunc('hour', created_at, 'UTC'), rule_id, station_id, line_id, part_type,
                   count(*) FILTER (WHERE verdict <> 'RETAKE'), count(*) FILTER (WHERE verdict = 'FAIL'), count(*) FILTER (WHERE verdict = 'RETAKE')
            FROM inspections GROUP BY 1, 2, 3, 4, 5`);
        await queryRunner.query(`INSERT INTO inspection_failure_hours (hour, rule_id, station_id, line_id, part_type, cause, failures)
            SELECT date_trunc('hour', created_at, 'UTC'), rule_id, station_id, line_id, part_type, coalesce(cause, ''), count(*)
            FROM inspections WHERE verdict = 'FAIL' GROUP BY 1, 2, 3, 4, 5, 6`);
        // An alert is kept for good: no delete, and only its acknowledgement may be filled in, once.
        await queryRunner.query(`CREATE FUNCTION kw_guard_alert() RETURNS trigger LANGUAGE plpgsql AS $$
            BEGIN
              IF TG_OP = 'DELETE' THEN
                RAISE EXCEPTION 'alert % is kept: it cannot be deleted', OLD.id USING ERRCODE = 'insufficient_privilege';
              END IF;
              IF OLD.acknowledged_at IS NOT NULL
                 OR ROW(NEW.id, NEW.kind, NEW.rule_id, NEW.station_id, NEW.signal, NEW.period_start, NEW.period_end, NEW.description, NEW.created_at)
                    IS DISTINCT FROM ROW(OLD.id, OLD.kind, OLD.rule_id, OLD.station_id, OLD.signal, OLD.period_start, OLD.period_end, OLD.description, OLD.created_at) THEN
                RAISE EXCEPTION 'alert % can only be acknowledged, once', OLD.id USING ERRCODE = 'insufficient_privilege';
              END IF;
              RETURN NEW;
            END $$`);
        await queryRunner.query(`CREATE TRIGGER "alerts_kept" BEFORE UPDATE OR DELETE ON "alerts" FOR EACH ROW EXECUTE FUNCTION kw_guard_alert()`);
        await queryRunner.query(`CREATE TRIGGER "alerts_no_truncate" BEFORE TRUNCATE ON "alerts" FOR EACH STATEMENT EXECUTE FUNCTION kw_refuse_change()`);
        // Repeatability studies are records of what the rule did: append-only.
        for (const table of ['repeatability_studies', 'repeatability_photos']) {
            await queryRunner.query(`CREATE TRIGGER "${table}_append_only" BEFORE UPDATE OR DELETE ON "${table}" FOR EACH ROW EXECUTE FUNCTION kw_refuse_change()`);
            await queryRunner.query(`CREATE TRIGGER "${table}_no_truncate" BEFORE TRUNCATE ON "${table}" FOR EACH STATEMENT EXECUTE FUNCTION kw_refuse_change()`);
        }
    }

    public async down(queryRunner: QueryRunner): Promise<void> {
        for (const table of ['repeatability_studies', 'repeatability_photos']) {
            await queryRunner.query(`DROP TRIGGER "${table}_no_truncate" ON "${table}"`);
            await queryRunner.query(`DROP TRIGGER "${table}_append_only" ON "${table}"`);
        }
        await queryRunner.query(`DROP TRIGGER "alerts_no_truncate" ON "alerts"`);
        await queryRunner.query(`DROP TRIGGER "alerts_kept" ON "alerts"`);
        await queryRunner.query(`DROP FUNCTION kw_guard_alert()`);
        await queryRunner.query(`DROP TRIGGER "inspections_count_hours" ON "inspections"`);
        await queryRunner.query(`DROP FUNCTION kw_count_inspections()`);
        await queryRunner.query(`ALTER TABLE "inspection_failure_hours" DROP CONSTRAINT "FK_8814db1d69b457abfb391ab515c"`);
        await queryRunner.query(`ALTER TABLE "inspection_failure_hours" DROP CONSTRAINT "FK_b607e7d92ab1f3a4bf94cd1fd70"`);
        await queryRunner.query(`ALTER TABLE "inspection_failure_hours" DROP CONSTRAINT "FK_8ba94d3afa90bc3081f487663fe"`);
        await queryRunner.query(`ALTER TABLE "inspection_hours" DROP CONSTRAINT "FK_e2758c46cc05780428def35504f"`);
        await queryRunner.query(`ALTER TABLE "inspection_hours" DROP CONSTRAINT "FK_93ebab565bf8c1b743f5b8cffba"`);
        await queryRunner.query(`ALTER TABLE "inspection_hours" DROP CONSTRAINT "FK_cdd82e32cf1f1543e1d059591a1"`);
        await queryRunner.query(`ALTER TABLE "repeatability_photos" DROP CONSTRAINT "FK_25e0be362fe22bd6ea1f6bbc853"`);
        await queryRunner.query(`ALTER TABLE "repeatability_studies" DROP CONSTRAINT "FK_5be8f3b729b1334d84c92c6a29c"`);
        await queryRunner.query(`ALTER TABLE "repeatability_studies" DROP CONSTRAINT "FK_68e4942f846d8c0490c32fabeee"`);
        await queryRunner.query(`ALTER TABLE "repeatability_studies" DROP CONSTRAINT "FK_dc6f32eef97523f370be494efbf"`);
        await queryRunner.query(`ALTER TABLE "alert_subscriptions" DROP CONSTRAINT "FK_f1ab5e4a7a07ebe3e8d2217cefa"`);
        await queryRunner.query(`ALTER TABLE "alert_limits" DROP CONSTRAINT "FK_a1c419e087981ba003fedc3ee20"`);
        await queryRunner.query(`ALTER TABLE "alert_limits" DROP CONSTRAINT "FK_bf16f22bbee6ddf53b3e940500f"`);
        await queryRunner.query(`ALTER TABLE "alert_limits" DROP CONSTRAINT "FK_e46af45e9a0858cf7339e094235"`);
        await queryRunner.query(`ALTER TABLE "alerts" DROP CONSTRAINT "FK_70e5404e97a308f93a591991dbd"`);
        await queryRunner.query(`ALTER TABLE "alerts" DROP CONSTRAINT "FK_18d3f17a656917713f338855504"`);
        await queryRunner.query(`ALTER TABLE "alerts" DROP CONSTRAINT "FK_a03c8afb3e29b85c8feccd730ef"`);
        await queryRunner.query(`DROP TABLE "inspection_failure_hours"`);
        await queryRunner.query(`DROP TABLE "inspection_hours"`);
        await queryRunner.query(`DROP TABLE "repeatability_photos"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_repeatability_studies_created"`);
        await queryRunner.query(`DROP TABLE "repeatability_studies"`);
        await queryRunner.query(`DROP TABLE "alert_subscriptions"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_alert_limits_rule"`);
        await queryRunner.query(`DROP TABLE "alert_limits"`);
        await queryRunner.query(`DROP INDEX "public"."UQ_alerts_signal"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_alerts_created"`);
        await queryRunner.query(`DROP TABLE "alerts"`);
    }

}
