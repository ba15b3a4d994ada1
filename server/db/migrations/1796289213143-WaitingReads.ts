import type { MigrationInterface, QueryRunner } from 'typeorm';

export class WaitingReads1796289213143 implements MigrationInterface {
  name = 'WaitingReads1796289213143';

  public async up(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(
      `CREATE TABLE \`waiting_reads\` (\`user_id\` uuid NOT NULL, \`item_key\` varchar(120) NOT NULL, \`read_at\` datetime(3) NOT NULL, PRIMARY KEY (\`user_id\`, \`item_key\`)) ENGINE=InnoDB`,
    );
    await queryRunner.query(
      `ALTER TABLE \`waiting_reads\` ADD CONSTRAINT \`FK_6f3499dedb72e0b64a8dba33b7f\` FOREIGN KEY (\`user_id\`) REFERENCES \`users\`(\`id\`) ON DELETE CASCADE ON UPDATE NO ACTION`,
    );
  }

  public async down(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(
      `ALTER TABLE \`waiting_reads\` DROP FOREIGN KEY \`FK_6f3499dedb72e0b64a8dba33b7f\``,
    );
    await queryRunner.query(`DROP TABLE \`waiting_reads\``);
  }
}
