CREATE TABLE `controller_heartbeats` (
	`instance_id` varchar(64) NOT NULL,
	`host` varchar(120) NOT NULL,
	`pid` int NOT NULL,
	`sites` varchar(1000),
	`started_at` datetime(3) NOT NULL,
	`beat_at` datetime(3) NOT NULL,
	`stopped_at` datetime(3),
	CONSTRAINT `controller_heartbeats_instance_id` PRIMARY KEY(`instance_id`)
);
--> statement-breakpoint
CREATE TABLE `plug_states` (
	`plug_id` varchar(36) NOT NULL,
	`on` boolean,
	`since` datetime(3),
	`switch_command_id` varchar(64),
	`present_cause` enum('safety','override','schedule','default','failsafe','plug_fallback','resync'),
	`pending_on` boolean,
	`pending_command_id` varchar(64),
	`pending_since` datetime(3),
	`guard_until` datetime(3),
	`reported_on` boolean,
	`reported_at` datetime(3),
	`watts` int,
	`watt_hours` int,
	`online` boolean NOT NULL DEFAULT false,
	`last_seen_at` datetime(3),
	`updated_at` datetime(3) NOT NULL,
	CONSTRAINT `plug_states_plug_id` PRIMARY KEY(`plug_id`)
);
--> statement-breakpoint
CREATE TABLE `sensor_states` (
	`sensor_id` varchar(36) NOT NULL,
	`online` boolean NOT NULL DEFAULT false,
	`last_seen_at` datetime(3),
	`updated_at` datetime(3) NOT NULL,
	CONSTRAINT `sensor_states_sensor_id` PRIMARY KEY(`sensor_id`)
);
--> statement-breakpoint
ALTER TABLE `plugs` MODIFY COLUMN `held_by` enum('safety','override','schedule','default','failsafe','plug_fallback','resync');--> statement-breakpoint
ALTER TABLE `switch_events` MODIFY COLUMN `cause` enum('safety','override','schedule','default','failsafe','plug_fallback','resync') NOT NULL;--> statement-breakpoint
ALTER TABLE `sites` ADD `continuous_load_percent` tinyint DEFAULT 80 NOT NULL;--> statement-breakpoint
ALTER TABLE `plug_states` ADD CONSTRAINT `plug_states_plug_id_plugs_id_fk` FOREIGN KEY (`plug_id`) REFERENCES `plugs`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `sensor_states` ADD CONSTRAINT `sensor_states_sensor_id_sensors_id_fk` FOREIGN KEY (`sensor_id`) REFERENCES `sensors`(`id`) ON DELETE cascade ON UPDATE no action;