import type { MigrationInterface, QueryRunner } from 'typeorm';

// The date code (manufacturing lot) on an installation's units, for the reliability analytics by lot.
export class InstallationLot1796167600000 implements MigrationInterface {
  name = 'InstallationLot1796167600000';

  public async up(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(`ALTER TABLE \`installations\` ADD \`lot\` varchar(32) NULL`);
    await queryRunner.query(
      `CREATE INDEX \`ix_installations_mfr_lot\` ON \`installations\` (\`manufacturer_id\`, \`lot\`)`,
    );
  }

  public async down(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(`DROP INDEX \`ix_installations_mfr_lot\` ON \`installations\``);
    await queryRunner.query(`ALTER TABLE \`installations\` DROP COLUMN \`lot\``);
  }
}
