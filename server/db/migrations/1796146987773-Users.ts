import { MigrationInterface, QueryRunner } from "typeorm";

export class Users1796146987773 implements MigrationInterface {
    name = 'Users1796146987773'

    public async up(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`CREATE TABLE "users" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "username" character varying(40) NOT NULL, "display_name" character varying(80) NOT NULL, "email" character varying(200), "password_hash" character varying(100) NOT NULL, "roles" text array NOT NULL, "active" boolean NOT NULL DEFAULT true, "token_version" integer NOT NULL DEFAULT '0', "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), "updated_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), CONSTRAINT "UQ_fe0bb3f6520ee0469504521e710" UNIQUE ("username"), CONSTRAINT "CHK_users_roles" CHECK (cardinality(roles) > 0 AND roles <@ ARRAY['engineer','operator','supervisor','auditor','admin']::text[]), CONSTRAINT "PK_a3ffb1c0c8416b9fc6f907b7433" PRIMARY KEY ("id"))`);
    }

    public async down(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`DROP TABLE "users"`);
    }

}
