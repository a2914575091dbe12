-- A plug that switched by itself was logged with the cause of the controller's
-- quiet-sensor rule; it has its own cause now. Those rows are the observed ones.
UPDATE `switch_events` SET `cause` = 'plug_fallback' WHERE `cause` = 'failsafe' AND `command_id` LIKE 'observed-%';
--> statement-breakpoint
UPDATE `plugs` SET `held_by` = 'plug_fallback' WHERE `held_by` = 'failsafe' AND EXISTS (
  SELECT 1 FROM `switch_events` e WHERE e.`plug_id` = `plugs`.`id` AND e.`cause` = 'plug_fallback'
  AND e.`id` = (SELECT MAX(e2.`id`) FROM `switch_events` e2 WHERE e2.`plug_id` = `plugs`.`id` AND e2.`withdrawn_at` IS NULL)
);
--> statement-breakpoint
-- Present state moves to the controller's own tables. A plug's state is the end of its
-- log's chain: its last kept switch if confirmed, otherwise that switch is still on its way.
INSERT INTO `plug_states` (`plug_id`, `on`, `since`, `switch_command_id`, `present_cause`, `pending_on`, `pending_command_id`, `pending_since`, `online`, `last_seen_at`, `updated_at`)
SELECT p.`id`,
  CASE WHEN e.`ack_at` IS NULL THEN e.`from_on` ELSE e.`to_on` END,
  CASE WHEN e.`ack_at` IS NULL THEN NULL ELSE e.`ack_at` END,
  CASE WHEN e.`ack_at` IS NULL THEN NULL ELSE e.`command_id` END,
  p.`held_by`,
  CASE WHEN e.`ack_at` IS NULL THEN e.`to_on` ELSE NULL END,
  CASE WHEN e.`ack_at` IS NULL THEN e.`command_id` ELSE NULL END,
  CASE WHEN e.`ack_at` IS NULL THEN e.`at` ELSE NULL END,
  p.`online`, p.`last_seen_at`, CURRENT_TIMESTAMP(3)
FROM `plugs` p
LEFT JOIN `switch_events` e ON e.`id` = (
  SELECT e2.`id` FROM `switch_events` e2 WHERE e2.`plug_id` = p.`id` AND e2.`withdrawn_at` IS NULL ORDER BY e2.`at` DESC, e2.`id` DESC LIMIT 1
);
--> statement-breakpoint
INSERT INTO `sensor_states` (`sensor_id`, `online`, `last_seen_at`, `updated_at`)
SELECT `id`, `online`, `last_seen_at`, CURRENT_TIMESTAMP(3) FROM `sensors`;
