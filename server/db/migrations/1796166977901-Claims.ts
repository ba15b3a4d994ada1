import type { MigrationInterface, QueryRunner } from 'typeorm';

export class Claims1796166977901 implements MigrationInterface {
  name = 'Claims1796166977901';

  public async up(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(
      `CREATE TABLE \`claim_batches\` (\`id\` uuid NOT NULL, \`contractor_id\` uuid NOT NULL, \`filename\` varchar(200) NULL, \`row_count\` int NOT NULL, \`created_by_id\` uuid NULL, \`created_at\` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(6), INDEX \`ix_claim_batches_contractor_created\` (\`contractor_id\`, \`created_at\`), PRIMARY KEY (\`id\`)) ENGINE=InnoDB`,
    );
    await queryRunner.query(
      `CREATE TABLE \`claims\` (\`id\` uuid NOT NULL, \`number\` varchar(20) NULL, \`contractor_id\` uuid NOT NULL, \`manufacturer_id\` uuid NOT NULL, \`installation_id\` uuid NOT NULL, \`product_model_id\` uuid NOT NULL, \`policy_version_id\` uuid NULL, \`stage\` enum ('draft', 'filed', 'in_review', 'needs_info', 'return_requested', 'unit_received', 'approved', 'denied', 'credited', 'closed', 'withdrawn') NOT NULL DEFAULT 'draft', \`stage_changed_at\` datetime(3) NOT NULL, \`waiting_on\` enum ('manufacturer', 'contractor') NULL, \`units\` int NULL, \`serials\` json NOT NULL, \`failed_on\` date NULL, \`symptoms\` json NOT NULL, \`measurements\` json NOT NULL, \`observations\` json NOT NULL, \`narrative\` text NOT NULL, \`evaluation\` json NULL, \`engine_version\` varchar(20) NULL, \`evaluated_at\` datetime(3) NULL, \`verdict\` enum ('covered', 'excluded', 'review') NULL, \`expected_credit\` decimal(12,2) NULL, \`currency\` char(3) NULL, \`filed_at\` datetime(3) NULL, \`filed_by_id\` uuid NULL, \`batch_id\` uuid NULL, \`assigned_reviewer_id\` uuid NULL, \`created_by_id\` uuid NULL, \`created_at\` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(6), \`updated_at\` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(6) ON UPDATE CURRENT_TIMESTAMP(6), \`version\` int NOT NULL, INDEX \`ix_claims_reviewer\` (\`assigned_reviewer_id\`, \`stage\`), INDEX \`ix_claims_batch\` (\`batch_id\`), INDEX \`ix_claims_installation\` (\`installation_id\`), INDEX \`ix_claims_mfr_filed\` (\`manufacturer_id\`, \`filed_at\`), INDEX \`ix_claims_contractor_updated\` (\`contractor_id\`, \`updated_at\`), INDEX \`ix_claims_contractor_stage_filed\` (\`contractor_id\`, \`stage\`, \`filed_at\`), INDEX \`ix_claims_mfr_stage_filed\` (\`manufacturer_id\`, \`stage\`, \`filed_at\`), UNIQUE INDEX \`uq_claims_number\` (\`number\`), PRIMARY KEY (\`id\`)) ENGINE=InnoDB`,
    );
    await queryRunner.query(
      `ALTER TABLE \`claims\` ADD CONSTRAINT \`FK_5fdd97db07ef3e27d4bc9cf0bb7\` FOREIGN KEY (\`contractor_id\`) REFERENCES \`organizations\`(\`id\`) ON DELETE RESTRICT ON UPDATE NO ACTION`,
    );
    await queryRunner.query(
      `ALTER TABLE \`claims\` ADD CONSTRAINT \`FK_2173754cac8870a68539b7cca93\` FOREIGN KEY (\`manufacturer_id\`) REFERENCES \`organizations\`(\`id\`) ON DELETE RESTRICT ON UPDATE NO ACTION`,
    );
    await queryRunner.query(
      `ALTER TABLE \`claims\` ADD CONSTRAINT \`FK_ce053dc5aa4a4a2926c38d6884b\` FOREIGN KEY (\`installation_id\`) REFERENCES \`installations\`(\`id\`) ON DELETE RESTRICT ON UPDATE NO ACTION`,
    );
    await queryRunner.query(
      `ALTER TABLE \`claims\` ADD CONSTRAINT \`FK_39cc0b40ba03b90dbc997949a6e\` FOREIGN KEY (\`product_model_id\`) REFERENCES \`product_models\`(\`id\`) ON DELETE RESTRICT ON UPDATE NO ACTION`,
    );
    await queryRunner.query(
      `ALTER TABLE \`claims\` ADD CONSTRAINT \`FK_cbb8b3a07d56cc404d08590a12f\` FOREIGN KEY (\`policy_version_id\`) REFERENCES \`warranty_policy_versions\`(\`id\`) ON DELETE RESTRICT ON UPDATE NO ACTION`,
    );
  }

  public async down(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(`ALTER TABLE \`claims\` DROP FOREIGN KEY \`FK_cbb8b3a07d56cc404d08590a12f\``);
    await queryRunner.query(`ALTER TABLE \`claims\` DROP FOREIGN KEY \`FK_39cc0b40ba03b90dbc997949a6e\``);
    await queryRunner.query(`ALTER TABLE \`claims\` DROP FOREIGN KEY \`FK_ce053dc5aa4a4a2926c38d6884b\``);
    await queryRunner.query(`ALTER TABLE \`claims\` DROP FOREIGN KEY \`FK_2173754cac8870a68539b7cca93\``);
    await queryRunner.query(`ALTER TABLE \`claims\` DROP FOREIGN KEY \`FK_5fdd97db07ef3e27d4bc9cf0bb7\``);
    await queryRunner.query(`DROP INDEX \`uq_claims_number\` ON \`claims\``);
    await queryRunner.query(`DROP INDEX \`ix_claims_mfr_stage_filed\` ON \`claims\``);
    await queryRunner.query(`DROP INDEX \`ix_claims_contractor_stage_filed\` ON \`claims\``);
    await queryRunner.query(`DROP INDEX \`ix_claims_contractor_updated\` ON \`claims\``);
    await queryRunner.query(`DROP INDEX \`ix_claims_mfr_filed\` ON \`claims\``);
    await queryRunner.query(`DROP INDEX \`ix_claims_installation\` ON \`claims\``);
    await queryRunner.query(`DROP INDEX \`ix_claims_batch\` ON \`claims\``);
    await queryRunner.query(`DROP INDEX \`ix_claims_reviewer\` ON \`claims\``);
    await queryRunner.query(`DROP TABLE \`claims\``);
    await queryRunner.query(`DROP INDEX \`ix_claim_batches_contractor_created\` ON \`claim_batches\``);
    await queryRunner.query(`DROP TABLE \`claim_batches\``);
  }
}
