import type { MigrationInterface, QueryRunner } from 'typeorm';

// The installations list filtered by location (damp, wet, dry) and sorted by install date: with only the
// (organisation, install date) index, its count read the whole table and its page every row of the
// organisation's until fifty matched. Measured with npm run bench (installations list, README).
export class InstallationLocationIndexes1796300000000 implements MigrationInterface {
  name = 'InstallationLocationIndexes1796300000000';

  public async up(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(
      'CREATE INDEX `ix_installations_mfr_location_date` ON `installations` (`manufacturer_id`, `location`, `install_date`)',
    );
    await queryRunner.query(
      'CREATE INDEX `ix_installations_contractor_location_date` ON `installations` (`contractor_id`, `location`, `install_date`)',
    );
  }

  public async down(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query('DROP INDEX `ix_installations_contractor_location_date` ON `installations`');
    await queryRunner.query('DROP INDEX `ix_installations_mfr_location_date` ON `installations`');
  }
}
