CREATE TABLE `assemblies` (
	`id` int AUTO_INCREMENT NOT NULL,
	`owner_id` int NOT NULL,
	`parent_id` int,
	`root_id` int,
	`name` varchar(120) NOT NULL,
	`description` varchar(2000) NOT NULL DEFAULT '',
	`target_date` date,
	`version` int NOT NULL DEFAULT 1,
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	`updated_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `assemblies_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
CREATE TABLE `assembly_shares` (
	`id` int AUTO_INCREMENT NOT NULL,
	`assembly_id` int NOT NULL,
	`user_id` int NOT NULL,
	`access` enum('read','edit') NOT NULL,
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `assembly_shares_id` PRIMARY KEY(`id`),
	CONSTRAINT `assembly_shares_pair` UNIQUE(`assembly_id`,`user_id`)
);
--> statement-breakpoint
CREATE TABLE `assembly_items` (
	`id` int AUTO_INCREMENT NOT NULL,
	`assembly_id` int NOT NULL,
	`kind` enum('hardware','made') NOT NULL,
	`name` varchar(120) NOT NULL,
	`quantity` int NOT NULL DEFAULT 1,
	`source` varchar(500) NOT NULL DEFAULT '',
	`unit_price_cents` int,
	`due_date` date,
	`status` enum('to_order','ordered','in_hand') NOT NULL DEFAULT 'to_order',
	`notes` varchar(1000) NOT NULL DEFAULT '',
	`version` int NOT NULL DEFAULT 1,
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `assembly_items_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
CREATE TABLE `mesh_blobs` (
	`sha256` char(64) NOT NULL,
	`size_bytes` bigint NOT NULL,
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `mesh_blobs_sha256` PRIMARY KEY(`sha256`)
);
--> statement-breakpoint
CREATE TABLE `part_files` (
	`id` int AUTO_INCREMENT NOT NULL,
	`part_id` int NOT NULL,
	`sha256` char(64) NOT NULL,
	`version_no` int NOT NULL,
	`original_name` varchar(255) NOT NULL,
	`units` enum('mm','in') NOT NULL,
	`format` varchar(16) NOT NULL,
	`size_x` double NOT NULL,
	`size_y` double NOT NULL,
	`size_z` double NOT NULL,
	`volume_mm3` double NOT NULL,
	`watertight` int NOT NULL,
	`analysis` json NOT NULL,
	`uploaded_by` int NOT NULL,
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `part_files_id` PRIMARY KEY(`id`),
	CONSTRAINT `part_files_version` UNIQUE(`part_id`,`version_no`)
);
--> statement-breakpoint
CREATE TABLE `part_instances` (
	`id` int AUTO_INCREMENT NOT NULL,
	`part_id` int NOT NULL,
	`copy_no` int NOT NULL,
	`status` enum('drafted','ready','queued','plated','printing','printed','accepted','failed') NOT NULL DEFAULT 'drafted',
	`reprints` int NOT NULL DEFAULT 0,
	`version` int NOT NULL DEFAULT 1,
	`updated_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `part_instances_id` PRIMARY KEY(`id`),
	CONSTRAINT `part_instances_copy` UNIQUE(`part_id`,`copy_no`)
);
--> statement-breakpoint
CREATE TABLE `parts` (
	`id` int AUTO_INCREMENT NOT NULL,
	`assembly_id` int NOT NULL,
	`name` varchar(120) NOT NULL,
	`quantity` int NOT NULL DEFAULT 1,
	`material` varchar(40) NOT NULL DEFAULT 'PLA',
	`colour` varchar(40) NOT NULL DEFAULT '',
	`layer_height_mm` double NOT NULL,
	`walls` int NOT NULL,
	`infill_percent` int NOT NULL,
	`notes` varchar(2000) NOT NULL DEFAULT '',
	`current_file_id` int,
	`version` int NOT NULL DEFAULT 1,
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	`updated_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `parts_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
CREATE TABLE `part_status_events` (
	`id` int AUTO_INCREMENT NOT NULL,
	`instance_id` int NOT NULL,
	`from_status` enum('drafted','ready','queued','plated','printing','printed','accepted','failed'),
	`to_status` enum('drafted','ready','queued','plated','printing','printed','accepted','failed') NOT NULL,
	`by_user_id` int NOT NULL,
	`at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	`reason` varchar(500) NOT NULL DEFAULT '',
	CONSTRAINT `part_status_events_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
ALTER TABLE `assemblies` ADD CONSTRAINT `assemblies_owner_id_users_id_fk` FOREIGN KEY (`owner_id`) REFERENCES `users`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `assembly_shares` ADD CONSTRAINT `assembly_shares_assembly_id_assemblies_id_fk` FOREIGN KEY (`assembly_id`) REFERENCES `assemblies`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `assembly_shares` ADD CONSTRAINT `assembly_shares_user_id_users_id_fk` FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `assembly_items` ADD CONSTRAINT `assembly_items_assembly_id_assemblies_id_fk` FOREIGN KEY (`assembly_id`) REFERENCES `assemblies`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `part_files` ADD CONSTRAINT `part_files_part_id_parts_id_fk` FOREIGN KEY (`part_id`) REFERENCES `parts`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `part_files` ADD CONSTRAINT `part_files_sha256_mesh_blobs_sha256_fk` FOREIGN KEY (`sha256`) REFERENCES `mesh_blobs`(`sha256`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `part_files` ADD CONSTRAINT `part_files_uploaded_by_users_id_fk` FOREIGN KEY (`uploaded_by`) REFERENCES `users`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `part_instances` ADD CONSTRAINT `part_instances_part_id_parts_id_fk` FOREIGN KEY (`part_id`) REFERENCES `parts`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `parts` ADD CONSTRAINT `parts_assembly_id_assemblies_id_fk` FOREIGN KEY (`assembly_id`) REFERENCES `assemblies`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `part_status_events` ADD CONSTRAINT `part_status_events_instance_id_part_instances_id_fk` FOREIGN KEY (`instance_id`) REFERENCES `part_instances`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `part_status_events` ADD CONSTRAINT `part_status_events_by_user_id_users_id_fk` FOREIGN KEY (`by_user_id`) REFERENCES `users`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE INDEX `assemblies_owner_idx` ON `assemblies` (`owner_id`);--> statement-breakpoint
CREATE INDEX `assemblies_root_idx` ON `assemblies` (`root_id`);--> statement-breakpoint
CREATE INDEX `assemblies_parent_idx` ON `assemblies` (`parent_id`);--> statement-breakpoint
CREATE INDEX `assembly_shares_user_idx` ON `assembly_shares` (`user_id`);--> statement-breakpoint
CREATE INDEX `assembly_items_assembly_idx` ON `assembly_items` (`assembly_id`);--> statement-breakpoint
CREATE INDEX `part_files_sha_idx` ON `part_files` (`sha256`);--> statement-breakpoint
CREATE INDEX `part_instances_status_idx` ON `part_instances` (`status`);--> statement-breakpoint
CREATE INDEX `parts_assembly_idx` ON `parts` (`assembly_id`);--> statement-breakpoint
CREATE INDEX `part_status_events_instance_idx` ON `part_status_events` (`instance_id`);