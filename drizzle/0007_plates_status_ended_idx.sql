DROP INDEX `plates_status_idx` ON `plates`;--> statement-breakpoint
CREATE INDEX `plates_status_ended_idx` ON `plates` (`status`,`ended_at`);