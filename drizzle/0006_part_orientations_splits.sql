CREATE TABLE `part_orientations` (
	`id` int AUTO_INCREMENT NOT NULL,
	`part_id` int NOT NULL,
	`file_id` int NOT NULL,
	`kind` enum('chosen','suggested') NOT NULL,
	`quaternion` json NOT NULL,
	`matrix` json NOT NULL,
	`down_x` double NOT NULL,
	`down_y` double NOT NULL,
	`down_z` double NOT NULL,
	`footprint_x` double NOT NULL,
	`footprint_y` double NOT NULL,
	`height_mm` double NOT NULL,
	`summary` json NOT NULL,
	`chosen_by` int,
	`chosen_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `part_orientations_id` PRIMARY KEY(`id`),
	CONSTRAINT `part_orientations_kind_uq` UNIQUE(`part_id`,`kind`)
);
--> statement-breakpoint
CREATE TABLE `part_splits` (
	`id` int AUTO_INCREMENT NOT NULL,
	`parent_part_id` int NOT NULL,
	`piece_part_id` int NOT NULL,
	`plane` json NOT NULL,
	`split_by` int NOT NULL,
	`split_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `part_splits_id` PRIMARY KEY(`id`),
	CONSTRAINT `part_splits_piece_uq` UNIQUE(`piece_part_id`)
);
--> statement-breakpoint
ALTER TABLE `part_orientations` ADD CONSTRAINT `part_orientations_part_id_parts_id_fk` FOREIGN KEY (`part_id`) REFERENCES `parts`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `part_orientations` ADD CONSTRAINT `part_orientations_file_id_part_files_id_fk` FOREIGN KEY (`file_id`) REFERENCES `part_files`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `part_orientations` ADD CONSTRAINT `part_orientations_chosen_by_users_id_fk` FOREIGN KEY (`chosen_by`) REFERENCES `users`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `part_splits` ADD CONSTRAINT `part_splits_parent_part_id_parts_id_fk` FOREIGN KEY (`parent_part_id`) REFERENCES `parts`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `part_splits` ADD CONSTRAINT `part_splits_piece_part_id_parts_id_fk` FOREIGN KEY (`piece_part_id`) REFERENCES `parts`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `part_splits` ADD CONSTRAINT `part_splits_split_by_users_id_fk` FOREIGN KEY (`split_by`) REFERENCES `users`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE INDEX `part_orientations_file_idx` ON `part_orientations` (`file_id`);--> statement-breakpoint
CREATE INDEX `part_splits_parent_idx` ON `part_splits` (`parent_part_id`);