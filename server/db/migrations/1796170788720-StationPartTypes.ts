import { MigrationInterface, QueryRunner } from "typeorm";

export class StationPartTypes1796170788720 implements MigrationInterface {
    name = 'StationPartTypes1796170788720'

    public async up(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`CREATE TABLE "station_part_types" ("station_id" uuid NOT NULL, "part_type" character varying(40) NOT NULL, CONSTRAINT "PK_725a30af176d68cd9ab035ed0c5" PRIMARY KEY ("station_id", "part_type"))`);
        await queryRunner.query(`ALTER TABLE "station_part_types" ADD CONSTRAINT "FK_22541ace53816a8b95d4918b9e9" FOREIGN KEY ("station_id") REFERENCES "stations"("id") ON DELETE CASCADE ON UPDATE NO ACTION`);
        await queryRunner.query(`ALTER TABLE "station_part_types" ADD CONSTRAINT "FK_06471c324d653881c61ae0327b3" FOREIGN KEY ("part_type") REFERENCES "part_types"("code") ON DELETE RESTRICT ON UPDATE NO ACTION`);
    }

    public async down(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`ALTER TABLE "station_part_types" DROP CONSTRAINT "FK_06471c324d653881c61ae0327b3"`);
        await queryRunner.query(`ALTER TABLE "station_part_types" DROP CONSTRAINT "FK_22541ace53816a8b95d4918b9e9"`);
        await queryRunner.query(`DROP TABLE "station_part_types"`);
    }

}
