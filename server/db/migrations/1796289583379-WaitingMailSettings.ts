import type { MigrationInterface, QueryRunner } from 'typeorm';

export class WaitingMailSettings1796289583379 implements MigrationInterface {
  name = 'WaitingMailSettings1796289583379';

  public async up(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(
      `CREATE TABLE \`waiting_mail_settings\` (\`user_id\` uuid NOT NULL, \`mode\` enum ('immediate', 'daily', 'none') NOT NULL DEFAULT 'daily', \`last_sent_at\` datetime(3) NULL, PRIMARY KEY (\`user_id\`)) ENGINE=InnoDB`,
    );
    await queryRunner.query(
      `ALTER TABLE \`waiting_mail_settings\` ADD CONSTRAINT \`FK_be0cb4b5346e751ddaa33e16b21\` FOREIGN KEY (\`user_id\`) REFERENCES \`users\`(\`id\`) ON DELETE CASCADE ON UPDATE NO ACTION`,
    );
  }

  public async down(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(
      `ALTER TABLE \`waiting_mail_settings\` DROP FOREIGN KEY \`FK_be0cb4b5346e751ddaa33e16b21\``,
    );
    await queryRunner.query(`DROP TABLE \`waiting_mail_settings\``);
  }
}
