CREATE TABLE `account` (
	`id` varchar(36) NOT NULL,
	`account_id` varchar(255) NOT NULL,
	`provider_id` varchar(64) NOT NULL,
	`user_id` varchar(36) NOT NULL,
	`access_token` text,
	`refresh_token` text,
	`id_token` text,
	`access_token_expires_at` datetime(3),
	`refresh_token_expires_at` datetime(3),
	`scope` text,
	`password` text,
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	`updated_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `account_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
CREATE TABLE `session` (
	`id` varchar(36) NOT NULL,
	`expires_at` datetime(3) NOT NULL,
	`token` varchar(255) NOT NULL,
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	`updated_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	`ip_address` varchar(64),
	`user_agent` text,
	`user_id` varchar(36) NOT NULL,
	CONSTRAINT `session_id` PRIMARY KEY(`id`),
	CONSTRAINT `session_token_unique` UNIQUE(`token`)
);
--> statement-breakpoint
CREATE TABLE `user` (
	`id` varchar(36) NOT NULL,
	`name` varchar(120) NOT NULL,
	`email` varchar(255) NOT NULL,
	`email_verified` boolean NOT NULL DEFAULT false,
	`image` text,
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	`updated_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `user_id` PRIMARY KEY(`id`),
	CONSTRAINT `user_email_unique` UNIQUE(`email`)
);
--> statement-breakpoint
CREATE TABLE `verification` (
	`id` varchar(36) NOT NULL,
	`identifier` varchar(255) NOT NULL,
	`value` text NOT NULL,
	`expires_at` datetime(3) NOT NULL,
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	`updated_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `verification_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
CREATE TABLE `memberships` (
	`id` varchar(36) NOT NULL,
	`site_id` varchar(36) NOT NULL,
	`user_id` varchar(36) NOT NULL,
	`role` enum('owner','grower','helper','viewer') NOT NULL,
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	`updated_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `memberships_id` PRIMARY KEY(`id`),
	CONSTRAINT `memberships_site_user_uq` UNIQUE(`site_id`,`user_id`)
);
--> statement-breakpoint
CREATE TABLE `sites` (
	`id` varchar(36) NOT NULL,
	`slug` varchar(64) NOT NULL,
	`name` varchar(120) NOT NULL,
	`time_zone` varchar(64) NOT NULL,
	`currency` char(3) NOT NULL,
	`mains_voltage` smallint NOT NULL DEFAULT 230,
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	`updated_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `sites_id` PRIMARY KEY(`id`),
	CONSTRAINT `sites_slug_unique` UNIQUE(`slug`)
);
--> statement-breakpoint
CREATE TABLE `houses` (
	`id` varchar(36) NOT NULL,
	`site_id` varchar(36) NOT NULL,
	`name` varchar(80) NOT NULL,
	`kind` enum('glasshouse','polytunnel','propagation','other') NOT NULL,
	`length_m` decimal(6,2) NOT NULL,
	`width_m` decimal(6,2) NOT NULL,
	`eave_height_m` decimal(5,2) NOT NULL,
	`ridge_height_m` decimal(5,2) NOT NULL,
	`glazing` enum('single_glass','double_glass','single_film','double_film_inflated','twin_wall_polycarbonate','single_rigid_plastic') NOT NULL,
	`air_changes_per_hour` decimal(4,2) NOT NULL DEFAULT 1,
	`high_limit_c` decimal(4,1) NOT NULL DEFAULT 35,
	`notes` text,
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	`updated_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `houses_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
CREATE TABLE `device_credentials` (
	`id` varchar(36) NOT NULL,
	`site_id` varchar(36) NOT NULL,
	`device_kind` enum('plug','sensor','controller','webapp') NOT NULL,
	`device_id` varchar(64) NOT NULL,
	`username` varchar(160) NOT NULL,
	`secret_hash` varchar(255) NOT NULL,
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	`revoked_at` datetime(3),
	CONSTRAINT `device_credentials_id` PRIMARY KEY(`id`),
	CONSTRAINT `device_credentials_username_unique` UNIQUE(`username`)
);
--> statement-breakpoint
CREATE TABLE `plugs` (
	`id` varchar(36) NOT NULL,
	`site_id` varchar(36) NOT NULL,
	`house_id` varchar(36) NOT NULL,
	`device_id` varchar(64) NOT NULL,
	`name` varchar(80) NOT NULL,
	`appliance_kind` enum('heater','fan','light','other') NOT NULL,
	`appliance_watts` int NOT NULL,
	`rated_current_a` decimal(4,1) NOT NULL,
	`meters_energy` boolean NOT NULL DEFAULT false,
	`sensor_id` varchar(36),
	`failsafe` enum('off','on','duty') NOT NULL DEFAULT 'off',
	`failsafe_duty_percent` tinyint,
	`failsafe_duty_period_s` smallint NOT NULL DEFAULT 1200,
	`stale_after_s` int NOT NULL DEFAULT 600,
	`outside_windows` enum('off','frost') NOT NULL DEFAULT 'off',
	`frost_low_c` decimal(4,1),
	`frost_high_c` decimal(4,1),
	`min_on_s` int NOT NULL DEFAULT 180,
	`min_off_s` int NOT NULL DEFAULT 180,
	`lease_s` int NOT NULL DEFAULT 900,
	`online` boolean NOT NULL DEFAULT false,
	`last_seen_at` datetime(3),
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	`updated_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `plugs_id` PRIMARY KEY(`id`),
	CONSTRAINT `plugs_site_device_uq` UNIQUE(`site_id`,`device_id`)
);
--> statement-breakpoint
CREATE TABLE `sensors` (
	`id` varchar(36) NOT NULL,
	`site_id` varchar(36) NOT NULL,
	`house_id` varchar(36) NOT NULL,
	`device_id` varchar(64) NOT NULL,
	`name` varchar(80) NOT NULL,
	`online` boolean NOT NULL DEFAULT false,
	`last_seen_at` datetime(3),
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	`updated_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `sensors_id` PRIMARY KEY(`id`),
	CONSTRAINT `sensors_site_device_uq` UNIQUE(`site_id`,`device_id`)
);
--> statement-breakpoint
CREATE TABLE `reading_minutes` (
	`sensor_id` varchar(36) NOT NULL,
	`minute` datetime(3) NOT NULL,
	`samples` int NOT NULL,
	`temp_min_c` decimal(5,2),
	`temp_max_c` decimal(5,2),
	`temp_mean_c` decimal(5,2),
	`rh_mean` decimal(5,2),
	CONSTRAINT `reading_minutes_sensor_id_minute_pk` PRIMARY KEY(`sensor_id`,`minute`)
);
--> statement-breakpoint
CREATE TABLE `readings` (
	`id` bigint unsigned AUTO_INCREMENT NOT NULL,
	`sensor_id` varchar(36) NOT NULL,
	`at` datetime(3) NOT NULL,
	`temp_c` decimal(5,2),
	`rh` decimal(5,2),
	`battery` decimal(4,3),
	CONSTRAINT `readings_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
CREATE TABLE `schedule_exceptions` (
	`id` varchar(36) NOT NULL,
	`schedule_id` varchar(36) NOT NULL,
	`day` date NOT NULL,
	`note` text,
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `schedule_exceptions_id` PRIMARY KEY(`id`),
	CONSTRAINT `schedule_exceptions_day_uq` UNIQUE(`schedule_id`,`day`)
);
--> statement-breakpoint
CREATE TABLE `schedule_windows` (
	`id` varchar(36) NOT NULL,
	`schedule_id` varchar(36) NOT NULL,
	`recurrence` varchar(255) NOT NULL,
	`starts_at` time NOT NULL,
	`duration_min` smallint unsigned NOT NULL,
	`mode` enum('band','on','off') NOT NULL,
	`low_c` decimal(4,1),
	`high_c` decimal(4,1),
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	`updated_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `schedule_windows_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
CREATE TABLE `schedules` (
	`id` varchar(36) NOT NULL,
	`plug_id` varchar(36) NOT NULL,
	`name` varchar(80) NOT NULL,
	`valid_from` date,
	`valid_until` date,
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	`updated_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `schedules_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
CREATE TABLE `overrides` (
	`id` varchar(36) NOT NULL,
	`plug_id` varchar(36) NOT NULL,
	`on` boolean NOT NULL,
	`starts_at` datetime(3) NOT NULL,
	`ends_at` datetime(3),
	`until_next_change` boolean NOT NULL DEFAULT false,
	`user_id` varchar(36),
	`reason` varchar(280) NOT NULL,
	`cancelled_at` datetime(3),
	`cancelled_by` varchar(36),
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `overrides_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
CREATE TABLE `switch_events` (
	`id` bigint unsigned AUTO_INCREMENT NOT NULL,
	`plug_id` varchar(36) NOT NULL,
	`at` datetime(3) NOT NULL,
	`from_on` boolean,
	`to_on` boolean NOT NULL,
	`cause` enum('safety','override','schedule','default','failsafe','resync') NOT NULL,
	`reading_temp_c` decimal(5,2),
	`reading_at` datetime(3),
	`user_id` varchar(36),
	`override_id` varchar(36),
	`command_id` varchar(64) NOT NULL,
	`ack_at` datetime(3),
	`latency_ms` int,
	CONSTRAINT `switch_events_id` PRIMARY KEY(`id`),
	CONSTRAINT `switch_events_command_id_unique` UNIQUE(`command_id`)
);
--> statement-breakpoint
CREATE TABLE `bill_periods` (
	`id` varchar(36) NOT NULL,
	`site_id` varchar(36) NOT NULL,
	`starts_on` date NOT NULL,
	`ends_on` date NOT NULL,
	`label` varchar(80),
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `bill_periods_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
CREATE TABLE `tariff_rates` (
	`id` varchar(36) NOT NULL,
	`tariff_id` varchar(36) NOT NULL,
	`label` varchar(40) NOT NULL,
	`starts_at` time NOT NULL,
	`ends_at` time NOT NULL,
	`days` varchar(32) NOT NULL DEFAULT 'MO,TU,WE,TH,FR,SA,SU',
	`price_per_kwh` decimal(10,5) NOT NULL,
	CONSTRAINT `tariff_rates_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
CREATE TABLE `tariffs` (
	`id` varchar(36) NOT NULL,
	`site_id` varchar(36) NOT NULL,
	`name` varchar(80) NOT NULL,
	`kind` enum('flat','time_of_use') NOT NULL,
	`standing_charge_per_day` decimal(10,4) NOT NULL,
	`valid_from` date NOT NULL,
	`valid_until` date,
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	`updated_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `tariffs_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
CREATE TABLE `alerts` (
	`id` bigint unsigned AUTO_INCREMENT NOT NULL,
	`site_id` varchar(36) NOT NULL,
	`house_id` varchar(36),
	`plug_id` varchar(36),
	`sensor_id` varchar(36),
	`kind` enum('sensor_quiet','plug_unanswered','plug_offline','too_hot','too_cold','overload') NOT NULL,
	`message` varchar(280) NOT NULL,
	`detail` json,
	`raised_at` datetime(3) NOT NULL,
	`cleared_at` datetime(3),
	`acknowledged_at` datetime(3),
	`acknowledged_by` varchar(36),
	CONSTRAINT `alerts_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
CREATE TABLE `audit_log` (
	`id` bigint unsigned AUTO_INCREMENT NOT NULL,
	`site_id` varchar(36) NOT NULL,
	`user_id` varchar(36),
	`at` datetime(3) NOT NULL,
	`action` varchar(64) NOT NULL,
	`entity_type` varchar(32) NOT NULL,
	`entity_id` varchar(36) NOT NULL,
	`before` json,
	`after` json,
	CONSTRAINT `audit_log_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
ALTER TABLE `account` ADD CONSTRAINT `account_user_id_user_id_fk` FOREIGN KEY (`user_id`) REFERENCES `user`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `session` ADD CONSTRAINT `session_user_id_user_id_fk` FOREIGN KEY (`user_id`) REFERENCES `user`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `memberships` ADD CONSTRAINT `memberships_site_id_sites_id_fk` FOREIGN KEY (`site_id`) REFERENCES `sites`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `memberships` ADD CONSTRAINT `memberships_user_id_user_id_fk` FOREIGN KEY (`user_id`) REFERENCES `user`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `houses` ADD CONSTRAINT `houses_site_id_sites_id_fk` FOREIGN KEY (`site_id`) REFERENCES `sites`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `device_credentials` ADD CONSTRAINT `device_credentials_site_id_sites_id_fk` FOREIGN KEY (`site_id`) REFERENCES `sites`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `plugs` ADD CONSTRAINT `plugs_site_id_sites_id_fk` FOREIGN KEY (`site_id`) REFERENCES `sites`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `plugs` ADD CONSTRAINT `plugs_house_id_houses_id_fk` FOREIGN KEY (`house_id`) REFERENCES `houses`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `plugs` ADD CONSTRAINT `plugs_sensor_id_sensors_id_fk` FOREIGN KEY (`sensor_id`) REFERENCES `sensors`(`id`) ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `sensors` ADD CONSTRAINT `sensors_site_id_sites_id_fk` FOREIGN KEY (`site_id`) REFERENCES `sites`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `sensors` ADD CONSTRAINT `sensors_house_id_houses_id_fk` FOREIGN KEY (`house_id`) REFERENCES `houses`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `reading_minutes` ADD CONSTRAINT `reading_minutes_sensor_id_sensors_id_fk` FOREIGN KEY (`sensor_id`) REFERENCES `sensors`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `readings` ADD CONSTRAINT `readings_sensor_id_sensors_id_fk` FOREIGN KEY (`sensor_id`) REFERENCES `sensors`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `schedule_exceptions` ADD CONSTRAINT `schedule_exceptions_schedule_id_schedules_id_fk` FOREIGN KEY (`schedule_id`) REFERENCES `schedules`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `schedule_windows` ADD CONSTRAINT `schedule_windows_schedule_id_schedules_id_fk` FOREIGN KEY (`schedule_id`) REFERENCES `schedules`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `schedules` ADD CONSTRAINT `schedules_plug_id_plugs_id_fk` FOREIGN KEY (`plug_id`) REFERENCES `plugs`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `overrides` ADD CONSTRAINT `overrides_plug_id_plugs_id_fk` FOREIGN KEY (`plug_id`) REFERENCES `plugs`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `overrides` ADD CONSTRAINT `overrides_user_id_user_id_fk` FOREIGN KEY (`user_id`) REFERENCES `user`(`id`) ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `overrides` ADD CONSTRAINT `overrides_cancelled_by_user_id_fk` FOREIGN KEY (`cancelled_by`) REFERENCES `user`(`id`) ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `switch_events` ADD CONSTRAINT `switch_events_plug_id_plugs_id_fk` FOREIGN KEY (`plug_id`) REFERENCES `plugs`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `switch_events` ADD CONSTRAINT `switch_events_user_id_user_id_fk` FOREIGN KEY (`user_id`) REFERENCES `user`(`id`) ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `switch_events` ADD CONSTRAINT `switch_events_override_id_overrides_id_fk` FOREIGN KEY (`override_id`) REFERENCES `overrides`(`id`) ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `bill_periods` ADD CONSTRAINT `bill_periods_site_id_sites_id_fk` FOREIGN KEY (`site_id`) REFERENCES `sites`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `tariff_rates` ADD CONSTRAINT `tariff_rates_tariff_id_tariffs_id_fk` FOREIGN KEY (`tariff_id`) REFERENCES `tariffs`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `tariffs` ADD CONSTRAINT `tariffs_site_id_sites_id_fk` FOREIGN KEY (`site_id`) REFERENCES `sites`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `alerts` ADD CONSTRAINT `alerts_site_id_sites_id_fk` FOREIGN KEY (`site_id`) REFERENCES `sites`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `alerts` ADD CONSTRAINT `alerts_house_id_houses_id_fk` FOREIGN KEY (`house_id`) REFERENCES `houses`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `alerts` ADD CONSTRAINT `alerts_plug_id_plugs_id_fk` FOREIGN KEY (`plug_id`) REFERENCES `plugs`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `alerts` ADD CONSTRAINT `alerts_sensor_id_sensors_id_fk` FOREIGN KEY (`sensor_id`) REFERENCES `sensors`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `alerts` ADD CONSTRAINT `alerts_acknowledged_by_user_id_fk` FOREIGN KEY (`acknowledged_by`) REFERENCES `user`(`id`) ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `audit_log` ADD CONSTRAINT `audit_log_site_id_sites_id_fk` FOREIGN KEY (`site_id`) REFERENCES `sites`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `audit_log` ADD CONSTRAINT `audit_log_user_id_user_id_fk` FOREIGN KEY (`user_id`) REFERENCES `user`(`id`) ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE INDEX `account_user_idx` ON `account` (`user_id`);--> statement-breakpoint
CREATE INDEX `session_user_idx` ON `session` (`user_id`);--> statement-breakpoint
CREATE INDEX `verification_identifier_idx` ON `verification` (`identifier`);--> statement-breakpoint
CREATE INDEX `memberships_user_idx` ON `memberships` (`user_id`);--> statement-breakpoint
CREATE INDEX `houses_site_idx` ON `houses` (`site_id`);--> statement-breakpoint
CREATE INDEX `device_credentials_device_idx` ON `device_credentials` (`site_id`,`device_id`);--> statement-breakpoint
CREATE INDEX `plugs_house_idx` ON `plugs` (`house_id`);--> statement-breakpoint
CREATE INDEX `sensors_house_idx` ON `sensors` (`house_id`);--> statement-breakpoint
CREATE INDEX `reading_minutes_minute_idx` ON `reading_minutes` (`minute`);--> statement-breakpoint
CREATE INDEX `readings_sensor_at_idx` ON `readings` (`sensor_id`,`at`);--> statement-breakpoint
CREATE INDEX `readings_at_idx` ON `readings` (`at`);--> statement-breakpoint
CREATE INDEX `schedule_windows_schedule_idx` ON `schedule_windows` (`schedule_id`);--> statement-breakpoint
CREATE INDEX `schedules_plug_idx` ON `schedules` (`plug_id`);--> statement-breakpoint
CREATE INDEX `overrides_plug_starts_idx` ON `overrides` (`plug_id`,`starts_at`);--> statement-breakpoint
CREATE INDEX `switch_events_plug_at_idx` ON `switch_events` (`plug_id`,`at`);--> statement-breakpoint
CREATE INDEX `switch_events_at_idx` ON `switch_events` (`at`);--> statement-breakpoint
CREATE INDEX `bill_periods_site_idx` ON `bill_periods` (`site_id`,`starts_on`);--> statement-breakpoint
CREATE INDEX `tariff_rates_tariff_idx` ON `tariff_rates` (`tariff_id`);--> statement-breakpoint
CREATE INDEX `tariffs_site_idx` ON `tariffs` (`site_id`,`valid_from`);--> statement-breakpoint
CREATE INDEX `alerts_site_raised_idx` ON `alerts` (`site_id`,`raised_at`);--> statement-breakpoint
CREATE INDEX `audit_log_site_at_idx` ON `audit_log` (`site_id`,`at`);