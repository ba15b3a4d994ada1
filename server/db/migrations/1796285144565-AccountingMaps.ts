import type { MigrationInterface, QueryRunner } from 'typeorm';

export class AccountingMaps1796285144565 implements MigrationInterface {
  name = 'AccountingMaps1796285144565';

  public async up(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(
      `CREATE TABLE \`accounting_maps\` (\`organization_id\` uuid NOT NULL, \`debit_account_code\` varchar(20) NOT NULL, \`debit_account_name\` varchar(100) NOT NULL, \`credit_account_code\` varchar(20) NOT NULL, \`credit_account_name\` varchar(100) NOT NULL, \`journal_code\` varchar(10) NOT NULL, \`updated_by_id\` uuid NULL, \`updated_at\` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3) ON UPDATE CURRENT_TIMESTAMP(3), PRIMARY KEY (\`organization_id\`)) ENGINE=InnoDB`,
    );
    await queryRunner.query(
      `ALTER TABLE \`accounting_maps\` ADD CONSTRAINT \`FK_d751edd093ce1fdbf6b54f450b8\` FOREIGN KEY (\`organization_id\`) REFERENCES \`organizations\`(\`id\`) ON DELETE CASCADE ON UPDATE NO ACTION`,
    );
  }

  public async down(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(
      `ALTER TABLE \`accounting_maps\` DROP FOREIGN KEY \`FK_d751edd093ce1fdbf6b54f450b8\``,
    );
    await queryRunner.query(`DROP TABLE \`accounting_maps\``);
  }
}
