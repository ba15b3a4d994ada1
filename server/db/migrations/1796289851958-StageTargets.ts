import type { MigrationInterface, QueryRunner } from 'typeorm';

export class StageTargets1796289851958 implements MigrationInterface {
  name = 'StageTargets1796289851958';

  public async up(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(`ALTER TABLE \`organizations\` ADD \`stage_targets\` json NULL`);
  }

  public async down(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(`ALTER TABLE \`organizations\` DROP COLUMN \`stage_targets\``);
  }
}
