ALTER TABLE `part_files` ADD `repaired_from_file_id` int;--> statement-breakpoint
ALTER TABLE `part_files` ADD `repair_report` json;--> statement-breakpoint
ALTER TABLE `part_files` ADD `accepted_broken_by` int;--> statement-breakpoint
ALTER TABLE `part_files` ADD `accepted_broken_at` datetime(3);--> statement-breakpoint
ALTER TABLE `part_files` ADD `accepted_broken_note` varchar(500);--> statement-breakpoint
ALTER TABLE `part_files` ADD CONSTRAINT `part_files_accepted_broken_by_users_id_fk` FOREIGN KEY (`accepted_broken_by`) REFERENCES `users`(`id`) ON DELETE no action ON UPDATE no action;