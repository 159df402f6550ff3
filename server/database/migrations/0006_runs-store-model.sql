ALTER TABLE `runs` ADD `compiler_version` varchar(40);--> statement-breakpoint
ALTER TABLE `runs` ADD `model` longtext;--> statement-breakpoint
ALTER TABLE `runs` ADD `stored_bytes` int;