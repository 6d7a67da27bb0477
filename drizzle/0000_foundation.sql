CREATE TABLE `sign_in_throttle` (
	`throttle_key` varchar(300) NOT NULL,
	`failures` int NOT NULL DEFAULT 0,
	`first_failure_at` datetime(3) NOT NULL,
	`locked_until` datetime(3),
	CONSTRAINT `sign_in_throttle_throttle_key` PRIMARY KEY(`throttle_key`)
);
--> statement-breakpoint
CREATE TABLE `users` (
	`id` int AUTO_INCREMENT NOT NULL,
	`email` varchar(254) NOT NULL,
	`name` varchar(120) NOT NULL,
	`password_hash` varchar(100) NOT NULL,
	`role` enum('member','operator','admin') NOT NULL DEFAULT 'member',
	`active` int NOT NULL DEFAULT 1,
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	`updated_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `users_id` PRIMARY KEY(`id`),
	CONSTRAINT `users_email_unique` UNIQUE(`email`)
);
--> statement-breakpoint
CREATE TABLE `workshop_settings` (
	`id` int NOT NULL,
	`name` varchar(120) NOT NULL,
	`timezone` varchar(64) NOT NULL DEFAULT 'Europe/Berlin',
	`currency` varchar(3) NOT NULL DEFAULT 'EUR',
	`contact_email` varchar(254) NOT NULL DEFAULT '',
	`default_layer_height_mm` double NOT NULL DEFAULT 0.2,
	`default_walls` int NOT NULL DEFAULT 3,
	`default_infill_percent` int NOT NULL DEFAULT 15,
	`plate_fee_cents` int NOT NULL DEFAULT 0,
	`safety_note` varchar(1000) NOT NULL DEFAULT '',
	`version` int NOT NULL DEFAULT 1,
	`updated_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `workshop_settings_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
CREATE INDEX `users_role_idx` ON `users` (`role`);