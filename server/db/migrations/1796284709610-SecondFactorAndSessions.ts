import type { MigrationInterface, QueryRunner } from 'typeorm';

// Generated; the last statements are by hand: the sessions table (no entity) gets its signed-in user as an indexed
// virtual column, so that one person's sessions are listed and ended without reading every session's JSON.
export class SecondFactorAndSessions1796284709610 implements MigrationInterface {
  name = 'SecondFactorAndSessions1796284709610';

  public async up(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(
      `CREATE TABLE \`recovery_codes\` (\`id\` uuid NOT NULL, \`user_id\` uuid NOT NULL, \`code_hash\` char(64) NOT NULL, \`used_at\` datetime(3) NULL, \`created_at\` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3), UNIQUE INDEX \`uq_recovery_codes_user_hash\` (\`user_id\`, \`code_hash\`), PRIMARY KEY (\`id\`)) ENGINE=InnoDB`,
    );
    await queryRunner.query(
      `CREATE TABLE \`sign_in_challenges\` (\`id\` uuid NOT NULL, \`user_id\` uuid NOT NULL, \`attempts\` int UNSIGNED NOT NULL DEFAULT '0', \`expires_at\` datetime(3) NOT NULL, \`created_at\` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3), INDEX \`ix_sign_in_challenges_user\` (\`user_id\`), PRIMARY KEY (\`id\`)) ENGINE=InnoDB`,
    );
    await queryRunner.query(
      `ALTER TABLE \`organizations\` ADD \`require_second_factor\` tinyint NOT NULL DEFAULT 0`,
    );
    await queryRunner.query(`ALTER TABLE \`users\` ADD \`totp_secret\` varchar(64) NULL`);
    await queryRunner.query(`ALTER TABLE \`users\` ADD \`totp_confirmed_at\` datetime(3) NULL`);
    await queryRunner.query(`ALTER TABLE \`users\` ADD \`totp_last_step\` int UNSIGNED NULL`);
    await queryRunner.query(
      `ALTER TABLE \`sessions\` ADD \`user_id\` varchar(36) CHARACTER SET ascii COLLATE ascii_bin AS (JSON_VALUE(\`data\`, '$.passport.user')) VIRTUAL, ADD INDEX \`ix_sessions_user\` (\`user_id\`)`,
    );
  }

  public async down(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(
      `ALTER TABLE \`sessions\` DROP INDEX \`ix_sessions_user\`, DROP COLUMN \`user_id\``,
    );
    await queryRunner.query(`ALTER TABLE \`users\` DROP COLUMN \`totp_last_step\``);
    await queryRunner.query(`ALTER TABLE \`users\` DROP COLUMN \`totp_confirmed_at\``);
    await queryRunner.query(`ALTER TABLE \`users\` DROP COLUMN \`totp_secret\``);
    await queryRunner.query(`ALTER TABLE \`organizations\` DROP COLUMN \`require_second_factor\``);
    await queryRunner.query(`DROP INDEX \`ix_sign_in_challenges_user\` ON \`sign_in_challenges\``);
    await queryRunner.query(`DROP TABLE \`sign_in_challenges\``);
    await queryRunner.query(`DROP INDEX \`uq_recovery_codes_user_hash\` ON \`recovery_codes\``);
    await queryRunner.query(`DROP TABLE \`recovery_codes\``);
  }
}
