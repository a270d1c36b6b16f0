import type { MigrationInterface, QueryRunner } from 'typeorm';

/** The columns of inspections in their order; both directions copy the rows through them. */
const COLUMNS = `"id", "idempotency_key", "rule_version_id", "rule_id", "station_id", "line_id", "part_type", "operator_id", "image_hash", "evidence_hash", "verdict", "cause", "quality", "mm_per_px", "duration_ms", "created_at"`;

const COLUMN_DEFINITIONS = `"id" uuid NOT NULL DEFAULT gen_random_uuid(), "idempotency_key" character varying(80) NOT NULL, "rule_version_id" uuid NOT NULL, "rule_id" uuid NOT NULL, "station_id" uuid NOT NULL, "line_id" uuid NOT NULL, "part_type" character varying(40) NOT NULL, "operator_id" uuid NOT NULL, "image_hash" character(64) NOT NULL, "evidence_hash" character(64), "verdict" character varying(8) NOT NULL, "cause" character varying(120), "quality" jsonb NOT NULL, "mm_per_px" double precision, "duration_ms" double precision NOT NULL, "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), CONSTRAINT "CHK_inspections_verdict" CHECK (verdict IN ('PASS','FAIL','RETAKE'))`;

/** The indexes of the records list, the trends and the alert check (migrations PlantRulesInspections and RecordFilterIndexes). */
const TIME_INDEXES = [
  `CREATE INDEX "IDX_inspections_created_at" ON "inspections" ("created_at")`,
  `CREATE INDEX "IDX_inspections_station_created" ON "inspections" ("station_id", "created_at")`,
  `CREATE INDEX "IDX_inspections_version_created" ON "inspections" ("rule_version_id", "created_at")`,
  `CREATE INDEX "IDX_inspections_rule_created" ON "inspections" ("rule_id", "created_at")`,
  `CREATE INDEX "IDX_inspections_operator_created" ON "inspections" ("operator_id", "created_at")`,
  `CREATE INDEX "IDX_inspections_verdict_created" ON "inspections" ("verdict", "created_at")`,
  `CREATE INDEX "IDX_inspections_cause_created" ON "inspections" ("cause", "created_at") WHERE cause IS NOT NULL`,
];

const OWN_FOREIGN_KEYS = [
  `ALTER TABLE "inspections" ADD CONSTRAINT "FK_d931b05c277fbe27dbefdbfa205" FOREIGN KEY ("rule_version_id") REFERENCES "rule_versions"("id") ON DELETE RESTRICT ON UPDATE NO ACTION`,
  `ALTER TABLE "inspections" ADD CONSTRAINT "FK_15b8a18b96010462cb0eb1ed68a" FOREIGN KEY ("station_id") REFERENCES "stations"("id") ON DELETE RESTRICT ON UPDATE NO ACTION`,
  `ALTER TABLE "inspections" ADD CONSTRAINT "FK_fc7bfd9cf03203fadaad717a2c3" FOREIGN KEY ("operator_id") REFERENCES "users"("id") ON DELETE RESTRICT ON UPDATE NO ACTION`,
];

/** Foreign keys of measurements and disputes before (by id) and after (by id and month key). */
const REFERENCES = [
  { table: 'measurements', before: 'FK_0ef9020e3ac1df2c57202029410', after: 'FK_d020b2d0f43153a34483654cb87' },
  { table: 'disputes', before: 'FK_bfa92e8460dba6b9ab8c16b7131', after: 'FK_bf56baf957751a3b89ece9cde5b' },
];

/**
 * Inspections partitioned by month of created_at (UTC), one partition per month named
 * inspections_yYYYYmMM plus inspections_default, so that a date-ranged read touches only its months
 * and a month can later be archived whole. PostgreSQL's rules for partitioned tables shape the rest:
 * - every unique constraint must contain the partition key, so the key is (id, created_at), and the
 *   two keys that must stay unique across months (idempotency key, id) live in the unpartitioned
 *   table inspection_keys, filled by a statement trigger of the root;
 * - measurements and disputes refer to an inspection by (inspection_id, inspection_created_at); a
 *   row trigger fills inspection_created_at when a writer leaves it out;
 * - statement triggers are not cloned to partitions: the hourly counts and the keys are kept by the
 *   root's, so each partition refuses a direct INSERT (and TRUNCATE) with a trigger of its own;
 * - kw_ensure_inspection_month(month) adds a month's partition (server/components/inspections/partitions.ts
 *   runs it ahead of time) and moves out of DEFAULT any rows of that month that landed there.
 */
export class PartitionInspectionsByMonth1796169997481 implements MigrationInterface {
  name = 'PartitionInspectionsByMonth1796169997481';

