import type { MigrationInterface, QueryRunner } from 'typeorm';

export class Foundation1796165467051 implements MigrationInterface {
  name = 'Foundation1796165467051';

  public async up(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(
      `CREATE TABLE \`audit_events\` (\`id\` bigint UNSIGNED NOT NULL AUTO_INCREMENT, \`occurred_at\` datetime(3) NOT NULL, \`actor_user_id\` uuid NULL, \`organization_id\` uuid NULL, \`action\` varchar(64) NOT NULL, \`entity_type\` varchar(40) NOT NULL, \`entity_id\` varchar(64) NOT NULL, \`before_state\` json NULL, \`after_state\` json NULL, \`request_id\` varchar(64) NULL, INDEX \`ix_audit_org_time\` (\`organization_id\`, \`occurred_at\`), INDEX \`ix_audit_entity\` (\`entity_type\`, \`entity_id\`, \`id\`), PRIMARY KEY (\`id\`)) ENGINE=InnoDB`,
    );
    await queryRunner.query(
      `CREATE TABLE \`organizations\` (\`id\` uuid NOT NULL, \`name\` varchar(160) NOT NULL, \`kind\` enum ('manufacturer', 'contractor') NOT NULL, \`created_at\` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(6), UNIQUE INDEX \`uq_organizations_name\` (\`name\`), PRIMARY KEY (\`id\`)) ENGINE=InnoDB`,
    );
    await queryRunner.query(
      `CREATE TABLE \`users\` (\`id\` uuid NOT NULL, \`organization_id\` uuid NOT NULL, \`email\` varchar(254) NOT NULL, \`name\` varchar(160) NOT NULL, \`password_hash\` varchar(255) NULL, \`roles\` text NOT NULL, \`status\` enum ('invited', 'active', 'disabled') NOT NULL DEFAULT 'active', \`last_sign_in_at\` datetime(3) NULL, \`created_at\` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(6), \`updated_at\` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(6) ON UPDATE CURRENT_TIMESTAMP(6), \`version\` int NOT NULL, UNIQUE INDEX \`uq_users_email\` (\`email\`), INDEX \`ix_users_org_name\` (\`organization_id\`, \`name\`), PRIMARY KEY (\`id\`)) ENGINE=InnoDB`,
    );
    await queryRunner.query(
      `CREATE TABLE \`invitations\` (\`id\` uuid NOT NULL, \`user_id\` uuid NOT NULL, \`token_hash\` char(64) NOT NULL, \`expires_at\` datetime(3) NOT NULL, \`used_at\` datetime(3) NULL, \`created_by_id\` uuid NOT NULL, \`created_at\` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(6), UNIQUE INDEX \`uq_invitations_token_hash\` (\`token_hash\`), PRIMARY KEY (\`id\`)) ENGINE=InnoDB`,
    );
    await queryRunner.query(
      `CREATE TABLE \`login_attempts\` (\`id\` bigint UNSIGNED NOT NULL AUTO_INCREMENT, \`email\` varchar(254) NOT NULL, \`ip\` varchar(64) NOT NULL, \`attempted_at\` datetime(3) NOT NULL, INDEX \`ix_login_attempts_ip\` (\`ip\`, \`attempted_at\`), INDEX \`ix_login_attempts_email\` (\`email\`, \`attempted_at\`), PRIMARY KEY (\`id\`)) ENGINE=InnoDB`,
    );
    await queryRunner.query(
      `CREATE TABLE \`outbox_messages\` (\`id\` bigint UNSIGNED NOT NULL AUTO_INCREMENT, \`created_at\` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(6), \`template\` varchar(64) NOT NULL, \`to_address\` text NOT NULL, \`subject\` varchar(255) NOT NULL, \`text_body\` mediumtext NOT NULL, \`html_body\` mediumtext NOT NULL, \`attachments\` json NULL, \`status\` enum ('pending', 'sent', 'failed') NOT NULL DEFAULT 'pending', \`attempts\` int NOT NULL DEFAULT '0', \`next_attempt_at\` datetime(3) NOT NULL, \`last_error\` text NULL, \`sent_at\` datetime(3) NULL, \`message_id\` varchar(255) NULL, INDEX \`ix_outbox_due\` (\`status\`, \`next_attempt_at\`), PRIMARY KEY (\`id\`)) ENGINE=InnoDB`,
    );
    await queryRunner.query(
      `ALTER TABLE \`users\` ADD CONSTRAINT \`FK_21a659804ed7bf61eb91688dea7\` FOREIGN KEY (\`organization_id\`) REFERENCES \`organizations\`(\`id\`) ON DELETE RESTRICT ON UPDATE NO ACTION`,
    );
    await queryRunner.query(
      `ALTER TABLE \`invitations\` ADD CONSTRAINT \`FK_fecdffec754fa4d5cea98709776\` FOREIGN KEY (\`user_id\`) REFERENCES \`users\`(\`id\`) ON DELETE CASCADE ON UPDATE NO ACTION`,
    );
  }

  public async down(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(
      `ALTER TABLE \`invitations\` DROP FOREIGN KEY \`FK_fecdffec754fa4d5cea98709776\``,
    );
    await queryRunner.query(`ALTER TABLE \`users\` DROP FOREIGN KEY \`FK_21a659804ed7bf61eb91688dea7\``);
    await queryRunner.query(`DROP INDEX \`ix_outbox_due\` ON \`outbox_messages\``);
    await queryRunner.query(`DROP TABLE \`outbox_messages\``);
    await queryRunner.query(`DROP INDEX \`ix_login_attempts_email\` ON \`login_attempts\``);
    await queryRunner.query(`DROP INDEX \`ix_login_attempts_ip\` ON \`login_attempts\``);
    await queryRunner.query(`DROP TABLE \`login_attempts\``);
    await queryRunner.query(`DROP INDEX \`uq_invitations_token_hash\` ON \`invitations\``);
    await queryRunner.query(`DROP TABLE \`invitations\``);
    await queryRunner.query(`DROP INDEX \`ix_users_org_name\` ON \`users\``);
    await queryRunner.query(`DROP INDEX \`uq_users_email\` ON \`users\``);
    await queryRunner.query(`DROP TABLE \`users\``);
    await queryRunner.query(`DROP INDEX \`uq_organizations_name\` ON \`organizations\``);
    await queryRunner.query(`DROP TABLE \`organizations\``);
    await queryRunner.query(`DROP INDEX \`ix_audit_entity\` ON \`audit_events\``);
    await queryRunner.query(`DROP INDEX \`ix_audit_org_time\` ON \`audit_events\``);
    await queryRunner.query(`DROP TABLE \`audit_events\``);
  }
}
