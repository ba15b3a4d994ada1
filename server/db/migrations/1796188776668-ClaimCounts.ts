import type { MigrationInterface, QueryRunner } from 'typeorm';

// Claims per organisation and stage (server/db/entities/claim-count.entity.ts), appended to by triggers on every
// insert, stage move and delete of a claim, and filled from the claims already there.
const TRIGGERS: [string, string][] = [
  [
    'claims_count_insert',
    `AFTER INSERT ON \`claims\` FOR EACH ROW
     INSERT INTO \`claim_counts\` (\`organization_id\`, \`stage\`, \`n\`)
     VALUES (NEW.\`contractor_id\`, NEW.\`stage\`, 1), (NEW.\`manufacturer_id\`, NEW.\`stage\`, 1)`,
  ],
  [
    'claims_count_update',
    `AFTER UPDATE ON \`claims\` FOR EACH ROW
     IF NOT (OLD.\`stage\` <=> NEW.\`stage\` AND OLD.\`contractor_id\` <=> NEW.\`contractor_id\`
             AND OLD.\`manufacturer_id\` <=> NEW.\`manufacturer_id\`) THEN
       INSERT INTO \`claim_counts\` (\`organization_id\`, \`stage\`, \`n\`)
       VALUES (OLD.\`contractor_id\`, OLD.\`stage\`, -1), (OLD.\`manufacturer_id\`, OLD.\`stage\`, -1),
              (NEW.\`contractor_id\`, NEW.\`stage\`, 1), (NEW.\`manufacturer_id\`, NEW.\`stage\`, 1);
     END IF`,
  ],
  [
    'claims_count_delete',
    `AFTER DELETE ON \`claims\` FOR EACH ROW
     INSERT INTO \`claim_counts\` (\`organization_id\`, \`stage\`, \`n\`)
     VALUES (OLD.\`contractor_id\`, OLD.\`stage\`, -1), (OLD.\`manufacturer_id\`, OLD.\`stage\`, -1)`,
  ],
];

export class ClaimCounts1796188776668 implements MigrationInterface {
  name = 'ClaimCounts1796188776668';

  public async up(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(
      `CREATE TABLE \`claim_counts\` (\`id\` bigint UNSIGNED NOT NULL AUTO_INCREMENT, \`organization_id\` uuid NOT NULL, \`stage\` enum ('draft', 'filed', 'in_review', 'needs_info', 'return_requested', 'unit_received', 'approved', 'denied', 'credited', 'closed', 'withdrawn') NOT NULL, \`n\` int NOT NULL, INDEX \`ix_claim_counts_org_stage\` (\`organization_id\`, \`stage\`, \`n\`), PRIMARY KEY (\`id\`)) ENGINE=InnoDB`,
    );
    for (const [name, body] of TRIGGERS) await queryRunner.query(`CREATE TRIGGER \`${name}\` ${body}`);
    for (const side of ['contractor_id', 'manufacturer_id'])
      await queryRunner.query(
        `INSERT INTO \`claim_counts\` (\`organization_id\`, \`stage\`, \`n\`)
         SELECT \`${side}\`, \`stage\`, COUNT(*) FROM \`claims\` GROUP BY \`${side}\`, \`stage\``,
      );
  }

  public async down(queryRunner: QueryRunner): Promise<void> {
    for (const [name] of TRIGGERS) await queryRunner.query(`DROP TRIGGER IF EXISTS \`${name}\``);
    await queryRunner.query(`DROP INDEX \`ix_claim_counts_org_stage\` ON \`claim_counts\``);
    await queryRunner.query(`DROP TABLE \`claim_counts\``);
  }
}
