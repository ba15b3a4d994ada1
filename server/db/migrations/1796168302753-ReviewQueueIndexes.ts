import type { MigrationInterface, QueryRunner } from 'typeorm';

// Generated, then trimmed to the queue's indexes (TypeORM also proposed re-declaring other tables' defaults and
// re-creating indexes it misreads).
export class ReviewQueueIndexes1796168302753 implements MigrationInterface {
  name = 'ReviewQueueIndexes1796168302753';

  public async up(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(
      `CREATE INDEX \`ix_claims_mfr_number\` ON \`claims\` (\`manufacturer_id\`, \`number\`)`,
    );
    await queryRunner.query(
      `CREATE INDEX \`ix_claims_mfr_credit\` ON \`claims\` (\`manufacturer_id\`, \`expected_credit\`)`,
    );
    await queryRunner.query(
      `CREATE INDEX \`ix_claims_mfr_contractor\` ON \`claims\` (\`manufacturer_id\`, \`contractor_id\`, \`stage_changed_at\`)`,
    );
    await queryRunner.query(
      `CREATE INDEX \`ix_claims_mfr_product\` ON \`claims\` (\`manufacturer_id\`, \`product_model_id\`, \`stage_changed_at\`)`,
    );
    await queryRunner.query(
      `CREATE INDEX \`ix_claims_mfr_verdict\` ON \`claims\` (\`manufacturer_id\`, \`verdict\`, \`stage_changed_at\`)`,
    );
    await queryRunner.query(
      `CREATE INDEX \`ix_claims_mfr_waiting\` ON \`claims\` (\`manufacturer_id\`, \`waiting_on\`, \`stage_changed_at\`)`,
    );
    await queryRunner.query(
      `CREATE INDEX \`ix_claims_mfr_stage_changed\` ON \`claims\` (\`manufacturer_id\`, \`stage_changed_at\`)`,
    );
  }

  public async down(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(`DROP INDEX \`ix_claims_mfr_stage_changed\` ON \`claims\``);
    await queryRunner.query(`DROP INDEX \`ix_claims_mfr_waiting\` ON \`claims\``);
    await queryRunner.query(`DROP INDEX \`ix_claims_mfr_verdict\` ON \`claims\``);
    await queryRunner.query(`DROP INDEX \`ix_claims_mfr_product\` ON \`claims\``);
    await queryRunner.query(`DROP INDEX \`ix_claims_mfr_contractor\` ON \`claims\``);
    await queryRunner.query(`DROP INDEX \`ix_claims_mfr_credit\` ON \`claims\``);
    await queryRunner.query(`DROP INDEX \`ix_claims_mfr_number\` ON \`claims\``);
  }
}
