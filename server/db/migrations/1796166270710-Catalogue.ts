import type { MigrationInterface, QueryRunner } from 'typeorm';

export class Catalogue1796166270710 implements MigrationInterface {
  name = 'Catalogue1796166270710';

  public async up(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(
      `CREATE TABLE \`product_models\` (\`id\` uuid NOT NULL, \`manufacturer_id\` uuid NOT NULL, \`model_number\` varchar(64) NOT NULL, \`name\` varchar(160) NOT NULL, \`family\` enum ('high_bay', 'wall_pack', 'troffer', 'corn_lamp', 'flood', 'strip', 'other') NOT NULL, \`rated_input_watts\` double NOT NULL, \`input_volts_min\` double NOT NULL, \`input_volts_max\` double NOT NULL, \`rated_lumens\` int NOT NULL, \`led_strings\` int NOT NULL, \`leds_per_string\` int NOT NULL, \`led_forward_volts\` double NOT NULL, \`driver_output_amps\` double NOT NULL, \`driver_max_output_volts\` double NULL, \`location\` enum ('dry', 'damp', 'wet') NOT NULL, \`enclosed_rated\` tinyint NOT NULL, \`dimming\` enum ('none', 'phase', '0-10v', 'phase_or_0-10v') NOT NULL, \`ambient_max_c\` double NOT NULL, \`rated_life_hours\` int NOT NULL, \`active_cooling\` tinyint NOT NULL, \`created_at\` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(6), \`updated_at\` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(6) ON UPDATE CURRENT_TIMESTAMP(6), \`version\` int NOT NULL, INDEX \`ix_product_models_created\` (\`created_at\`), INDEX \`ix_product_models_lumens\` (\`rated_lumens\`), INDEX \`ix_product_models_watts\` (\`rated_input_watts\`), INDEX \`ix_product_models_name\` (\`name\`), INDEX \`ix_product_models_number\` (\`model_number\`), INDEX \`ix_product_models_dimming\` (\`dimming\`), INDEX \`ix_product_models_location\` (\`location\`), INDEX \`ix_product_models_family\` (\`family\`), INDEX \`ix_product_models_mfr_family\` (\`manufacturer_id\`, \`family\`), UNIQUE INDEX \`uq_product_models_mfr_number\` (\`manufacturer_id\`, \`model_number\`), PRIMARY KEY (\`id\`)) ENGINE=InnoDB`,
    );
    await queryRunner.query(
      `CREATE TABLE \`policy_models\` (\`policy_id\` uuid NOT NULL, \`product_model_id\` uuid NOT NULL, UNIQUE INDEX \`uq_policy_models_model\` (\`product_model_id\`), PRIMARY KEY (\`policy_id\`, \`product_model_id\`)) ENGINE=InnoDB`,
    );
    await queryRunner.query(
      `CREATE TABLE \`warranty_policies\` (\`id\` uuid NOT NULL, \`manufacturer_id\` uuid NOT NULL, \`name\` varchar(160) NOT NULL, \`latest_version_number\` int NOT NULL, \`created_at\` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(6), \`updated_at\` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(6) ON UPDATE CURRENT_TIMESTAMP(6), \`version\` int NOT NULL, INDEX \`ix_warranty_policies_created\` (\`created_at\`), INDEX \`ix_warranty_policies_updated\` (\`updated_at\`), INDEX \`ix_warranty_policies_name\` (\`name\`), UNIQUE INDEX \`uq_warranty_policies_mfr_name\` (\`manufacturer_id\`, \`name\`), PRIMARY KEY (\`id\`)) ENGINE=InnoDB`,
    );
    await queryRunner.query(
      `CREATE TABLE \`warranty_policy_versions\` (\`id\` uuid NOT NULL, \`policy_id\` uuid NOT NULL, \`version_number\` int NOT NULL, \`effective_from\` date NOT NULL, \`term_months\` int NOT NULL, \`full_coverage_months\` int NOT NULL, \`filing_window_days\` int NOT NULL, \`dark_led_failure_percent\` decimal(5,2) NOT NULL, \`unit_credit\` decimal(12,2) NOT NULL, \`currency\` char(3) NOT NULL, \`labour_allowance\` decimal(12,2) NOT NULL, \`required_photos\` int NOT NULL, \`proof_of_purchase_required\` tinyint NOT NULL, \`exclusions\` json NOT NULL, \`denial_reasons\` json NOT NULL, \`change_note\` varchar(500) NULL, \`created_by_id\` uuid NULL, \`created_at\` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(6), INDEX \`ix_policy_versions_effective\` (\`policy_id\`, \`effective_from\`), UNIQUE INDEX \`uq_policy_versions_number\` (\`policy_id\`, \`version_number\`), PRIMARY KEY (\`id\`)) ENGINE=InnoDB`,
    );
    await queryRunner.query(
      `CREATE TABLE \`installations\` (\`id\` uuid NOT NULL, \`contractor_id\` uuid NOT NULL, \`manufacturer_id\` uuid NOT NULL, \`product_model_id\` uuid NOT NULL, \`policy_version_id\` uuid NULL, \`site_name\` varchar(160) NOT NULL, \`site_address\` varchar(200) NOT NULL, \`site_city\` varchar(120) NOT NULL, \`site_region\` varchar(80) NOT NULL, \`site_postal_code\` varchar(20) NOT NULL, \`quantity\` int NOT NULL, \`install_date\` date NOT NULL, \`purchase_date\` date NULL, \`distributor\` varchar(160) NULL, \`invoice_number\` varchar(64) NULL, \`location\` enum ('dry', 'damp', 'wet') NOT NULL, \`enclosure\` enum ('open', 'enclosed', 'enclosed_ventilated') NOT NULL, \`dimmer\` enum ('none', 'phase', '0-10v') NOT NULL, \`nominal_supply_volts\` smallint NOT NULL, \`hours_per_day\` double NOT NULL, \`ambient_c\` double NOT NULL, \`created_by_id\` uuid NULL, \`created_at\` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(6), \`updated_at\` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(6) ON UPDATE CURRENT_TIMESTAMP(6), \`version\` int NOT NULL, INDEX \`ix_installations_city\` (\`site_city\`), INDEX \`ix_installations_quantity\` (\`quantity\`), INDEX \`ix_installations_supply\` (\`nominal_supply_volts\`), INDEX \`ix_installations_enclosure\` (\`enclosure\`), INDEX \`ix_installations_location\` (\`location\`), INDEX \`ix_installations_model_date\` (\`product_model_id\`, \`install_date\`), INDEX \`ix_installations_mfr_created\` (\`manufacturer_id\`, \`created_at\`), INDEX \`ix_installations_mfr_site\` (\`manufacturer_id\`, \`site_name\`), INDEX \`ix_installations_mfr_date\` (\`manufacturer_id\`, \`install_date\`), INDEX \`ix_installations_contractor_created\` (\`contractor_id\`, \`created_at\`), INDEX \`ix_installations_contractor_site\` (\`contractor_id\`, \`site_name\`), INDEX \`ix_installations_contractor_date\` (\`contractor_id\`, \`install_date\`), PRIMARY KEY (\`id\`)) ENGINE=InnoDB`,
    );
    await queryRunner.query(
      `CREATE TABLE \`installation_units\` (\`id\` uuid NOT NULL, \`manufacturer_id\` uuid NOT NULL, \`product_model_id\` uuid NOT NULL, \`installation_id\` uuid NOT NULL, \`serial\` varchar(64) NOT NULL, INDEX \`ix_installation_units_mfr_serial\` (\`manufacturer_id\`, \`serial\`), INDEX \`ix_installation_units_installation\` (\`installation_id\`), UNIQUE INDEX \`uq_installation_units_model_serial\` (\`product_model_id\`, \`serial\`), PRIMARY KEY (\`id\`)) ENGINE=InnoDB`,
    );
    await queryRunner.query(
      `ALTER TABLE \`organizations\` CHANGE \`created_at\` \`created_at\` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(6)`,
    );
    await queryRunner.query(
      `ALTER TABLE \`users\` CHANGE \`created_at\` \`created_at\` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(6)`,
    );
    await queryRunner.query(
      `ALTER TABLE \`users\` CHANGE \`updated_at\` \`updated_at\` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(6) ON UPDATE CURRENT_TIMESTAMP(6)`,
    );
    await queryRunner.query(
      `ALTER TABLE \`invitations\` CHANGE \`created_at\` \`created_at\` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(6)`,
    );
    await queryRunner.query(
      `ALTER TABLE \`outbox_messages\` CHANGE \`created_at\` \`created_at\` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(6)`,
    );
    await queryRunner.query(
      `ALTER TABLE \`product_models\` ADD CONSTRAINT \`FK_cc1cc6aa86308fe20c5cb38ec78\` FOREIGN KEY (\`manufacturer_id\`) REFERENCES \`organizations\`(\`id\`) ON DELETE RESTRICT ON UPDATE NO ACTION`,
    );
    await queryRunner.query(
      `ALTER TABLE \`policy_models\` ADD CONSTRAINT \`FK_b4d078af4c4c1e4514bf4ab597b\` FOREIGN KEY (\`policy_id\`) REFERENCES \`warranty_policies\`(\`id\`) ON DELETE CASCADE ON UPDATE NO ACTION`,
    );
    await queryRunner.query(
      `ALTER TABLE \`policy_models\` ADD CONSTRAINT \`FK_d5fc31ad10b8b0a64cb58c87d35\` FOREIGN KEY (\`product_model_id\`) REFERENCES \`product_models\`(\`id\`) ON DELETE RESTRICT ON UPDATE NO ACTION`,
    );
    await queryRunner.query(
      `ALTER TABLE \`warranty_policies\` ADD CONSTRAINT \`FK_ec1ab7fb420e4ff1fe939a3cd90\` FOREIGN KEY (\`manufacturer_id\`) REFERENCES \`organizations\`(\`id\`) ON DELETE RESTRICT ON UPDATE NO ACTION`,
    );
    await queryRunner.query(
      `ALTER TABLE \`warranty_policy_versions\` ADD CONSTRAINT \`FK_932c01a8a783c282bee0d8e142f\` FOREIGN KEY (\`policy_id\`) REFERENCES \`warranty_policies\`(\`id\`) ON DELETE RESTRICT ON UPDATE NO ACTION`,
    );
    await queryRunner.query(
      `ALTER TABLE \`installations\` ADD CONSTRAINT \`FK_b5bc5c1b5fd19daa328cdc71799\` FOREIGN KEY (\`contractor_id\`) REFERENCES \`organizations\`(\`id\`) ON DELETE RESTRICT ON UPDATE NO ACTION`,
    );
    await queryRunner.query(
      `ALTER TABLE \`installations\` ADD CONSTRAINT \`FK_28c99e9fd39ef39ea0a435caef9\` FOREIGN KEY (\`manufacturer_id\`) REFERENCES \`organizations\`(\`id\`) ON DELETE RESTRICT ON UPDATE NO ACTION`,
    );
    await queryRunner.query(
      `ALTER TABLE \`installations\` ADD CONSTRAINT \`FK_f3142e28c923cceda449d219b91\` FOREIGN KEY (\`product_model_id\`) REFERENCES \`product_models\`(\`id\`) ON DELETE RESTRICT ON UPDATE NO ACTION`,
    );
    await queryRunner.query(
      `ALTER TABLE \`installations\` ADD CONSTRAINT \`FK_a2d08a50a7b378efa687e591536\` FOREIGN KEY (\`policy_version_id\`) REFERENCES \`warranty_policy_versions\`(\`id\`) ON DELETE RESTRICT ON UPDATE NO ACTION`,
    );
    await queryRunner.query(
      `ALTER TABLE \`installation_units\` ADD CONSTRAINT \`FK_1d4c03527c11e2fb6a0fe150b8b\` FOREIGN KEY (\`product_model_id\`) REFERENCES \`product_models\`(\`id\`) ON DELETE RESTRICT ON UPDATE NO ACTION`,
    );
    await queryRunner.query(
      `ALTER TABLE \`installation_units\` ADD CONSTRAINT \`FK_eb0a194d7a4cdf55e7795fbfa0f\` FOREIGN KEY (\`installation_id\`) REFERENCES \`installations\`(\`id\`) ON DELETE CASCADE ON UPDATE NO ACTION`,
    );
  }

