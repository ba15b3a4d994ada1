import type { MigrationInterface, QueryRunner } from 'typeorm';

export class PasswordResets1796285107025 implements MigrationInterface {
  name = 'PasswordResets1796285107025';

  public async up(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(
      `CREATE TABLE \`password_reset_requests\` (\`id\` bigint UNSIGNED NOT NULL AUTO_INCREMENT, \`email\` varchar(254) NOT NULL, \`ip\` varchar(64) NOT NULL, \`requested_at\` datetime(3) NOT NULL, INDEX \`ix_password_reset_requests_at\` (\`requested_at\`), INDEX \`ix_password_reset_requests_ip\` (\`ip\`, \`requested_at\`), INDEX \`ix_password_reset_requests_email\` (\`email\`, \`requested_at\`), PRIMARY KEY (\`id\`)) ENGINE=InnoDB`,
    );
    await queryRunner.query(
      `CREATE TABLE \`password_resets\` (\`id\` uuid NOT NULL, \`user_id\` uuid NOT NULL, \`token_hash\` char(64) NOT NULL, \`expires_at\` datetime(3) NOT NULL, \`used_at\` datetime(3) NULL, \`created_at\` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3), UNIQUE INDEX \`uq_password_resets_token_hash\` (\`token_hash\`), PRIMARY KEY (\`id\`)) ENGINE=InnoDB`,
    );
    await queryRunner.query(
      `ALTER TABLE \`password_resets\` ADD CONSTRAINT \`FK_f7a4c3bc48f24df007936d217be\` FOREIGN KEY (\`user_id\`) REFERENCES \`users\`(\`id\`) ON DELETE CASCADE ON UPDATE NO ACTION`,
    );
  }

  public async down(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(
      `ALTER TABLE \`password_resets\` DROP FOREIGN KEY \`FK_f7a4c3bc48f24df007936d217be\``,
    );
    await queryRunner.query(`DROP INDEX \`uq_password_resets_token_hash\` ON \`password_resets\``);
    await queryRunner.query(`DROP TABLE \`password_resets\``);
    await queryRunner.query(`DROP INDEX \`ix_password_reset_requests_email\` ON \`password_reset_requests\``);
    await queryRunner.query(`DROP INDEX \`ix_password_reset_requests_ip\` ON \`password_reset_requests\``);
    await queryRunner.query(`DROP INDEX \`ix_password_reset_requests_at\` ON \`password_reset_requests\``);
    await queryRunner.query(`DROP TABLE \`password_reset_requests\``);
  }
}
