CREATE TABLE `planner_state` (
	`id` int NOT NULL,
	`last_run_at` datetime(3),
	`last_run_by` int,
	`last_metrics` json,
	`unplaced` json,
	CONSTRAINT `planner_state_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
CREATE TABLE `plate_items` (
	`id` int AUTO_INCREMENT NOT NULL,
	`plate_id` int NOT NULL,
	`instance_id` int NOT NULL,
	`active_instance_id` int,
	`member_id` int NOT NULL,
	`x` double NOT NULL,
	`y` double NOT NULL,
	`rotated` int NOT NULL DEFAULT 0,
	`size_x` double NOT NULL,
	`size_y` double NOT NULL,
	`size_z` double NOT NULL,
	`minutes` double NOT NULL,
	`grams` double NOT NULL,
	CONSTRAINT `plate_items_id` PRIMARY KEY(`id`),
	CONSTRAINT `plate_items_active_uq` UNIQUE(`active_instance_id`)
);
--> statement-breakpoint
CREATE TABLE `plates` (
	`id` int AUTO_INCREMENT NOT NULL,
	`printer_id` int NOT NULL,
	`status` enum('planned','printing','finished','failed','cancelled') NOT NULL DEFAULT 'planned',
	`material` varchar(20) NOT NULL,
	`colour` varchar(40) NOT NULL,
	`planned_start` datetime(3) NOT NULL,
	`planned_end` datetime(3) NOT NULL,
	`started_at` datetime(3),
	`ended_at` datetime(3),
	`runs_unattended` int NOT NULL DEFAULT 0,
	`caution` varchar(500),
	`estimated_minutes` double NOT NULL,
	`estimated_grams` double NOT NULL,
	`actual_minutes` double,
	`actual_grams` double,
	`shelf_label` varchar(60),
	`reason` varchar(500),
	`quote` json NOT NULL,
	`quoted_at` datetime(3) NOT NULL,
	`version` int NOT NULL DEFAULT 1,
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	`updated_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `plates_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
CREATE TABLE `queue_entries` (
	`id` int AUTO_INCREMENT NOT NULL,
	`instance_id` int NOT NULL,
	`member_id` int NOT NULL,
	`sent_by` int NOT NULL,
	`wished_date` date,
	`priority` int NOT NULL DEFAULT 0,
	`sent_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	`version` int NOT NULL DEFAULT 1,
	CONSTRAINT `queue_entries_id` PRIMARY KEY(`id`),
	CONSTRAINT `queue_entries_instance_uq` UNIQUE(`instance_id`)
);
--> statement-breakpoint
ALTER TABLE `plate_items` ADD CONSTRAINT `plate_items_plate_id_plates_id_fk` FOREIGN KEY (`plate_id`) REFERENCES `plates`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `plate_items` ADD CONSTRAINT `plate_items_instance_id_part_instances_id_fk` FOREIGN KEY (`instance_id`) REFERENCES `part_instances`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `plate_items` ADD CONSTRAINT `plate_items_member_id_users_id_fk` FOREIGN KEY (`member_id`) REFERENCES `users`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `plates` ADD CONSTRAINT `plates_printer_id_printers_id_fk` FOREIGN KEY (`printer_id`) REFERENCES `printers`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `queue_entries` ADD CONSTRAINT `queue_entries_instance_id_part_instances_id_fk` FOREIGN KEY (`instance_id`) REFERENCES `part_instances`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `queue_entries` ADD CONSTRAINT `queue_entries_member_id_users_id_fk` FOREIGN KEY (`member_id`) REFERENCES `users`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `queue_entries` ADD CONSTRAINT `queue_entries_sent_by_users_id_fk` FOREIGN KEY (`sent_by`) REFERENCES `users`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE INDEX `plate_items_plate_idx` ON `plate_items` (`plate_id`);--> statement-breakpoint
CREATE INDEX `plate_items_instance_idx` ON `plate_items` (`instance_id`);--> statement-breakpoint
CREATE INDEX `plates_printer_idx` ON `plates` (`printer_id`,`planned_start`);--> statement-breakpoint
CREATE INDEX `plates_status_idx` ON `plates` (`status`);--> statement-breakpoint
CREATE INDEX `queue_entries_member_idx` ON `queue_entries` (`member_id`);