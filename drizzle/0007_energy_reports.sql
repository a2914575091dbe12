CREATE TABLE `energy_days` (
	`plug_id` varchar(36) NOT NULL,
	`day` date NOT NULL,
	`rate_key` varchar(36) NOT NULL DEFAULT '',
	`on_ms` bigint NOT NULL,
	`rated_watt_ms` bigint NOT NULL,
	`metered_ws` double,
	CONSTRAINT `energy_days_plug_id_day_rate_key_pk` PRIMARY KEY(`plug_id`,`day`,`rate_key`)
);
--> statement-breakpoint
CREATE TABLE `meter_samples` (
	`plug_id` varchar(36) NOT NULL,
	`at` datetime(3) NOT NULL,
	`watt_hours` bigint unsigned NOT NULL,
	CONSTRAINT `meter_samples_plug_id_at_pk` PRIMARY KEY(`plug_id`,`at`)
);
--> statement-breakpoint
ALTER TABLE `sites` ADD `degree_day_method` enum('uk_met_office','us_mean') DEFAULT 'uk_met_office' NOT NULL;--> statement-breakpoint
ALTER TABLE `sensors` ADD `placement` enum('inside','outside') DEFAULT 'inside' NOT NULL;--> statement-breakpoint
ALTER TABLE `switch_events` ADD `rated_watts` int;--> statement-breakpoint
ALTER TABLE `bill_periods` ADD `billed_kwh` decimal(12,3);--> statement-breakpoint
ALTER TABLE `bill_periods` ADD `billed_amount` decimal(12,2);--> statement-breakpoint
ALTER TABLE `bill_periods` ADD `updated_at` datetime(3) DEFAULT CURRENT_TIMESTAMP(3) NOT NULL;--> statement-breakpoint
ALTER TABLE `tariffs` ADD `tax_percent` decimal(5,2) DEFAULT 0 NOT NULL;--> statement-breakpoint
ALTER TABLE `bill_periods` ADD CONSTRAINT `bill_periods_site_dates_uq` UNIQUE(`site_id`,`starts_on`,`ends_on`);--> statement-breakpoint
-- The unique key serves the site's foreign key now; the old index can go.
DROP INDEX `bill_periods_site_idx` ON `bill_periods`;--> statement-breakpoint
-- Switches logged before rated watts were kept take the appliance's watts of today.
UPDATE `switch_events` e JOIN `plugs` p ON p.`id` = e.`plug_id` SET e.`rated_watts` = p.`appliance_watts` WHERE e.`rated_watts` IS NULL;--> statement-breakpoint
ALTER TABLE `energy_days` ADD CONSTRAINT `energy_days_plug_id_plugs_id_fk` FOREIGN KEY (`plug_id`) REFERENCES `plugs`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `meter_samples` ADD CONSTRAINT `meter_samples_plug_id_plugs_id_fk` FOREIGN KEY (`plug_id`) REFERENCES `plugs`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE INDEX `switch_events_cause_at_idx` ON `switch_events` (`cause`,`at`);