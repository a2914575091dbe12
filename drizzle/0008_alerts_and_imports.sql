CREATE TABLE `alert_notices` (
	`alert_id` bigint unsigned NOT NULL,
	`raised_at` datetime(3),
	`reminders` smallint NOT NULL DEFAULT 0,
	`last_reminder_at` datetime(3),
	`cleared_at` datetime(3),
	CONSTRAINT `alert_notices_alert_id` PRIMARY KEY(`alert_id`)
);
--> statement-breakpoint
CREATE TABLE `alert_preferences` (
	`site_id` varchar(36) NOT NULL,
	`user_id` varchar(36) NOT NULL,
	`kinds` json NOT NULL,
	`quiet_from` varchar(5),
	`quiet_until` varchar(5),
	`daily_summary` boolean NOT NULL DEFAULT false,
	`updated_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `alert_preferences_site_id_user_id_pk` PRIMARY KEY(`site_id`,`user_id`)
);
--> statement-breakpoint
CREATE TABLE `daily_summaries` (
	`site_id` varchar(36) NOT NULL,
	`day` date NOT NULL,
	`composed_at` datetime(3) NOT NULL,
	`recipients` int NOT NULL,
	CONSTRAINT `daily_summaries_site_id_day_pk` PRIMARY KEY(`site_id`,`day`)
);
--> statement-breakpoint
CREATE TABLE `house_alert_rules` (
	`house_id` varchar(36) NOT NULL,
	`rules` json NOT NULL,
	`updated_by` varchar(36),
	`updated_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `house_alert_rules_house_id` PRIMARY KEY(`house_id`)
);
--> statement-breakpoint
CREATE TABLE `outbound_mail` (
	`id` bigint unsigned AUTO_INCREMENT NOT NULL,
	`site_id` varchar(36) NOT NULL,
	`user_id` varchar(36),
	`to_address` varchar(254) NOT NULL,
	`purpose` enum('alert_raised','alert_reminder','alert_cleared','daily_summary') NOT NULL,
	`alert_id` bigint unsigned,
	`summary_day` date,
	`dedupe_key` varchar(160) NOT NULL,
	`subject` varchar(200) NOT NULL,
	`body_text` mediumtext NOT NULL,
	`body_html` mediumtext,
	`status` enum('waiting','held','sent','skipped','given_up') NOT NULL DEFAULT 'waiting',
	`due_at` datetime(3) NOT NULL,
	`attempts` int NOT NULL DEFAULT 0,
	`last_error` varchar(500),
	`last_tried_at` datetime(3),
	`sent_at` datetime(3),
	`created_at` datetime(3) NOT NULL,
	CONSTRAINT `outbound_mail_id` PRIMARY KEY(`id`),
	CONSTRAINT `outbound_mail_dedupe_uq` UNIQUE(`dedupe_key`)
);
--> statement-breakpoint
CREATE TABLE `reading_imports` (
	`id` bigint unsigned AUTO_INCREMENT NOT NULL,
	`site_id` varchar(36) NOT NULL,
	`sensor_id` varchar(36) NOT NULL,
	`file_name` varchar(255) NOT NULL,
	`file_sha256` varchar(64) NOT NULL,
	`options` json NOT NULL,
	`rows_read` int NOT NULL,
	`minutes_added` int NOT NULL,
	`minutes_already_there` int NOT NULL,
	`first_at` datetime(3),
	`last_at` datetime(3),
	`imported_by` varchar(36),
	`imported_at` datetime(3) NOT NULL,
	`note` text,
	CONSTRAINT `reading_imports_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
ALTER TABLE `alerts` MODIFY COLUMN `kind` enum('sensor_quiet','plug_unanswered','plug_offline','too_hot','too_cold','overload','too_warm','battery_low','plug_mismatch','condensation','heater_long_on','controller_silent') NOT NULL;--> statement-breakpoint
ALTER TABLE `sites` ADD `summary_time` varchar(5);--> statement-breakpoint
ALTER TABLE `alerts` ADD `cleared_message` varchar(280);--> statement-breakpoint
ALTER TABLE `alert_notices` ADD CONSTRAINT `alert_notices_alert_id_alerts_id_fk` FOREIGN KEY (`alert_id`) REFERENCES `alerts`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `alert_preferences` ADD CONSTRAINT `alert_preferences_site_id_sites_id_fk` FOREIGN KEY (`site_id`) REFERENCES `sites`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `alert_preferences` ADD CONSTRAINT `alert_preferences_user_id_user_id_fk` FOREIGN KEY (`user_id`) REFERENCES `user`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `daily_summaries` ADD CONSTRAINT `daily_summaries_site_id_sites_id_fk` FOREIGN KEY (`site_id`) REFERENCES `sites`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `house_alert_rules` ADD CONSTRAINT `house_alert_rules_house_id_houses_id_fk` FOREIGN KEY (`house_id`) REFERENCES `houses`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `house_alert_rules` ADD CONSTRAINT `house_alert_rules_updated_by_user_id_fk` FOREIGN KEY (`updated_by`) REFERENCES `user`(`id`) ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `outbound_mail` ADD CONSTRAINT `outbound_mail_site_id_sites_id_fk` FOREIGN KEY (`site_id`) REFERENCES `sites`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `outbound_mail` ADD CONSTRAINT `outbound_mail_user_id_user_id_fk` FOREIGN KEY (`user_id`) REFERENCES `user`(`id`) ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `outbound_mail` ADD CONSTRAINT `outbound_mail_alert_id_alerts_id_fk` FOREIGN KEY (`alert_id`) REFERENCES `alerts`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `reading_imports` ADD CONSTRAINT `reading_imports_site_id_sites_id_fk` FOREIGN KEY (`site_id`) REFERENCES `sites`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `reading_imports` ADD CONSTRAINT `reading_imports_sensor_id_sensors_id_fk` FOREIGN KEY (`sensor_id`) REFERENCES `sensors`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `reading_imports` ADD CONSTRAINT `reading_imports_imported_by_user_id_fk` FOREIGN KEY (`imported_by`) REFERENCES `user`(`id`) ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE INDEX `outbound_mail_due_idx` ON `outbound_mail` (`status`,`due_at`);--> statement-breakpoint
CREATE INDEX `outbound_mail_alert_idx` ON `outbound_mail` (`alert_id`);--> statement-breakpoint
CREATE INDEX `outbound_mail_site_idx` ON `outbound_mail` (`site_id`,`created_at`);--> statement-breakpoint
CREATE INDEX `reading_imports_sensor_idx` ON `reading_imports` (`sensor_id`,`imported_at`);--> statement-breakpoint
CREATE INDEX `alerts_cleared_idx` ON `alerts` (`cleared_at`);