import type { MigrationInterface, QueryRunner } from 'typeorm';

// Written by hand: a warranty policy version is immutable once written (claims are judged by it), so the
// database itself refuses UPDATE and DELETE on its rows, as it does for the audit log.
export class CatalogueGuards1796166271710 implements MigrationInterface {
  name = 'CatalogueGuards1796166271710';

  public async up(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(
      "CREATE TRIGGER `policy_versions_no_update` BEFORE UPDATE ON `warranty_policy_versions` FOR EACH ROW SIGNAL SQLSTATE '45000' SET MESSAGE_TEXT = 'warranty_policy_versions are immutable'",
    );
    await queryRunner.query(
      "CREATE TRIGGER `policy_versions_no_delete` BEFORE DELETE ON `warranty_policy_versions` FOR EACH ROW SIGNAL SQLSTATE '45000' SET MESSAGE_TEXT = 'warranty_policy_versions are immutable'",
    );
  }

  public async down(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query('DROP TRIGGER IF EXISTS `policy_versions_no_delete`');
    await queryRunner.query('DROP TRIGGER IF EXISTS `policy_versions_no_update`');
  }
}
