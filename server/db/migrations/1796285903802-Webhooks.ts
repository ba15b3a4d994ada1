import type { MigrationInterface, QueryRunner } from 'typeorm';

export class Webhooks1796285903802 implements MigrationInterface {
  name = 'Webhooks1796285903802';

  public async up(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(
      `CREATE TABLE \`webhook_endpoints\` (\`id\` uuid NOT NULL, \`organization_id\` uuid NOT NULL, \`url\` varchar(2048) NOT NULL, \`events\` text NOT NULL, \`signing_secret\` varchar(80) NOT NULL, \`created_by_id\` uuid NOT NULL, \`created_at\` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3), \`disabled_at\` datetime(3) NULL, INDEX \`ix_webhook_endpoints_org\` (\`organization_id\`, \`created_at\`), PRIMARY KEY (\`id\`)) ENGINE=InnoDB`,
    );
    await queryRunner.query(
      `CREATE TABLE \`webhook_deliveries\` (\`id\` bigint UNSIGNED NOT NULL AUTO_INCREMENT, \`endpoint_id\` uuid NOT NULL, \`event_id\` uuid NOT NULL, \`event\` varchar(64) NOT NULL, \`body\` mediumtext NOT NULL, \`created_at\` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3), \`status\` enum ('pending', 'delivered', 'failed') NOT NULL DEFAULT 'pending', \`attempts\` int NOT NULL DEFAULT '0', \`next_attempt_at\` datetime(3) NOT NULL, \`last_status_code\` int NULL, \`last_error\` varchar(500) NULL, \`last_attempt_at\` datetime(3) NULL, \`delivered_at\` datetime(3) NULL, INDEX \`ix_webhook_deliveries_endpoint\` (\`endpoint_id\`, \`id\`), INDEX \`ix_webhook_deliveries_due\` (\`status\`, \`next_attempt_at\`), PRIMARY KEY (\`id\`)) ENGINE=InnoDB`,
    );
    await queryRunner.query(
      `ALTER TABLE \`webhook_endpoints\` ADD CONSTRAINT \`FK_893247a8681e31f117a34b4fb46\` FOREIGN KEY (\`organization_id\`) REFERENCES \`organizations\`(\`id\`) ON DELETE RESTRICT ON UPDATE NO ACTION`,
    );
    await queryRunner.query(
      `ALTER TABLE \`webhook_deliveries\` ADD CONSTRAINT \`FK_0b882c26a9b91c26e6e86b4867c\` FOREIGN KEY (\`endpoint_id\`) REFERENCES \`webhook_endpoints\`(\`id\`) ON DELETE CASCADE ON UPDATE NO ACTION`,
    );
  }

  public async down(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(
      `ALTER TABLE \`webhook_deliveries\` DROP FOREIGN KEY \`FK_0b882c26a9b91c26e6e86b4867c\``,
    );
    await queryRunner.query(
      `ALTER TABLE \`webhook_endpoints\` DROP FOREIGN KEY \`FK_893247a8681e31f117a34b4fb46\``,
    );
    await queryRunner.query(`DROP INDEX \`ix_webhook_deliveries_due\` ON \`webhook_deliveries\``);
    await queryRunner.query(`DROP INDEX \`ix_webhook_deliveries_endpoint\` ON \`webhook_deliveries\``);
    await queryRunner.query(`DROP TABLE \`webhook_deliveries\``);
    await queryRunner.query(`DROP INDEX \`ix_webhook_endpoints_org\` ON \`webhook_endpoints\``);
    await queryRunner.query(`DROP TABLE \`webhook_endpoints\``);
  }
}
