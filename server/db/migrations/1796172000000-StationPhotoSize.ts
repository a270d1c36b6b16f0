import { MigrationInterface, QueryRunner } from "typeorm";

export class StationPhotoSize1796172000000 implements MigrationInterface {
    name = 'StationPhotoSize1796172000000'

    public async up(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`ALTER TABLE "stations" ADD "photo_width_px" integer`);
        await queryRunner.query(`ALTER TABLE "stations" ADD "photo_height_px" integer`);
        await queryRunner.query(`ALTER TABLE "stations" ADD CONSTRAINT "CHK_stations_photo_size" CHECK ((photo_width_px IS NULL) = (photo_height_px IS NULL) AND (photo_width_px IS NULL OR (photo_width_px > 0 AND photo_height_px > 0)))`);
    }

    public async down(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`ALTER TABLE "stations" DROP CONSTRAINT "CHK_stations_photo_size"`);
        await queryRunner.query(`ALTER TABLE "stations" DROP COLUMN "photo_height_px"`);
        await queryRunner.query(`ALTER TABLE "stations" DROP COLUMN "photo_width_px"`);
    }

}
