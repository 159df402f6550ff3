CREATE TABLE `datasets` (
	`id` int AUTO_INCREMENT NOT NULL,
	`system_id` int NOT NULL,
	`name` varchar(200) NOT NULL,
	`filename` varchar(255) NOT NULL,
	`columns` json NOT NULL,
	`rows` longtext NOT NULL,
	`row_count` int NOT NULL,
	`source` longtext NOT NULL,
	`sha256` varchar(64) NOT NULL,
	`created_by` int,
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `datasets_id` PRIMARY KEY(`id`),
	CONSTRAINT `datasets_system_name_unique` UNIQUE(`system_id`,`name`)
);
--> statement-breakpoint
ALTER TABLE `datasets` ADD CONSTRAINT `datasets_system_id_systems_id_fk` FOREIGN KEY (`system_id`) REFERENCES `systems`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `datasets` ADD CONSTRAINT `datasets_created_by_users_id_fk` FOREIGN KEY (`created_by`) REFERENCES `users`(`id`) ON DELETE set null ON UPDATE no action;