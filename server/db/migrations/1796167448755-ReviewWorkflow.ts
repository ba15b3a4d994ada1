import type { MigrationInterface, QueryRunner } from 'typeorm';

// Generated, then trimmed to this migration's own tables (TypeORM also proposed re-declaring other tables'
// created_at defaults and re-creating some of their indexes, a difference it only imagines).
export class ReviewWorkflow1796167448755 implements MigrationInterface {
  name = 'ReviewWorkflow1796167448755';

  public async up(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(
      `CREATE TABLE \`bench_tests\` (\`id\` uuid NOT NULL, \`claim_id\` uuid NOT NULL, \`return_authorization_id\` uuid NULL, \`tested_on\` date NOT NULL, \`result\` varchar(32) NOT NULL, \`readings\` json NOT NULL, \`evaluation\` json NOT NULL, \`engine_version\` varchar(20) NOT NULL, \`note\` text NULL, \`tested_by_id\` uuid NOT NULL, \`tested_at\` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(6), INDEX \`ix_bench_tests_claim\` (\`claim_id\`, \`tested_at\`), PRIMARY KEY (\`id\`)) ENGINE=InnoDB`,
    );
    await queryRunner.query(
      `CREATE TABLE \`claim_documents\` (\`id\` uuid NOT NULL, \`claim_id\` uuid NOT NULL, \`kind\` enum ('letter', 'packing_slip') NOT NULL, \`filename\` varchar(120) NOT NULL, \`storage_key\` varchar(160) NOT NULL, \`sha256\` char(64) NOT NULL, \`byte_size\` int UNSIGNED NOT NULL, \`created_at\` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(6), UNIQUE INDEX \`uq_claim_documents_storage_key\` (\`storage_key\`), INDEX \`ix_claim_documents_claim\` (\`claim_id\`, \`created_at\`), PRIMARY KEY (\`id\`)) ENGINE=InnoDB`,
    );
    await queryRunner.query(
      `CREATE TABLE \`claim_messages\` (\`id\` uuid NOT NULL, \`claim_id\` uuid NOT NULL, \`kind\` enum ('info_request', 'info_answer', 'note') NOT NULL, \`author_org_id\` uuid NOT NULL, \`author_id\` uuid NULL, \`body\` text NOT NULL, \`due_on\` date NULL, \`answered_at\` datetime(3) NULL, \`created_at\` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(6), INDEX \`ix_claim_messages_claim\` (\`claim_id\`, \`created_at\`), PRIMARY KEY (\`id\`)) ENGINE=InnoDB`,
    );
    await queryRunner.query(
      `CREATE TABLE \`decisions\` (\`id\` uuid NOT NULL, \`claim_id\` uuid NOT NULL, \`current_claim_id\` uuid NULL, \`outcome\` enum ('approved', 'partly_approved', 'denied') NOT NULL, \`resolution\` enum ('replace', 'credit', 'repair_allowance') NULL, \`amount\` decimal(12,2) NULL, \`currency\` char(3) NULL, \`engine_amount\` decimal(12,2) NULL, \`approved_units\` int NULL, \`reason_codes\` json NOT NULL, \`note\` text NULL, \`override_reason\` text NULL, \`against_engine\` tinyint NOT NULL, \`decided_by_id\` uuid NOT NULL, \`decided_at\` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(6), \`superseded_at\` datetime(3) NULL, \`letter_id\` uuid NULL, INDEX \`ix_decisions_claim\` (\`claim_id\`, \`decided_at\`), UNIQUE INDEX \`uq_decisions_current_claim\` (\`current_claim_id\`), PRIMARY KEY (\`id\`)) ENGINE=InnoDB`,
    );
    await queryRunner.query(
      `CREATE TABLE \`return_authorizations\` (\`id\` uuid NOT NULL, \`number\` varchar(20) NOT NULL, \`claim_id\` uuid NOT NULL, \`ship_to\` json NOT NULL, \`instructions\` text NULL, \`ship_by\` date NOT NULL, \`carrier\` varchar(80) NULL, \`tracking_number\` varchar(64) NULL, \`shipped_on\` date NULL, \`received_on\` date NULL, \`received_condition\` varchar(32) NULL, \`received_note\` text NULL, \`packing_slip_id\` uuid NULL, \`requested_by_id\` uuid NOT NULL, \`created_at\` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(6), INDEX \`ix_return_authorizations_claim\` (\`claim_id\`, \`created_at\`), UNIQUE INDEX \`uq_return_authorizations_number\` (\`number\`), PRIMARY KEY (\`id\`)) ENGINE=InnoDB`,
    );
    await queryRunner.query(
      `ALTER TABLE \`bench_tests\` ADD CONSTRAINT \`FK_ce7613086434508a09d37d7a62a\` FOREIGN KEY (\`claim_id\`) REFERENCES \`claims\`(\`id\`) ON DELETE RESTRICT ON UPDATE NO ACTION`,
    );
    await queryRunner.query(
      `ALTER TABLE \`claim_documents\` ADD CONSTRAINT \`FK_9dfdd8ea365fd3699275a15b1c7\` FOREIGN KEY (\`claim_id\`) REFERENCES \`claims\`(\`id\`) ON DELETE RESTRICT ON UPDATE NO ACTION`,
    );
    await queryRunner.query(
      `ALTER TABLE \`claim_messages\` ADD CONSTRAINT \`FK_fbdebddd06db4edee5f9f5daf14\` FOREIGN KEY (\`claim_id\`) REFERENCES \`claims\`(\`id\`) ON DELETE RESTRICT ON UPDATE NO ACTION`,
    );
    await queryRunner.query(
      `ALTER TABLE \`decisions\` ADD CONSTRAINT \`FK_ab99e983cc60fb9c241dd4311bc\` FOREIGN KEY (\`claim_id\`) REFERENCES \`claims\`(\`id\`) ON DELETE RESTRICT ON UPDATE NO ACTION`,
    );
    await queryRunner.query(
      `ALTER TABLE \`return_authorizations\` ADD CONSTRAINT \`FK_9e5412ad6bae4bbbbc5735db343\` FOREIGN KEY (\`claim_id\`) REFERENCES \`claims\`(\`id\`) ON DELETE RESTRICT ON UPDATE NO ACTION`,
    );
  }

