import type { MigrationInterface, QueryRunner } from 'typeorm';

// The claims' free-text search (server/lib/claim-search.ts): a `search_text` column on each claim holding its
// number, serials, site (name and city), contractor, product (model number and name) and narrative, with an InnoDB
// FULLTEXT index. Triggers keep it: a claim's own BEFORE INSERT / BEFORE UPDATE triggers compute it (an update
// only when one of its sources changed, or when the column is set to NULL, which asks for it again), and a change
// of a site, a contractor's name or a product's names sets it to NULL on that party's claims. Those refreshes
// assign `updated_at` to itself, so that they do not count as a change of the claim.
const searchText = (r: string) =>
  `CONCAT_WS(' ', ${r}.\`number\`, ${r}.\`serials\`,
     (SELECT CONCAT_WS(' ', i.\`site_name\`, i.\`site_city\`) FROM \`installations\` i WHERE i.\`id\` = ${r}.\`installation_id\`),
     (SELECT o.\`name\` FROM \`organizations\` o WHERE o.\`id\` = ${r}.\`contractor_id\`),
     (SELECT CONCAT_WS(' ', p.\`model_number\`, p.\`name\`) FROM \`product_models\` p WHERE p.\`id\` = ${r}.\`product_model_id\`),
     ${r}.\`narrative\`)`;

const SOURCES = ['number', 'serials', 'installation_id', 'contractor_id', 'product_model_id', 'narrative'];

const TRIGGERS: [string, string][] = [
  [
    'claims_search_insert',
    `BEFORE INSERT ON \`claims\` FOR EACH ROW SET NEW.\`search_text\` = ${searchText('NEW')}`,
  ],
  [
    'claims_search_update',
    `BEFORE UPDATE ON \`claims\` FOR EACH ROW
     IF NEW.\`search_text\` IS NULL OR NOT (${SOURCES.map((c) => `OLD.\`${c}\` <=> NEW.\`${c}\``).join(' AND ')}) THEN
       SET NEW.\`search_text\` = ${searchText('NEW')};
     END IF`,
  ],
  [
    'installations_search_update',
    `AFTER UPDATE ON \`installations\` FOR EACH ROW
     IF NOT (OLD.\`site_name\` <=> NEW.\`site_name\` AND OLD.\`site_city\` <=> NEW.\`site_city\`) THEN
       UPDATE \`claims\` SET \`search_text\` = NULL, \`updated_at\` = \`updated_at\` WHERE \`installation_id\` = NEW.\`id\`;
     END IF`,
  ],
  [
    'organizations_search_update',
    `AFTER UPDATE ON \`organizations\` FOR EACH ROW
     IF NOT (OLD.\`name\` <=> NEW.\`name\`) THEN
       UPDATE \`claims\` SET \`search_text\` = NULL, \`updated_at\` = \`updated_at\` WHERE \`contractor_id\` = NEW.\`id\`;
     END IF`,
  ],
  [
    'product_models_search_update',
    `AFTER UPDATE ON \`product_models\` FOR EACH ROW
     IF NOT (OLD.\`model_number\` <=> NEW.\`model_number\` AND OLD.\`name\` <=> NEW.\`name\`) THEN
       UPDATE \`claims\` SET \`search_text\` = NULL, \`updated_at\` = \`updated_at\` WHERE \`product_model_id\` = NEW.\`id\`;
     END IF`,
  ],
];

export class ClaimSearch1796290000000 implements MigrationInterface {
  name = 'ClaimSearch1796290000000';

  public async up(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(`ALTER TABLE \`claims\` ADD \`search_text\` text NULL`);
    for (const [name, body] of TRIGGERS) await queryRunner.query(`CREATE TRIGGER \`${name}\` ${body}`);
    await queryRunner.query(`UPDATE \`claims\` SET \`search_text\` = NULL, \`updated_at\` = \`updated_at\``);
    // No stopwords: "on", "for" or "the" in a site's name must be found. The list in force when the index is made
    // stays with it, so this session setting is all it takes, whatever the server's own setting.
    await queryRunner.query('SET SESSION innodb_ft_enable_stopword = OFF');
    await queryRunner.query(`CREATE FULLTEXT INDEX \`ft_claims_search\` ON \`claims\` (\`search_text\`)`);
    await queryRunner.query('SET SESSION innodb_ft_enable_stopword = ON');
  }

  public async down(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(`DROP INDEX \`ft_claims_search\` ON \`claims\``);
    for (const [name] of TRIGGERS) await queryRunner.query(`DROP TRIGGER IF EXISTS \`${name}\``);
    await queryRunner.query(`ALTER TABLE \`claims\` DROP COLUMN \`search_text\``);
  }
}
