CREATE TABLE `printer_maintenance` (
	`id` int AUTO_INCREMENT NOT NULL,
	`printer_id` int NOT NULL,
	`starts_at` datetime(3) NOT NULL,
	`ends_at` datetime(3),
	`note` varchar(500) NOT NULL DEFAULT '',
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `printer_maintenance_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
ALTER TABLE `printer_maintenance` ADD CONSTRAINT `printer_maintenance_printer_id_printers_id_fk` FOREIGN KEY (`printer_id`) REFERENCES `printers`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE INDEX `printer_maintenance_printer_idx` ON `printer_maintenance` (`printer_id`,`starts_at`);