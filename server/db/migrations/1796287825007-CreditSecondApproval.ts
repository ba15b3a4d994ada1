import type { MigrationInterface, QueryRunner } from 'typeorm';

// Four eyes on large credits: the manufacturer's threshold, and the first accountant's approval of a credit above it.
export class CreditSecondApproval1796287825007 implements MigrationInterface {
  name = 'CreditSecondApproval1796287825007';

  public async up(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(
      `ALTER TABLE \`organizations\` ADD \`credit_second_approval_above\` decimal(12,2) NULL`,
    );
    await queryRunner.query(
      `CREATE TABLE \`credit_approvals\` (\`claim_id\` uuid NOT NULL, \`approved_by_id\` uuid NOT NULL, \`amount\` decimal(12,2) NOT NULL, \`currency\` char(3) NOT NULL, \`approved_at\` datetime(3) NOT NULL, PRIMARY KEY (\`claim_id\`)) ENGINE=InnoDB`,
    );
  }

  public async down(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(`DROP TABLE \`credit_approvals\``);
    await queryRunner.query(`ALTER TABLE \`organizations\` DROP COLUMN \`credit_second_approval_above\``);
  }
}
