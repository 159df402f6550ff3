CREATE TABLE `review_comments` (
	`id` int AUTO_INCREMENT NOT NULL,
	`review_id` int NOT NULL,
	`author_id` int,
	`side` enum('from','to') NOT NULL,
	`line` int NOT NULL,
	`body` text NOT NULL,
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `review_comments_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
CREATE TABLE `reviews` (
	`id` int AUTO_INCREMENT NOT NULL,
	`lab_id` int NOT NULL,
	`system_id` int NOT NULL,
	`from_revision_id` int NOT NULL,
	`to_revision_id` int NOT NULL,
	`requested_by` int,
	`reviewer_id` int NOT NULL,
	`state` enum('open','approved','changes_requested') NOT NULL DEFAULT 'open',
	`note` varchar(2000) NOT NULL DEFAULT '',
	`decision_note` varchar(2000) NOT NULL DEFAULT '',
	`decided_at` datetime(3),
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `reviews_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
ALTER TABLE `review_comments` ADD CONSTRAINT `review_comments_review_id_reviews_id_fk` FOREIGN KEY (`review_id`) REFERENCES `reviews`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `review_comments` ADD CONSTRAINT `review_comments_author_id_users_id_fk` FOREIGN KEY (`author_id`) REFERENCES `users`(`id`) ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `reviews` ADD CONSTRAINT `reviews_lab_id_labs_id_fk` FOREIGN KEY (`lab_id`) REFERENCES `labs`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `reviews` ADD CONSTRAINT `reviews_system_id_systems_id_fk` FOREIGN KEY (`system_id`) REFERENCES `systems`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `reviews` ADD CONSTRAINT `reviews_from_revision_id_revisions_id_fk` FOREIGN KEY (`from_revision_id`) REFERENCES `revisions`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `reviews` ADD CONSTRAINT `reviews_to_revision_id_revisions_id_fk` FOREIGN KEY (`to_revision_id`) REFERENCES `revisions`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `reviews` ADD CONSTRAINT `reviews_requested_by_users_id_fk` FOREIGN KEY (`requested_by`) REFERENCES `users`(`id`) ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `reviews` ADD CONSTRAINT `reviews_reviewer_id_users_id_fk` FOREIGN KEY (`reviewer_id`) REFERENCES `users`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE INDEX `review_comments_review_idx` ON `review_comments` (`review_id`);--> statement-breakpoint
CREATE INDEX `reviews_system_idx` ON `reviews` (`system_id`);--> statement-breakpoint
CREATE INDEX `reviews_reviewer_state_idx` ON `reviews` (`reviewer_id`,`state`);