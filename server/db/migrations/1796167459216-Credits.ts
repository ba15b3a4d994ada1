import type { MigrationInterface, QueryRunner } from 'typeorm';

// Generated, then trimmed: TypeORM also proposed re-declaring the created_at/updated_at defaults and a few
// indexes of other tables (a difference it sees between datetime(3) and the CURRENT_TIMESTAMP it reads back);
// those lines are not this migration's business and are left out.
export class Credits1796167459216 implements MigrationInterface {
  name = 'Credits1796167459216';

  public async up(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(
      `CREATE TABLE \`credit_memos\` (\`id\` uuid NOT NULL, \`number\` varchar(32) NOT NULL, \`kind\` enum ('credit', 'reversal') NOT NULL, \`manufacturer_id\` uuid NOT NULL, \`contractor_id\` uuid NOT NULL, \`claim_id\` uuid NOT NULL, \`credited_claim_id\` uuid NULL, \`reverses_memo_id\` uuid NULL, \`amount\` decimal(14,2) NOT NULL, \`currency\` char(3) NOT NULL, \`reason\` text NULL, \`pdf_storage_key\` varchar(160) NOT NULL, \`pdf_sha256\` char(64) NOT NULL, \`issued_by_id\` uuid NOT NULL, \`issued_at\` datetime(3) NOT NULL, INDEX \`ix_credit_memos_claim\` (\`claim_id\`), INDEX \`ix_credit_memos_contractor_issued\` (\`contractor_id\`, \`issued_at\`), INDEX \`ix_credit_memos_mfr_issued\` (\`manufacturer_id\`, \`issued_at\`), UNIQUE INDEX \`uq_credit_memos_reverses\` (\`reverses_memo_id\`), UNIQUE INDEX \`uq_credit_memos_credited_claim\` (\`credited_claim_id\`), UNIQUE INDEX \`uq_credit_memos_number\` (\`number\`), PRIMARY KEY (\`id\`)) ENGINE=InnoDB`,
    );
    await queryRunner.query(
      `CREATE TABLE \`idempotency_keys\` (\`id\` bigint UNSIGNED NOT NULL AUTO_INCREMENT, \`idem_key\` varchar(255) NOT NULL, \`user_id\` uuid NOT NULL, \`route\` varchar(120) NOT NULL, \`request_hash\` char(64) NOT NULL, \`status\` enum ('pending', 'done') NOT NULL DEFAULT 'pending', \`response_status\` smallint UNSIGNED NULL, \`response_body\` json NULL, \`created_at\` datetime(3) NOT NULL, INDEX \`ix_idempotency_keys_created\` (\`created_at\`), UNIQUE INDEX \`uq_idempotency_keys\` (\`user_id\`, \`route\`, \`idem_key\`), PRIMARY KEY (\`id\`)) ENGINE=InnoDB`,
    );
    await queryRunner.query(
      `CREATE TABLE \`ledger_entries\` (\`id\` bigint UNSIGNED NOT NULL AUTO_INCREMENT, \`contractor_id\` uuid NOT NULL, \`manufacturer_id\` uuid NOT NULL, \`currency\` char(3) NOT NULL, \`amount\` decimal(14,2) NOT NULL, \`memo_id\` uuid NOT NULL, \`created_at\` datetime(3) NOT NULL, INDEX \`ix_ledger_mfr_created\` (\`manufacturer_id\`, \`created_at\`), INDEX \`ix_ledger_account\` (\`contractor_id\`, \`manufacturer_id\`, \`currency\`), UNIQUE INDEX \`uq_ledger_entries_memo\` (\`memo_id\`), PRIMARY KEY (\`id\`)) ENGINE=InnoDB`,
    );
    await queryRunner.query(
      `CREATE TABLE \`memo_sequences\` (\`manufacturer_id\` uuid NOT NULL, \`year\` smallint UNSIGNED NOT NULL, \`next_value\` int UNSIGNED NOT NULL, PRIMARY KEY (\`manufacturer_id\`, \`year\`)) ENGINE=InnoDB`,
    );
    await queryRunner.query(
      `CREATE TABLE \`memo_prefixes\` (\`manufacturer_id\` uuid NOT NULL, \`code\` varchar(8) NOT NULL, UNIQUE INDEX \`uq_memo_prefixes_code\` (\`code\`), PRIMARY KEY (\`manufacturer_id\`)) ENGINE=InnoDB`,
    );
    await queryRunner.query(
      `ALTER TABLE \`credit_memos\` ADD CONSTRAINT \`FK_045fc1246943cf63e9589309af9\` FOREIGN KEY (\`manufacturer_id\`) REFERENCES \`organizations\`(\`id\`) ON DELETE RESTRICT ON UPDATE NO ACTION`,
    );
    await queryRunner.query(
      `ALTER TABLE \`credit_memos\` ADD CONSTRAINT \`FK_719da901713b7b6d5c5acec4fa8\` FOREIGN KEY (\`contractor_id\`) REFERENCES \`organizations\`(\`id\`) ON DELETE RESTRICT ON UPDATE NO ACTION`,
    );
    await queryRunner.query(
      `ALTER TABLE \`credit_memos\` ADD CONSTRAINT \`FK_79739a9fb04b2dcfc56f66b3b79\` FOREIGN KEY (\`claim_id\`) REFERENCES \`claims\`(\`id\`) ON DELETE RESTRICT ON UPDATE NO ACTION`,
    );
    await queryRunner.query(
      `ALTER TABLE \`credit_memos\` ADD CONSTRAINT \`FK_92dbbf729d6cf0569123db3a9f6\` FOREIGN KEY (\`reverses_memo_id\`) REFERENCES \`credit_memos\`(\`id\`) ON DELETE RESTRICT ON UPDATE NO ACTION`,
    );
    await queryRunner.query(
      `ALTER TABLE \`credit_memos\` ADD CONSTRAINT \`FK_35b7275a5217ed9a841b05a9fe0\` FOREIGN KEY (\`issued_by_id\`) REFERENCES \`users\`(\`id\`) ON DELETE RESTRICT ON UPDATE NO ACTION`,
    );
    await queryRunner.query(
      `ALTER TABLE \`ledger_entries\` ADD CONSTRAINT \`FK_01a7a42c4d2ed8e2850c20a07f8\` FOREIGN KEY (\`memo_id\`) REFERENCES \`credit_memos\`(\`id\`) ON DELETE RESTRICT ON UPDATE NO ACTION`,
    );
  }

