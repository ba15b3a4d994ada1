import type { MigrationInterface, QueryRunner } from 'typeorm';

// Written by hand: the session store's table (express-mysql-session, which is told not to create it) and the
// triggers that make the audit log append-only in the database itself.
export class SessionsAndAuditGuard1796165468051 implements MigrationInterface {
  name = 'SessionsAndAuditGuard1796165468051';

  public async up(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(
      'CREATE TABLE `sessions` (`session_id` varchar(128) CHARACTER SET ascii COLLATE ascii_bin NOT NULL, `expires` int UNSIGNED NOT NULL, `data` mediumtext COLLATE utf8mb4_bin, PRIMARY KEY (`session_id`), INDEX `ix_sessions_expires` (`expires`)) ENGINE=InnoDB',
    );
    await queryRunner.query(
      "CREATE TRIGGER `audit_events_no_update` BEFORE UPDATE ON `audit_events` FOR EACH ROW SIGNAL SQLSTATE '45000' SET MESSAGE_TEXT = 'audit_events is append-only'",
    );
    await queryRunner.query(
      "CREATE TRIGGER `audit_events_no_delete` BEFORE DELETE ON `audit_events` FOR EACH ROW SIGNAL SQLSTATE '45000' SET MESSAGE_TEXT = 'audit_events is append-only'",
    );
  }

  public async down(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query('DROP TRIGGER IF EXISTS `audit_events_no_delete`');
    await queryRunner.query('DROP TRIGGER IF EXISTS `audit_events_no_update`');
    await queryRunner.query('DROP TABLE `sessions`');
  }
}
