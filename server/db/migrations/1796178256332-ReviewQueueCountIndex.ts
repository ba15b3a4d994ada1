import type { MigrationInterface, QueryRunner } from 'typeorm';

// The reviewer's queue counts its matches on every page: open stages and a verdict from the index alone
// (scripts/bench/queue.bench.ts). Generated, then cut to this index: the rest of the generated diff was
// TypeORM's usual noise about CURRENT_TIMESTAMP precision and index order, which the committed schema does not need.
export class ReviewQueueCountIndex1796178256332 implements MigrationInterface {
  name = 'ReviewQueueCountIndex1796178256332';

  public async up(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(
      `CREATE INDEX \`ix_claims_mfr_stage_verdict\` ON \`claims\` (\`manufacturer_id\`, \`stage\`, \`verdict\`)`,
    );
  }

  public async down(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(`DROP INDEX \`ix_claims_mfr_stage_verdict\` ON \`claims\``);
  }
}
