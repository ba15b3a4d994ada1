import type { MigrationInterface, QueryRunner } from 'typeorm';

// API tokens (server/modules/api-tokens), and the table rate-limiter-flexible counts each token's requests in:
// its own layout (it inserts positionally: key, points, expire in ms), made here so the app never runs DDL.
export class ApiTokens1796285274213 implements MigrationInterface {
  name = 'ApiTokens1796285274213';

  public async up(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(
      `CREATE TABLE \`api_tokens\` (\`id\` uuid NOT NULL, \`organization_id\` uuid NOT NULL, \`name\` varchar(100) NOT NULL, \`roles\` text NOT NULL, \`secret_hash\` char(64) NOT NULL, \`hint\` varchar(16) NOT NULL, \`created_by_id\` uuid NOT NULL, \`created_at\` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3), \`expires_at\` datetime(3) NOT NULL, \`last_used_at\` datetime(3) NULL, \`revoked_at\` datetime(3) NULL, \`revoked_by_id\` uuid NULL, INDEX \`ix_api_tokens_org\` (\`organization_id\`, \`created_at\`), PRIMARY KEY (\`id\`)) ENGINE=InnoDB`,
    );
    await queryRunner.query(
      `ALTER TABLE \`api_tokens\` ADD CONSTRAINT \`FK_82b1830617163ff0ea221d0b98b\` FOREIGN KEY (\`organization_id\`) REFERENCES \`organizations\`(\`id\`) ON DELETE RESTRICT ON UPDATE NO ACTION`,
    );
    await queryRunner.query(
      `ALTER TABLE \`api_tokens\` ADD CONSTRAINT \`FK_a17eb380a7c7622315c02725aff\` FOREIGN KEY (\`created_by_id\`) REFERENCES \`users\`(\`id\`) ON DELETE RESTRICT ON UPDATE NO ACTION`,
    );
    await queryRunner.query(
      'CREATE TABLE `api_token_rate_limits` (`key` varchar(255) CHARACTER SET ascii NOT NULL, `points` int NOT NULL DEFAULT 0, `expire` bigint UNSIGNED NULL, PRIMARY KEY (`key`)) ENGINE=InnoDB',
    );
  }

  public async down(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query('DROP TABLE `api_token_rate_limits`');
    await queryRunner.query(`ALTER TABLE \`api_tokens\` DROP FOREIGN KEY \`FK_a17eb380a7c7622315c02725aff\``);
    await queryRunner.query(`ALTER TABLE \`api_tokens\` DROP FOREIGN KEY \`FK_82b1830617163ff0ea221d0b98b\``);
    await queryRunner.query(`DROP INDEX \`ix_api_tokens_org\` ON \`api_tokens\``);
    await queryRunner.query(`DROP TABLE \`api_tokens\``);
  }
}
