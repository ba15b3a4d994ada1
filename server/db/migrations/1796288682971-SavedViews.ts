import type { MigrationInterface, QueryRunner } from 'typeorm';

export class SavedViews1796288682971 implements MigrationInterface {
  name = 'SavedViews1796288682971';

  public async up(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(
      `CREATE TABLE \`saved_views\` (\`id\` uuid NOT NULL, \`user_id\` uuid NOT NULL, \`name\` varchar(80) NOT NULL, \`filters\` json NOT NULL, \`created_at\` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3), UNIQUE INDEX \`uq_saved_views_user_name\` (\`user_id\`, \`name\`), PRIMARY KEY (\`id\`)) ENGINE=InnoDB`,
    );
    await queryRunner.query(
      `ALTER TABLE \`saved_views\` ADD CONSTRAINT \`FK_5ef69747737eae659eb1dd15aac\` FOREIGN KEY (\`user_id\`) REFERENCES \`users\`(\`id\`) ON DELETE CASCADE ON UPDATE NO ACTION`,
    );
  }

  public async down(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(
      `ALTER TABLE \`saved_views\` DROP FOREIGN KEY \`FK_5ef69747737eae659eb1dd15aac\``,
    );
    await queryRunner.query(`DROP INDEX \`uq_saved_views_user_name\` ON \`saved_views\``);
    await queryRunner.query(`DROP TABLE \`saved_views\``);
  }
}
