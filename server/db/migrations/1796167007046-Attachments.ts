import type { MigrationInterface, QueryRunner } from 'typeorm';

// Generated, then trimmed: TypeORM also proposed re-declaring the created_at/updated_at defaults of the other
// tables (a difference it sees between datetime(3) and the CURRENT_TIMESTAMP it reads back); those lines are
// not this migration's business and are left out.
export class Attachments1796167007046 implements MigrationInterface {
  name = 'Attachments1796167007046';

  public async up(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(
      `CREATE TABLE \`attachments\` (\`id\` uuid NOT NULL, \`owner_type\` varchar(32) NOT NULL, \`owner_id\` uuid NULL, \`organization_id\` uuid NOT NULL, \`uploaded_by_id\` uuid NOT NULL, \`kind\` enum ('photo', 'document') NOT NULL, \`purpose\` enum ('nameplate', 'failure', 'site', 'proof_of_purchase', 'other') NOT NULL DEFAULT 'other', \`content_type\` varchar(64) NOT NULL, \`byte_size\` int UNSIGNED NOT NULL, \`sha256\` char(64) NOT NULL, \`storage_key\` varchar(160) NOT NULL, \`thumbnail_key\` varchar(160) NULL, \`original_name\` varchar(160) NOT NULL, \`width\` int UNSIGNED NULL, \`height\` int UNSIGNED NULL, \`captured_at\` datetime(3) NULL, \`created_at\` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(6), \`deleted_at\` datetime(3) NULL, UNIQUE INDEX \`uq_attachments_storage_key\` (\`storage_key\`), INDEX \`ix_attachments_owner\` (\`owner_type\`, \`owner_id\`), PRIMARY KEY (\`id\`)) ENGINE=InnoDB`,
    );
    await queryRunner.query(
      `ALTER TABLE \`attachments\` ADD CONSTRAINT \`FK_4af30039d8c32fe7cd7112229ee\` FOREIGN KEY (\`organization_id\`) REFERENCES \`organizations\`(\`id\`) ON DELETE RESTRICT ON UPDATE NO ACTION`,
    );
    await queryRunner.query(
      `ALTER TABLE \`attachments\` ADD CONSTRAINT \`FK_70a38fc450d3b433c86b67e69d6\` FOREIGN KEY (\`uploaded_by_id\`) REFERENCES \`users\`(\`id\`) ON DELETE RESTRICT ON UPDATE NO ACTION`,
    );
  }

  public async down(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(
      `ALTER TABLE \`attachments\` DROP FOREIGN KEY \`FK_70a38fc450d3b433c86b67e69d6\``,
    );
    await queryRunner.query(
      `ALTER TABLE \`attachments\` DROP FOREIGN KEY \`FK_4af30039d8c32fe7cd7112229ee\``,
    );
    await queryRunner.query(`DROP INDEX \`ix_attachments_owner\` ON \`attachments\``);
    await queryRunner.query(`DROP INDEX \`uq_attachments_storage_key\` ON \`attachments\``);
    await queryRunner.query(`DROP TABLE \`attachments\``);
  }
}
