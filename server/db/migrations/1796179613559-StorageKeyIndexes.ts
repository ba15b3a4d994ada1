import type { MigrationInterface, QueryRunner } from 'typeorm';

// Generated, then trimmed to the two indexes: the generator also re-emits the CURRENT_TIMESTAMP precision and
// composite-index churn it reports on every diff (noise, the schema already matches).
export class StorageKeyIndexes1796179613559 implements MigrationInterface {
  name = 'StorageKeyIndexes1796179613559';

  public async up(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(
      `CREATE INDEX \`ix_attachments_thumbnail_key\` ON \`attachments\` (\`thumbnail_key\`)`,
    );
    await queryRunner.query(
      `CREATE INDEX \`ix_credit_memos_pdf_storage_key\` ON \`credit_memos\` (\`pdf_storage_key\`)`,
    );
  }

  public async down(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(`DROP INDEX \`ix_credit_memos_pdf_storage_key\` ON \`credit_memos\``);
    await queryRunner.query(`DROP INDEX \`ix_attachments_thumbnail_key\` ON \`attachments\``);
  }
}