  public async down(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(
      `ALTER TABLE \`return_authorizations\` DROP FOREIGN KEY \`FK_9e5412ad6bae4bbbbc5735db343\``,
    );
    await queryRunner.query(`ALTER TABLE \`decisions\` DROP FOREIGN KEY \`FK_ab99e983cc60fb9c241dd4311bc\``);
    await queryRunner.query(
      `ALTER TABLE \`claim_messages\` DROP FOREIGN KEY \`FK_fbdebddd06db4edee5f9f5daf14\``,
    );
    await queryRunner.query(
      `ALTER TABLE \`claim_documents\` DROP FOREIGN KEY \`FK_9dfdd8ea365fd3699275a15b1c7\``,
    );
    await queryRunner.query(
      `ALTER TABLE \`bench_tests\` DROP FOREIGN KEY \`FK_ce7613086434508a09d37d7a62a\``,
    );
    await queryRunner.query(`DROP INDEX \`uq_return_authorizations_number\` ON \`return_authorizations\``);
    await queryRunner.query(`DROP INDEX \`ix_return_authorizations_claim\` ON \`return_authorizations\``);
    await queryRunner.query(`DROP TABLE \`return_authorizations\``);
    await queryRunner.query(`DROP INDEX \`uq_decisions_current_claim\` ON \`decisions\``);
    await queryRunner.query(`DROP INDEX \`ix_decisions_claim\` ON \`decisions\``);
    await queryRunner.query(`DROP TABLE \`decisions\``);
    await queryRunner.query(`DROP INDEX \`ix_claim_messages_claim\` ON \`claim_messages\``);
    await queryRunner.query(`DROP TABLE \`claim_messages\``);
    await queryRunner.query(`DROP INDEX \`ix_claim_documents_claim\` ON \`claim_documents\``);
    await queryRunner.query(`DROP INDEX \`uq_claim_documents_storage_key\` ON \`claim_documents\``);
    await queryRunner.query(`DROP TABLE \`claim_documents\``);
    await queryRunner.query(`DROP INDEX \`ix_bench_tests_claim\` ON \`bench_tests\``);
    await queryRunner.query(`DROP TABLE \`bench_tests\``);
  }
}
