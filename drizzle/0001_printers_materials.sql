CREATE TABLE `attended_hours` (
	`id` int AUTO_INCREMENT NOT NULL,
	`weekday` int NOT NULL,
	`opens_at` varchar(5) NOT NULL,
	`closes_at` varchar(5) NOT NULL,
	CONSTRAINT `attended_hours_id` PRIMARY KEY(`id`),
	CONSTRAINT `attended_hours_day_open_uq` UNIQUE(`weekday`,`opens_at`)
);
--> statement-breakpoint
CREATE TABLE `print_history` (
	`id` int AUTO_INCREMENT NOT NULL,
	`printer_id` int NOT NULL,
	`plate_id` int,
	`estimated_minutes` double NOT NULL,
	`actual_minutes` double NOT NULL,
	`estimated_grams` double NOT NULL,
	`actual_grams` double,
	`finished_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `print_history_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
CREATE TABLE `printer_materials` (
	`printer_id` int NOT NULL,
	`material_type` enum('pla','petg','abs','asa','tpu','nylon','pc') NOT NULL,
	CONSTRAINT `printer_materials_printer_id_material_type_pk` PRIMARY KEY(`printer_id`,`material_type`)
);
--> statement-breakpoint
CREATE TABLE `printers` (
	`id` int AUTO_INCREMENT NOT NULL,
	`name` varchar(80) NOT NULL,
	`bed_x_mm` double NOT NULL,
	`bed_y_mm` double NOT NULL,
	`height_mm` double NOT NULL,
	`nozzle_mm` double NOT NULL DEFAULT 0.4,
	`enclosed` int NOT NULL DEFAULT 0,
	`hourly_rate_cents` int NOT NULL DEFAULT 0,
	`volumetric_flow_mm3s` double NOT NULL DEFAULT 5,
	`per_layer_seconds` double NOT NULL DEFAULT 3,
	`startup_minutes` double NOT NULL DEFAULT 6,
	`state` enum('available','busy','maintenance') NOT NULL DEFAULT 'available',
	`maintenance_note` varchar(500) NOT NULL DEFAULT '',
	`expected_back_at` datetime(3),
	`version` int NOT NULL DEFAULT 1,
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	`updated_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `printers_id` PRIMARY KEY(`id`),
	CONSTRAINT `printers_name_unique` UNIQUE(`name`)
);
--> statement-breakpoint
CREATE TABLE `materials` (
	`id` int AUTO_INCREMENT NOT NULL,
	`name` varchar(80) NOT NULL,
	`type` enum('pla','petg','abs','asa','tpu','nylon','pc') NOT NULL,
	`density_g_cm3` double NOT NULL,
	`density_source` varchar(200) NOT NULL,
	`price_per_kg_cents` int NOT NULL,
	`low_stock_grams` int NOT NULL DEFAULT 200,
	`version` int NOT NULL DEFAULT 1,
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	`updated_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `materials_id` PRIMARY KEY(`id`),
	CONSTRAINT `materials_name_unique` UNIQUE(`name`)
);
--> statement-breakpoint
CREATE TABLE `spools` (
	`id` int AUTO_INCREMENT NOT NULL,
	`material_id` int NOT NULL,
	`label` varchar(80) NOT NULL,
	`colour` varchar(40) NOT NULL,
	`grams_initial` double NOT NULL,
	`grams_remaining` double NOT NULL,
	`loaded_printer_id` int,
	`loaded_at` datetime(3),
	`version` int NOT NULL DEFAULT 1,
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	`updated_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `spools_id` PRIMARY KEY(`id`),
	CONSTRAINT `spools_label_unique` UNIQUE(`label`),
	CONSTRAINT `spools_loaded_printer_uq` UNIQUE(`loaded_printer_id`)
);
--> statement-breakpoint
ALTER TABLE `print_history` ADD CONSTRAINT `print_history_printer_id_printers_id_fk` FOREIGN KEY (`printer_id`) REFERENCES `printers`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `printer_materials` ADD CONSTRAINT `printer_materials_printer_id_printers_id_fk` FOREIGN KEY (`printer_id`) REFERENCES `printers`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `spools` ADD CONSTRAINT `spools_material_id_materials_id_fk` FOREIGN KEY (`material_id`) REFERENCES `materials`(`id`) ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `spools` ADD CONSTRAINT `spools_loaded_printer_id_printers_id_fk` FOREIGN KEY (`loaded_printer_id`) REFERENCES `printers`(`id`) ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE INDEX `print_history_printer_idx` ON `print_history` (`printer_id`,`finished_at`);--> statement-breakpoint
CREATE INDEX `materials_type_idx` ON `materials` (`type`);--> statement-breakpoint
CREATE INDEX `spools_material_idx` ON `spools` (`material_id`);