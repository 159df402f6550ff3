CREATE TABLE `run_parts` (
	`id` int AUTO_INCREMENT NOT NULL,
	`run_id` int NOT NULL,
	`first_point` int NOT NULL,
	`point_count` int NOT NULL,
	`failed_points` int NOT NULL DEFAULT 0,
	`body` longtext NOT NULL,
	CONSTRAINT `run_parts_id` PRIMARY KEY(`id`),
	CONSTRAINT `run_parts_run_first_unique` UNIQUE(`run_id`,`first_point`)
);
--> statement-breakpoint
ALTER TABLE `runs` MODIFY COLUMN `status` enum('ok','failed','diverged');--> statement-breakpoint
ALTER TABLE `runs` ADD `job_status` enum('queued','running','done','failed','cancelled') DEFAULT 'done' NOT NULL;--> statement-breakpoint
ALTER TABLE `runs` ADD `job_id` varchar(64);--> statement-breakpoint
ALTER TABLE `runs` ADD `queued_at` datetime(3);--> statement-breakpoint
ALTER TABLE `runs` ADD `started_at` datetime(3);--> statement-breakpoint
ALTER TABLE `runs` ADD `finished_at` datetime(3);--> statement-breakpoint
ALTER TABLE `runs` ADD `worker` varchar(120);--> statement-breakpoint
ALTER TABLE `runs` ADD `points_done` int DEFAULT 0 NOT NULL;--> statement-breakpoint
ALTER TABLE `runs` ADD `points_total` int DEFAULT 0 NOT NULL;--> statement-breakpoint
ALTER TABLE `runs` ADD `cancel_requested_at` datetime(3);--> statement-breakpoint
ALTER TABLE `runs` ADD `job_error` varchar(1000);--> statement-breakpoint
ALTER TABLE `run_parts` ADD CONSTRAINT `run_parts_run_id_runs_id_fk` FOREIGN KEY (`run_id`) REFERENCES `runs`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE INDEX `runs_created_by_job_idx` ON `runs` (`created_by`,`job_status`);