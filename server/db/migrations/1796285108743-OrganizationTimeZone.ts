import type { MigrationInterface, QueryRunner } from 'typeorm';

// Each organisation's time zone and document locale: the one date rule (shared/dates.ts) shows every time in it.
export class OrganizationTimeZone1796285108743 implements MigrationInterface {
  name = 'OrganizationTimeZone1796285108743';

  public async up(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(
      `ALTER TABLE \`organizations\` ADD \`time_zone\` varchar(64) NOT NULL DEFAULT 'UTC'`,
    );
    await queryRunner.query(
      `ALTER TABLE \`organizations\` ADD \`locale\` varchar(35) NOT NULL DEFAULT 'en-US'`,
    );
  }

  public async down(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(`ALTER TABLE \`organizations\` DROP COLUMN \`locale\``);
    await queryRunner.query(`ALTER TABLE \`organizations\` DROP COLUMN \`time_zone\``);
  }
}