  public async up(queryRunner: QueryRunner): Promise<void> {
    const q = (sql: string) => queryRunner.query(sql);
    await q(`LOCK TABLE "inspections", "measurements", "disputes" IN ACCESS EXCLUSIVE MODE`);
    await q(`ALTER TABLE "inspections" RENAME TO "inspections_unpartitioned"`);
    await q(`CREATE TABLE "inspections" (${COLUMN_DEFINITIONS}) PARTITION BY RANGE ("created_at")`);
    await q(`CREATE TABLE "inspections_default" PARTITION OF "inspections" DEFAULT`);
    await q(`CREATE FUNCTION kw_refuse_direct_partition_insert() RETURNS trigger LANGUAGE plpgsql AS $$
        BEGIN
          RAISE EXCEPTION 'insert into inspections, not into its partition %: the root''s triggers keep the hourly counts and the keys', TG_TABLE_NAME
            USING ERRCODE = 'wrong_object_type';
        END $$`);
    await q(ENSURE_MONTH_FUNCTION);
    await q(`CREATE TRIGGER "inspections_default_through_root" BEFORE INSERT ON "inspections_default" FOR EACH STATEMENT EXECUTE FUNCTION kw_refuse_direct_partition_insert()`);
    await q(`CREATE TRIGGER "inspections_default_no_truncate" BEFORE TRUNCATE ON "inspections_default" FOR EACH STATEMENT EXECUTE FUNCTION kw_refuse_change()`);
    // A partition for every month that has inspections, and for this month and the next two (UTC).
    await q(`SELECT kw_ensure_inspection_month(m) FROM (
        SELECT DISTINCT date_trunc('month', created_at, 'UTC') AS m FROM "inspections_unpartitioned"
        UNION SELECT (date_trunc('month', now() AT TIME ZONE 'UTC') + k * interval '1 month') AT TIME ZONE 'UTC' FROM generate_series(0, 2) k) months ORDER BY m`);
    // The rows move as they are; their hours are counted already, so the root's triggers come afterwards.
    await q(`INSERT INTO "inspections" (${COLUMNS}) SELECT ${COLUMNS} FROM "inspections_unpartitioned"`);

    for (const { table } of REFERENCES) await q(`ALTER TABLE "${table}" ADD "inspection_created_at" TIMESTAMP WITH TIME ZONE`);
    // Measurements are append-only; this one fill of the new column is the migration's, under its lock.
    await q(`ALTER TABLE "measurements" DISABLE TRIGGER "measurements_append_only"`);
    for (const { table } of REFERENCES)
      await q(`UPDATE "${table}" r SET "inspection_created_at" = i."created_at" FROM "inspections_unpartitioned" i WHERE i."id" = r."inspection_id"`);
    await q(`ALTER TABLE "measurements" ENABLE TRIGGER "measurements_append_only"`);
    for (const { table, before } of REFERENCES) {
      await q(`ALTER TABLE "${table}" ALTER COLUMN "inspection_created_at" SET NOT NULL`);
      await q(`ALTER TABLE "${table}" DROP CONSTRAINT "${before}"`);
    }
    await q(`DROP TABLE "inspections_unpartitioned"`);

    await q(`ALTER TABLE "inspections" ADD CONSTRAINT "PK_3c8c95aaf847cdc562f3a99491c" PRIMARY KEY ("id", "created_at")`);
    for (const sql of TIME_INDEXES) await q(sql);
    await q(`CREATE INDEX "IDX_inspections_idempotency_key" ON "inspections" ("idempotency_key")`);
    for (const sql of OWN_FOREIGN_KEYS) await q(sql);

    // The keys that must stay unique across every month, one row per inspection.
    await q(`CREATE TABLE "inspection_keys" ("idempotency_key" character varying(80) NOT NULL, "inspection_id" uuid NOT NULL, "inspection_created_at" TIMESTAMP WITH TIME ZONE NOT NULL,
        CONSTRAINT "PK_inspection_keys" PRIMARY KEY ("idempotency_key"), CONSTRAINT "UQ_inspection_keys_inspection" UNIQUE ("inspection_id"),
        CONSTRAINT "FK_inspection_keys_inspection" FOREIGN KEY ("inspection_id", "inspection_created_at") REFERENCES "inspections"("id", "created_at") ON DELETE RESTRICT ON UPDATE NO ACTION)`);
    await q(`INSERT INTO "inspection_keys" ("idempotency_key", "inspection_id", "inspection_created_at") SELECT "idempotency_key", "id", "created_at" FROM "inspections"`);
    await q(`CREATE FUNCTION kw_keep_inspection_keys() RETURNS trigger LANGUAGE plpgsql AS $$
        BEGIN
          INSERT INTO inspection_keys (idempotency_key, inspection_id, inspection_created_at) SELECT idempotency_key, id, created_at FROM added;
          RETURN NULL;
        END $$`);
    for (const { table, after } of REFERENCES)
      await q(`ALTER TABLE "${table}" ADD CONSTRAINT "${after}" FOREIGN KEY ("inspection_id", "inspection_created_at") REFERENCES "inspections"("id","created_at") ON DELETE RESTRICT ON UPDATE NO ACTION`);
    // A writer that knows only the inspection's id (hand-written SQL, an older client) still stores a valid row.
    // It reads inspections itself, not inspection_keys: an inspection stored earlier in the same statement
    // (a WITH ... INSERT) is seen there, while its key only arrives with the root's statement trigger.
    await q(`CREATE FUNCTION kw_fill_inspection_created_at() RETURNS trigger LANGUAGE plpgsql AS $$
        BEGIN
          IF NEW.inspection_created_at IS NULL THEN
            SELECT created_at INTO NEW.inspection_created_at FROM inspections WHERE id = NEW.inspection_id;
            IF NOT FOUND THEN
              RAISE EXCEPTION 'insert on table % violates foreign key: inspection % does not exist', TG_TABLE_NAME, NEW.inspection_id
                USING ERRCODE = 'foreign_key_violation';
            END IF;
          END IF;
          RETURN NEW;
        END $$`);
    for (const { table } of REFERENCES)
      await q(`CREATE TRIGGER "${table}_inspection_created_at" BEFORE INSERT ON "${table}" FOR EACH ROW EXECUTE FUNCTION kw_fill_inspection_created_at()`);

    // Row triggers on the root are cloned to every partition; statement triggers fire for statements on the root.
    for (const table of ['inspections', 'inspection_keys']) {
      await q(`CREATE TRIGGER "${table}_append_only" BEFORE UPDATE OR DELETE ON "${table}" FOR EACH ROW EXECUTE FUNCTION kw_refuse_change()`);
      await q(`CREATE TRIGGER "${table}_no_truncate" BEFORE TRUNCATE ON "${table}" FOR EACH STATEMENT EXECUTE FUNCTION kw_refuse_change()`);
    }
    await q(`CREATE TRIGGER "inspections_count_hours" AFTER INSERT ON "inspections" REFERENCING NEW TABLE AS added FOR EACH STATEMENT EXECUTE FUNCTION kw_count_inspections()`);
    await q(`CREATE TRIGGER "inspections_keep_keys" AFTER INSERT ON "inspections" REFERENCING NEW TABLE AS added FOR EACH STATEMENT EXECUTE FUNCTION kw_keep_inspection_keys()`);
  }

