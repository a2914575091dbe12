CREATE TABLE `device_traffic` (
	`site_id` varchar(36) NOT NULL,
	`device_kind` enum('plug','sensor') NOT NULL,
	`device_id` varchar(64) NOT NULL,
	`slowed` int NOT NULL DEFAULT 0,
	`oversized` int NOT NULL DEFAULT 0,
	`disconnected` int NOT NULL DEFAULT 0,
	`last_action` enum('slowed','oversized','disconnected'),
	`last_at` datetime(3),
	`updated_at` datetime(3) NOT NULL,
	CONSTRAINT `device_traffic_site_id_device_kind_device_id_pk` PRIMARY KEY(`site_id`,`device_kind`,`device_id`)
);
--> statement-breakpoint
ALTER TABLE `device_traffic` ADD CONSTRAINT `device_traffic_site_id_sites_id_fk` FOREIGN KEY (`site_id`) REFERENCES `sites`(`id`) ON DELETE cascade ON UPDATE no action;