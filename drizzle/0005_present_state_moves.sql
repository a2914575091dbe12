ALTER TABLE `plug_states` MODIFY COLUMN `watt_hours` bigint unsigned;--> statement-breakpoint
ALTER TABLE `plugs` DROP COLUMN `online`;--> statement-breakpoint
ALTER TABLE `plugs` DROP COLUMN `last_seen_at`;--> statement-breakpoint
ALTER TABLE `plugs` DROP COLUMN `held_by`;--> statement-breakpoint
ALTER TABLE `sensors` DROP COLUMN `online`;--> statement-breakpoint
ALTER TABLE `sensors` DROP COLUMN `last_seen_at`;