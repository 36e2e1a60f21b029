CREATE TABLE `vehicle_off_road` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`vehicle_id` integer NOT NULL,
	`from_at` integer NOT NULL,
	`to_at` integer,
	`reason` text,
	`started_by_id` integer,
	`started_actor` text,
	`return_reason` text,
	`ended_by_id` integer,
	`ended_actor` text,
	`open_defects_at_return` text,
	`unverified_at_return` text,
	FOREIGN KEY (`vehicle_id`) REFERENCES `vehicles`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`started_by_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE set null,
	FOREIGN KEY (`ended_by_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE INDEX `vehicle_off_road_vehicle_idx` ON `vehicle_off_road` (`vehicle_id`,`from_at`);--> statement-breakpoint
ALTER TABLE `vehicles` ADD `search_key` text;