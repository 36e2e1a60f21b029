CREATE TABLE `pattern_records` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`key` text NOT NULL,
	`module_code` text NOT NULL,
	`exposure_band` text NOT NULL,
	`cohort_id` text NOT NULL,
	`build_from` text NOT NULL,
	`build_to` text NOT NULL,
	`failures` integer NOT NULL,
	`rate_ratio` real,
	`q_value` real,
	`water_ingress` integer DEFAULT false NOT NULL,
	`status` text DEFAULT 'new' NOT NULL,
	`status_reason` text,
	`status_by_id` integer,
	`status_at` integer,
	`change_note` text,
	`snapshot` text,
	`first_seen_at` integer NOT NULL,
	`last_seen_at` integer NOT NULL,
	FOREIGN KEY (`status_by_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE UNIQUE INDEX `pattern_records_key_unique` ON `pattern_records` (`key`);--> statement-breakpoint
CREATE INDEX `pattern_records_status_idx` ON `pattern_records` (`status`);