  public async down(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(
      `ALTER TABLE \`ledger_entries\` DROP FOREIGN KEY \`FK_01a7a42c4d2ed8e2850c20a07f8\``,
    );
    await queryRunner.query(
      `ALTER TABLE \`credit_memos\` DROP FOREIGN KEY \`FK_35b7275a5217ed9a841b05a9fe0\``,
    );
    await queryRunner.query(
      `ALTER TABLE \`credit_memos\` DROP FOREIGN KEY \`FK_92dbbf729d6cf0569123db3a9f6\``,
    );
    await queryRunner.query(
      `ALTER TABLE \`credit_memos\` DROP FOREIGN KEY \`FK_79739a9fb04b2dcfc56f66b3b79\``,
    );
    await queryRunner.query(
      `ALTER TABLE \`credit_memos\` DROP FOREIGN KEY \`FK_719da901713b7b6d5c5acec4fa8\``,
    );
    await queryRunner.query(
      `ALTER TABLE \`credit_memos\` DROP FOREIGN KEY \`FK_045fc1246943cf63e9589309af9\``,
    );
    await queryRunner.query(`DROP INDEX \`uq_memo_prefixes_code\` ON \`memo_prefixes\``);
    await queryRunner.query(`DROP TABLE \`memo_prefixes\``);
    await queryRunner.query(`DROP TABLE \`memo_sequences\``);
    await queryRunner.query(`DROP INDEX \`uq_ledger_entries_memo\` ON \`ledger_entries\``);
    await queryRunner.query(`DROP INDEX \`ix_ledger_account\` ON \`ledger_entries\``);
    await queryRunner.query(`DROP INDEX \`ix_ledger_mfr_created\` ON \`ledger_entries\``);
    await queryRunner.query(`DROP TABLE \`ledger_entries\``);
    await queryRunner.query(`DROP INDEX \`uq_idempotency_keys\` ON \`idempotency_keys\``);
    await queryRunner.query(`DROP INDEX \`ix_idempotency_keys_created\` ON \`idempotency_keys\``);
    await queryRunner.query(`DROP TABLE \`idempotency_keys\``);
    await queryRunner.query(`DROP INDEX \`uq_credit_memos_number\` ON \`credit_memos\``);
    await queryRunner.query(`DROP INDEX \`uq_credit_memos_credited_claim\` ON \`credit_memos\``);
    await queryRunner.query(`DROP INDEX \`uq_credit_memos_reverses\` ON \`credit_memos\``);
    await queryRunner.query(`DROP INDEX \`ix_credit_memos_mfr_issued\` ON \`credit_memos\``);
    await queryRunner.query(`DROP INDEX \`ix_credit_memos_contractor_issued\` ON \`credit_memos\``);
    await queryRunner.query(`DROP INDEX \`ix_credit_memos_claim\` ON \`credit_memos\``);
    await queryRunner.query(`DROP TABLE \`credit_memos\``);
  }
}
