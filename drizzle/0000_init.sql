CREATE TABLE `api_tokens` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`user_id` integer NOT NULL,
	`label` text NOT NULL,
	`token_hash` text NOT NULL,
	`prefix` text NOT NULL,
	`last_used_at` integer,
	`revoked_at` integer,
	`created_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE UNIQUE INDEX `api_tokens_token_hash_unique` ON `api_tokens` (`token_hash`);--> statement-breakpoint
CREATE INDEX `api_tokens_user_idx` ON `api_tokens` (`user_id`);--> statement-breakpoint
CREATE TABLE `attachments` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`defect_id` integer,
	`depot_id` integer,
	`kind` text NOT NULL,
	`sha256` text NOT NULL,
	`mime` text NOT NULL,
	`bytes` integer NOT NULL,
	`original_name` text,
	`stored_path` text NOT NULL,
	`width` integer,
	`height` integer,
	`analysis` text,
	`created_by_id` integer,
	`created_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	FOREIGN KEY (`defect_id`) REFERENCES `defects`(`id`) ON UPDATE no action ON DELETE set null,
	FOREIGN KEY (`depot_id`) REFERENCES `depots`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`created_by_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `attachments_defect_idx` ON `attachments` (`defect_id`);--> statement-breakpoint
CREATE TABLE `audit_log` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`at` integer NOT NULL,
	`user_id` integer,
	`actor` text,
	`entity` text NOT NULL,
	`entity_id` text NOT NULL,
	`action` text NOT NULL,
	`field` text,
	`old_value` text,
	`new_value` text,
	FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE INDEX `audit_entity_idx` ON `audit_log` (`entity`,`entity_id`);--> statement-breakpoint
CREATE INDEX `audit_at_idx` ON `audit_log` (`at`);--> statement-breakpoint
CREATE TABLE `defect_codes` (
	`defect_id` integer NOT NULL,
	`seq` integer NOT NULL,
	`code` text NOT NULL,
	`failure_type` text,
	PRIMARY KEY(`defect_id`, `seq`),
	FOREIGN KEY (`defect_id`) REFERENCES `defects`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE INDEX `defect_codes_code_idx` ON `defect_codes` (`code`);--> statement-breakpoint
CREATE TABLE `defect_parts` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`defect_id` integer NOT NULL,
	`part_number` text NOT NULL,
	`description` text,
	`quantity` integer DEFAULT 1 NOT NULL,
	`unit_cost_minor` integer,
	FOREIGN KEY (`defect_id`) REFERENCES `defects`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE INDEX `defect_parts_defect_idx` ON `defect_parts` (`defect_id`);--> statement-breakpoint
CREATE TABLE `defects` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`ref` text NOT NULL,
	`vehicle_id` integer NOT NULL,
	`depot_id` integer NOT NULL,
	`module_id` integer NOT NULL,
	`position` text NOT NULL,
	`status` text DEFAULT 'reported' NOT NULL,
	`reported_at` integer NOT NULL,
	`reported_at_text` text,
	`symptom` text,
	`dtcs` text,
	`moisture` text,
	`root_cause` text,
	`action` text,
	`odometer_km` integer,
	`membrane_condition` text,
	`seal_condition` text,
	`drain_condition` text,
	`connector_condition` text,
	`labour_minutes` integer,
	`cost_minor` integer,
	`notes` text,
	`reported_by_id` integer,
	`assigned_to_id` integer,
	`verified_reinit` integer,
	`verified_reversal` integer,
	`verified_by_id` integer,
	`verified_at` integer,
	`repeat_of_id` integer,
	`closed_at` integer,
	`closed_at_text` text,
	`version` integer DEFAULT 1 NOT NULL,
	`created_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	`updated_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	FOREIGN KEY (`vehicle_id`) REFERENCES `vehicles`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`depot_id`) REFERENCES `depots`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`module_id`) REFERENCES `modules`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`reported_by_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`assigned_to_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`verified_by_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE UNIQUE INDEX `defects_ref_unique` ON `defects` (`ref`);--> statement-breakpoint
