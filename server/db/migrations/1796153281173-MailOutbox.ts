import { MigrationInterface, QueryRunner } from "typeorm";

export class MailOutbox1796153281173 implements MigrationInterface {
    name = 'MailOutbox1796153281173'

    public async up(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`CREATE TABLE "outbox_messages" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "recipients" text array NOT NULL, "subject" character varying(300) NOT NULL, "body" text NOT NULL, "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), "next_attempt_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), "attempts" integer NOT NULL DEFAULT '0', "last_error" character varying(1000), "sent_at" TIMESTAMP WITH TIME ZONE, CONSTRAINT "PK_0171348f527c64b137e4d4f5b66" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE INDEX "IDX_outbox_pending" ON "outbox_messages"  ("sent_at", "next_attempt_at") `);
    }

    public async down(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`DROP INDEX "public"."IDX_outbox_pending"`);
        await queryRunner.query(`DROP TABLE "outbox_messages"`);
    }

}
