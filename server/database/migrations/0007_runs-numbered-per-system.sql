ALTER TABLE `runs` ADD `number` int DEFAULT 0 NOT NULL;--> statement-breakpoint
ALTER TABLE `systems` ADD `last_run_number` int DEFAULT 0 NOT NULL;--> statement-breakpoint
UPDATE `runs` JOIN (SELECT `runs`.`id` AS `run_id`, ROW_NUMBER() OVER (PARTITION BY `revisions`.`system_id` ORDER BY `runs`.`id`) AS `n` FROM `runs` JOIN `revisions` ON `revisions`.`id` = `runs`.`revision_id`) AS `numbered` ON `numbered`.`run_id` = `runs`.`id` SET `runs`.`number` = `numbered`.`n`;--> statement-breakpoint
UPDATE `systems` SET `last_run_number` = (SELECT COALESCE(MAX(`runs`.`number`), 0) FROM `runs` JOIN `revisions` ON `revisions`.`id` = `runs`.`revision_id` WHERE `revisions`.`system_id` = `systems`.`id`);