CREATE INDEX `defects_vehicle_idx` ON `defects` (`vehicle_id`);--> statement-breakpoint
CREATE INDEX `defects_depot_status_idx` ON `defects` (`depot_id`,`status`);--> statement-breakpoint
CREATE INDEX `defects_module_idx` ON `defects` (`module_id`);--> statement-breakpoint
CREATE INDEX `defects_reported_idx` ON `defects` (`reported_at`);--> statement-breakpoint
CREATE UNIQUE INDEX `defects_natural_key` ON `defects` (`vehicle_id`,`reported_at`,`position`,`module_id`);--> statement-breakpoint
CREATE TABLE `depots` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`code` text NOT NULL,
	`name` text NOT NULL,
	`region` text,
	`coastal` integer DEFAULT false NOT NULL,
	`rain_days_per_year` integer NOT NULL,
	`mean_rh_pct` real NOT NULL,
	`wash_bay` integer DEFAULT false NOT NULL,
	`inspection_slots_per_day` integer,
	`timezone` text,
	`created_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	`updated_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL
);
--> statement-breakpoint
CREATE UNIQUE INDEX `depots_code_unique` ON `depots` (`code`);--> statement-breakpoint
CREATE TABLE `modules` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`code` text NOT NULL,
	`name` text NOT NULL,
	`function` text NOT NULL,
	`part_number` text,
	`supplier` text,
	`created_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	`updated_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL
);
--> statement-breakpoint
CREATE UNIQUE INDEX `modules_code_unique` ON `modules` (`code`);--> statement-breakpoint
CREATE TABLE `settings` (
	`key` text PRIMARY KEY NOT NULL,
	`value` text NOT NULL
);
--> statement-breakpoint
CREATE TABLE `sign_in_throttle` (
	`key` text PRIMARY KEY NOT NULL,
	`failures` integer DEFAULT 0 NOT NULL,
	`window_start_at` integer NOT NULL,
	`locked_until_at` integer
);
--> statement-breakpoint
CREATE TABLE `user_depots` (
	`user_id` integer NOT NULL,
	`depot_id` integer NOT NULL,
	PRIMARY KEY(`user_id`, `depot_id`),
	FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`depot_id`) REFERENCES `depots`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE TABLE `users` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`email` text NOT NULL,
	`name` text NOT NULL,
	`role` text NOT NULL,
	`password_hash` text NOT NULL,
	`all_depots` integer DEFAULT false NOT NULL,
	`active` integer DEFAULT true NOT NULL,
	`last_sign_in_at` integer,
	`created_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	`updated_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL
);
--> statement-breakpoint
CREATE UNIQUE INDEX `users_email_unique` ON `users` (`email`);--> statement-breakpoint
CREATE TABLE `vehicles` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`vin` text NOT NULL,
	`fleet_number` text,
	`registration` text,
	`make` text,
	`model` text,
	`body` text,
	`build_date` text NOT NULL,
	`build_month` text NOT NULL,
	`in_service_date` text NOT NULL,
	`retired_date` text,
	`depot_id` integer NOT NULL,
	`parking` text NOT NULL,
	`washes_per_month` real NOT NULL,
	`model_year` integer,
	`off_road_since_at` integer,
	`version` integer DEFAULT 1 NOT NULL,
	`created_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	`updated_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	FOREIGN KEY (`depot_id`) REFERENCES `depots`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE UNIQUE INDEX `vehicles_vin_unique` ON `vehicles` (`vin`);--> statement-breakpoint
CREATE INDEX `vehicles_depot_idx` ON `vehicles` (`depot_id`);--> statement-breakpoint
CREATE INDEX `vehicles_fleet_number_idx` ON `vehicles` (`fleet_number`);--> statement-breakpoint
CREATE INDEX `vehicles_registration_idx` ON `vehicles` (`registration`);--> statement-breakpoint
CREATE INDEX `vehicles_build_month_idx` ON `vehicles` (`build_month`);