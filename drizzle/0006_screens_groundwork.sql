CREATE TABLE `invitations` (
	`id` varchar(36) NOT NULL,
	`site_id` varchar(36) NOT NULL,
	`email` varchar(255) NOT NULL,
	`role` enum('owner','grower','helper','viewer') NOT NULL,
	`token_hash` varchar(64) NOT NULL,
	`invited_by` varchar(36),
	`expires_at` datetime(3) NOT NULL,
	`accepted_at` datetime(3),
	`accepted_by` varchar(36),
	`withdrawn_at` datetime(3),
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `invitations_id` PRIMARY KEY(`id`),
	CONSTRAINT `invitations_token_uq` UNIQUE(`token_hash`)
);
--> statement-breakpoint
CREATE TABLE `user_settings` (
	`user_id` varchar(36) NOT NULL,
	`temperature_unit` enum('c','f') NOT NULL DEFAULT 'c',
	`updated_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `user_settings_user_id` PRIMARY KEY(`user_id`)
);
--> statement-breakpoint
ALTER TABLE `houses` ADD `low_limit_c` decimal(4,1) DEFAULT 2 NOT NULL;--> statement-breakpoint
ALTER TABLE `plugs` ADD `retired_at` datetime(3);--> statement-breakpoint
ALTER TABLE `sensors` ADD `retired_at` datetime(3);--> statement-breakpoint
ALTER TABLE `invitations` ADD CONSTRAINT `invitations_site_id_sites_id_fk` FOREIGN KEY (`site_id`) REFERENCES `sites`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `invitations` ADD CONSTRAINT `invitations_invited_by_user_id_fk` FOREIGN KEY (`invited_by`) REFERENCES `user`(`id`) ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `invitations` ADD CONSTRAINT `invitations_accepted_by_user_id_fk` FOREIGN KEY (`accepted_by`) REFERENCES `user`(`id`) ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `user_settings` ADD CONSTRAINT `user_settings_user_id_user_id_fk` FOREIGN KEY (`user_id`) REFERENCES `user`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE INDEX `invitations_site_idx` ON `invitations` (`site_id`,`created_at`);--> statement-breakpoint
CREATE INDEX `audit_log_site_user_at_idx` ON `audit_log` (`site_id`,`user_id`,`at`);--> statement-breakpoint
CREATE INDEX `audit_log_site_entity_at_idx` ON `audit_log` (`site_id`,`entity_type`,`at`);