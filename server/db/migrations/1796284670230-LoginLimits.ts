import type { MigrationInterface, QueryRunner } from 'typeorm';

// Sign-in limits move from counted login_attempts rows (read, then written after the password check: parallel
// guesses all read the same count) to rate-limiter-flexible's atomic counters, spent before the check.
export class LoginLimits1796284670230 implements MigrationInterface {
  name = 'LoginLimits1796284670230';

  public async up(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(
      `CREATE TABLE \`login_limits\` (\`key\` varchar(400) NOT NULL, \`points\` int NOT NULL DEFAULT '0', \`expire\` bigint UNSIGNED NULL, PRIMARY KEY (\`key\`)) ENGINE=InnoDB`,
    );
    await queryRunner.query(`DROP INDEX \`ix_login_attempts_email\` ON \`login_attempts\``);
    await queryRunner.query(`DROP INDEX \`ix_login_attempts_ip\` ON \`login_attempts\``);
    await queryRunner.query(`DROP TABLE \`login_attempts\``);
  }

  public async down(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(
      `CREATE TABLE \`login_attempts\` (\`id\` bigint UNSIGNED NOT NULL AUTO_INCREMENT, \`email\` varchar(254) NOT NULL, \`ip\` varchar(64) NOT NULL, \`attempted_at\` datetime(3) NOT NULL, INDEX \`ix_login_attempts_ip\` (\`ip\`, \`attempted_at\`), INDEX \`ix_login_attempts_email\` (\`email\`, \`attempted_at\`), PRIMARY KEY (\`id\`)) ENGINE=InnoDB`,
    );
    await queryRunner.query(`DROP TABLE \`login_limits\``);
  }
}
