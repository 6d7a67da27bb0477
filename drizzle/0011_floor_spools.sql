ALTER TABLE `workshop_settings` ADD `unattended_allowed` int DEFAULT 1 NOT NULL;--> statement-breakpoint
ALTER TABLE `workshop_settings` ADD `unattended_max_hours` double;--> statement-breakpoint
ALTER TABLE `plates` ADD `change_from_material` varchar(20);--> statement-breakpoint
ALTER TABLE `plates` ADD `change_from_colour` varchar(40);--> statement-breakpoint
ALTER TABLE `plates` ADD `change_to_material` varchar(20);--> statement-breakpoint
ALTER TABLE `plates` ADD `change_to_colour` varchar(40);