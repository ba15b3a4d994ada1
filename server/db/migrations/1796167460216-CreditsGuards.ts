import type { MigrationInterface, QueryRunner } from 'typeorm';

// Written by hand: the database itself keeps the money trail. Ledger entries are append-only; credit memos are
// documents that are never edited or deleted, except that voiding a credit clears its credited_claim_id (the
// column whose unique index allows one standing credit per claim), and nothing else may change with it.
export class CreditsGuards1796167460216 implements MigrationInterface {
  name = 'CreditsGuards1796167460216';

  public async up(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(
      "CREATE TRIGGER `ledger_entries_no_update` BEFORE UPDATE ON `ledger_entries` FOR EACH ROW SIGNAL SQLSTATE '45000' SET MESSAGE_TEXT = 'ledger_entries is append-only'",
    );
    await queryRunner.query(
      "CREATE TRIGGER `ledger_entries_no_delete` BEFORE DELETE ON `ledger_entries` FOR EACH ROW SIGNAL SQLSTATE '45000' SET MESSAGE_TEXT = 'ledger_entries is append-only'",
    );
    await queryRunner.query(
      "CREATE TRIGGER `credit_memos_no_delete` BEFORE DELETE ON `credit_memos` FOR EACH ROW SIGNAL SQLSTATE '45000' SET MESSAGE_TEXT = 'credit_memos are never deleted'",
    );
    await queryRunner.query(
      `CREATE TRIGGER \`credit_memos_only_void\` BEFORE UPDATE ON \`credit_memos\` FOR EACH ROW
       IF NOT (NEW.id <=> OLD.id AND NEW.number <=> OLD.number AND NEW.kind <=> OLD.kind
         AND NEW.manufacturer_id <=> OLD.manufacturer_id AND NEW.contractor_id <=> OLD.contractor_id
         AND NEW.claim_id <=> OLD.claim_id AND NEW.reverses_memo_id <=> OLD.reverses_memo_id
         AND NEW.amount <=> OLD.amount AND NEW.currency <=> OLD.currency AND NEW.reason <=> OLD.reason
         AND NEW.pdf_storage_key <=> OLD.pdf_storage_key AND NEW.pdf_sha256 <=> OLD.pdf_sha256
         AND NEW.issued_by_id <=> OLD.issued_by_id AND NEW.issued_at <=> OLD.issued_at
         AND (NEW.credited_claim_id <=> OLD.credited_claim_id OR NEW.credited_claim_id IS NULL)) THEN
         SIGNAL SQLSTATE '45000' SET MESSAGE_TEXT = 'credit_memos are never edited; void a memo with a reversal';
       END IF`,
    );
  }

  public async down(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query('DROP TRIGGER IF EXISTS `credit_memos_only_void`');
    await queryRunner.query('DROP TRIGGER IF EXISTS `credit_memos_no_delete`');
    await queryRunner.query('DROP TRIGGER IF EXISTS `ledger_entries_no_delete`');
    await queryRunner.query('DROP TRIGGER IF EXISTS `ledger_entries_no_update`');
  }
}