  public async down(queryRunner: QueryRunner): Promise<void> {
    const q = (sql: string) => queryRunner.query(sql);
    await q(`LOCK TABLE "inspections", "measurements", "disputes" IN ACCESS EXCLUSIVE MODE`);
    for (const { table, after } of REFERENCES) {
      await q(`DROP TRIGGER "${table}_inspection_created_at" ON "${table}"`);
      await q(`ALTER TABLE "${table}" DROP CONSTRAINT "${after}"`);
    }
    await q(`DROP FUNCTION kw_fill_inspection_created_at()`);
    await q(`DROP TABLE "inspection_keys"`);

    // The partitioned table steps aside (its index names free) while the plain table is rebuilt.
    await q(`ALTER TABLE "inspections" RENAME TO "inspections_partitioned"`);
    for (const index of ['created_at', 'station_created', 'version_created', 'rule_created', 'operator_created', 'verdict_created', 'cause_created', 'idempotency_key'])
      await q(`DROP INDEX "IDX_inspections_${index}"`);
    await q(`CREATE TABLE "inspections" (${COLUMN_DEFINITIONS}, CONSTRAINT "UQ_dbc0dee7821137daa40e2bf28ff" UNIQUE ("idempotency_key"), CONSTRAINT "PK_a484980015782324454d8c88abe" PRIMARY KEY ("id"))`);
    await q(`INSERT INTO "inspections" (${COLUMNS}) SELECT ${COLUMNS} FROM "inspections_partitioned"`);
    await q(`DROP TABLE "inspections_partitioned"`);
    await q(`DROP FUNCTION kw_ensure_inspection_month(timestamptz)`);
    await q(`DROP FUNCTION kw_refuse_direct_partition_insert()`);
    await q(`DROP FUNCTION kw_keep_inspection_keys()`);
    for (const sql of TIME_INDEXES) await q(sql);
    for (const sql of OWN_FOREIGN_KEYS) await q(sql);
    for (const { table, before } of REFERENCES) {
      await q(`ALTER TABLE "${table}" DROP COLUMN "inspection_created_at"`);
      await q(`ALTER TABLE "${table}" ADD CONSTRAINT "${before}" FOREIGN KEY ("inspection_id") REFERENCES "inspections"("id") ON DELETE RESTRICT ON UPDATE NO ACTION`);
    }
    await q(`CREATE TRIGGER "inspections_append_only" BEFORE UPDATE OR DELETE ON "inspections" FOR EACH ROW EXECUTE FUNCTION kw_refuse_change()`);
    await q(`CREATE TRIGGER "inspections_no_truncate" BEFORE TRUNCATE ON "inspections" FOR EACH STATEMENT EXECUTE FUNCTION kw_refuse_change()`);
    await q(`CREATE TRIGGER "inspections_count_hours" AFTER INSERT ON "inspections" REFERENCING NEW TABLE AS added FOR EACH STATEMENT EXECUTE FUNCTION kw_count_inspections()`);
  }
}