  public async down(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(
      `ALTER TABLE \`installation_units\` DROP FOREIGN KEY \`FK_eb0a194d7a4cdf55e7795fbfa0f\``,
    );
    await queryRunner.query(
      `ALTER TABLE \`installation_units\` DROP FOREIGN KEY \`FK_1d4c03527c11e2fb6a0fe150b8b\``,
    );
    await queryRunner.query(
      `ALTER TABLE \`installations\` DROP FOREIGN KEY \`FK_a2d08a50a7b378efa687e591536\``,
    );
    await queryRunner.query(
      `ALTER TABLE \`installations\` DROP FOREIGN KEY \`FK_f3142e28c923cceda449d219b91\``,
    );
    await queryRunner.query(
      `ALTER TABLE \`installations\` DROP FOREIGN KEY \`FK_28c99e9fd39ef39ea0a435caef9\``,
    );
    await queryRunner.query(
      `ALTER TABLE \`installations\` DROP FOREIGN KEY \`FK_b5bc5c1b5fd19daa328cdc71799\``,
    );
    await queryRunner.query(
      `ALTER TABLE \`warranty_policy_versions\` DROP FOREIGN KEY \`FK_932c01a8a783c282bee0d8e142f\``,
    );
    await queryRunner.query(
      `ALTER TABLE \`warranty_policies\` DROP FOREIGN KEY \`FK_ec1ab7fb420e4ff1fe939a3cd90\``,
    );
    await queryRunner.query(
      `ALTER TABLE \`policy_models\` DROP FOREIGN KEY \`FK_d5fc31ad10b8b0a64cb58c87d35\``,
    );
    await queryRunner.query(
      `ALTER TABLE \`policy_models\` DROP FOREIGN KEY \`FK_b4d078af4c4c1e4514bf4ab597b\``,
    );
    await queryRunner.query(
      `ALTER TABLE \`product_models\` DROP FOREIGN KEY \`FK_cc1cc6aa86308fe20c5cb38ec78\``,
    );
    await queryRunner.query(
      `ALTER TABLE \`outbox_messages\` CHANGE \`created_at\` \`created_at\` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3)`,
    );
    await queryRunner.query(
      `ALTER TABLE \`invitations\` CHANGE \`created_at\` \`created_at\` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3)`,
    );
    await queryRunner.query(
      `ALTER TABLE \`users\` CHANGE \`updated_at\` \`updated_at\` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3) ON UPDATE CURRENT_TIMESTAMP(3)`,
    );
    await queryRunner.query(
      `ALTER TABLE \`users\` CHANGE \`created_at\` \`created_at\` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3)`,
    );
    await queryRunner.query(
      `ALTER TABLE \`organizations\` CHANGE \`created_at\` \`created_at\` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3)`,
    );
    await queryRunner.query(`DROP INDEX \`uq_installation_units_model_serial\` ON \`installation_units\``);
    await queryRunner.query(`DROP INDEX \`ix_installation_units_installation\` ON \`installation_units\``);
    await queryRunner.query(`DROP INDEX \`ix_installation_units_mfr_serial\` ON \`installation_units\``);
    await queryRunner.query(`DROP TABLE \`installation_units\``);
    await queryRunner.query(`DROP INDEX \`ix_installations_contractor_date\` ON \`installations\``);
    await queryRunner.query(`DROP INDEX \`ix_installations_contractor_site\` ON \`installations\``);
    await queryRunner.query(`DROP INDEX \`ix_installations_contractor_created\` ON \`installations\``);
    await queryRunner.query(`DROP INDEX \`ix_installations_mfr_date\` ON \`installations\``);
    await queryRunner.query(`DROP INDEX \`ix_installations_mfr_site\` ON \`installations\``);
    await queryRunner.query(`DROP INDEX \`ix_installations_mfr_created\` ON \`installations\``);
    await queryRunner.query(`DROP INDEX \`ix_installations_model_date\` ON \`installations\``);
    await queryRunner.query(`DROP INDEX \`ix_installations_location\` ON \`installations\``);
    await queryRunner.query(`DROP INDEX \`ix_installations_enclosure\` ON \`installations\``);
    await queryRunner.query(`DROP INDEX \`ix_installations_supply\` ON \`installations\``);
    await queryRunner.query(`DROP INDEX \`ix_installations_quantity\` ON \`installations\``);
    await queryRunner.query(`DROP INDEX \`ix_installations_city\` ON \`installations\``);
    await queryRunner.query(`DROP TABLE \`installations\``);
    await queryRunner.query(`DROP INDEX \`uq_policy_versions_number\` ON \`warranty_policy_versions\``);
    await queryRunner.query(`DROP INDEX \`ix_policy_versions_effective\` ON \`warranty_policy_versions\``);
    await queryRunner.query(`DROP TABLE \`warranty_policy_versions\``);
    await queryRunner.query(`DROP INDEX \`uq_warranty_policies_mfr_name\` ON \`warranty_policies\``);
    await queryRunner.query(`DROP INDEX \`ix_warranty_policies_name\` ON \`warranty_policies\``);
    await queryRunner.query(`DROP INDEX \`ix_warranty_policies_updated\` ON \`warranty_policies\``);
    await queryRunner.query(`DROP INDEX \`ix_warranty_policies_created\` ON \`warranty_policies\``);
    await queryRunner.query(`DROP TABLE \`warranty_policies\``);
    await queryRunner.query(`DROP INDEX \`uq_policy_models_model\` ON \`policy_models\``);
    await queryRunner.query(`DROP TABLE \`policy_models\``);
    await queryRunner.query(`DROP INDEX \`uq_product_models_mfr_number\` ON \`product_models\``);
    await queryRunner.query(`DROP INDEX \`ix_product_models_mfr_family\` ON \`product_models\``);
    await queryRunner.query(`DROP INDEX \`ix_product_models_family\` ON \`product_models\``);
    await queryRunner.query(`DROP INDEX \`ix_product_models_location\` ON \`product_models\``);
    await queryRunner.query(`DROP INDEX \`ix_product_models_dimming\` ON \`product_models\``);
    await queryRunner.query(`DROP INDEX \`ix_product_models_number\` ON \`product_models\``);
    await queryRunner.query(`DROP INDEX \`ix_product_models_name\` ON \`product_models\``);
    await queryRunner.query(`DROP INDEX \`ix_product_models_watts\` ON \`product_models\``);
    await queryRunner.query(`DROP INDEX \`ix_product_models_lumens\` ON \`product_models\``);
    await queryRunner.query(`DROP INDEX \`ix_product_models_created\` ON \`product_models\``);
    await queryRunner.query(`DROP TABLE \`product_models\``);
  }
}