/**
 * Adds the partition of the month (UTC) that contains `for_month`, if it is missing, and returns its
 * name. PostgreSQL refuses a new partition while DEFAULT holds rows of its range, and refuses to
 * detach a partition (or delete rows) that foreign keys still reference. So when rows of the month
 * sit in DEFAULT, the foreign keys that reference inspections step aside, DEFAULT is detached, the
 * partition created, the rows moved into it, DEFAULT attached again (the recipe of PostgreSQL's
 * "Partition Maintenance" section), and the foreign keys come back NOT VALID: they hold for every new
 * row at once, and partitions.ts validates the existing rows afterwards, outside this lock.
 * One caller at a time (advisory lock); lock_timeout makes it give way to a busy table rather than
 * queue every insert behind its lock: the daily job tries again.
 */
const ENSURE_MONTH_FUNCTION = `CREATE FUNCTION kw_ensure_inspection_month(for_month timestamptz) RETURNS text LANGUAGE plpgsql
    SET lock_timeout = '10s' AS $$
    DECLARE
      first_day timestamp := date_trunc('month', for_month AT TIME ZONE 'UTC');
      lo timestamptz := first_day AT TIME ZONE 'UTC';
      hi timestamptz := (first_day + interval '1 month') AT TIME ZONE 'UTC';
      partition_name text := format('inspections_y%sm%s', to_char(first_day, 'YYYY'), to_char(first_day, 'MM'));
      bounds text := format('FOR VALUES FROM (%L) TO (%L)', to_char(first_day, 'YYYY-MM-DD "00:00:00+00"'), to_char(first_day + interval '1 month', 'YYYY-MM-DD "00:00:00+00"'));
      ref record;
      restore_refs text[] := '{}';
      statement text;
    BEGIN
      PERFORM pg_advisory_xact_lock(hashtext('kernwright.inspection_partitions'));
      IF to_regclass(quote_ident(partition_name)) IS NOT NULL THEN
        RETURN partition_name;
      END IF;
      LOCK TABLE inspections IN ACCESS EXCLUSIVE MODE;
      IF NOT EXISTS (SELECT 1 FROM inspections_default WHERE created_at >= lo AND created_at < hi) THEN
        EXECUTE format('CREATE TABLE %I PARTITION OF inspections %s', partition_name, bounds);
      ELSE
        FOR ref IN SELECT c.conrelid::regclass AS referencing, c.conname, pg_get_constraintdef(c.oid) AS definition
                   FROM pg_constraint c WHERE c.confrelid = 'inspections'::regclass AND c.contype = 'f' AND c.conparentid = 0 ORDER BY 1, 2 LOOP
          EXECUTE format('ALTER TABLE %s DROP CONSTRAINT %I', ref.referencing, ref.conname);
          restore_refs := restore_refs || format('ALTER TABLE %s ADD CONSTRAINT %I %s NOT VALID', ref.referencing, ref.conname, ref.definition);
        END LOOP;
        ALTER TABLE inspections DETACH PARTITION inspections_default;
        EXECUTE format('CREATE TABLE %I PARTITION OF inspections %s', partition_name, bounds);
        -- Straight into the partition: the rows were counted and keyed when they first came in.
        EXECUTE format('WITH moved AS (DELETE FROM inspections_default WHERE created_at >= $1 AND created_at < $2 RETURNING *) INSERT INTO %I SELECT * FROM moved', partition_name) USING lo, hi;
        ALTER TABLE inspections ATTACH PARTITION inspections_default DEFAULT;
        FOREACH statement IN ARRAY restore_refs LOOP
          EXECUTE statement;
        END LOOP;
      END IF;
      EXECUTE format('CREATE TRIGGER %I BEFORE INSERT ON %I FOR EACH STATEMENT EXECUTE FUNCTION kw_refuse_direct_partition_insert()', partition_name || '_through_root', partition_name);
      EXECUTE format('CREATE TRIGGER %I BEFORE TRUNCATE ON %I FOR EACH STATEMENT EXECUTE FUNCTION kw_refuse_change()', partition_name || '_no_truncate', partition_name);
      RETURN partition_name;
    END $$`;
