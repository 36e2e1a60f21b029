CREATE TABLE `defect_transitions` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`defect_id` integer NOT NULL,
	`from_status` text NOT NULL,
	`to_status` text NOT NULL,
	`at` integer NOT NULL,
	`user_id` integer,
	`actor` text,
	`reason` text,
	FOREIGN KEY (`defect_id`) REFERENCES `defects`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE INDEX `defect_transitions_defect_idx` ON `defect_transitions` (`defect_id`,`at`);--> statement-breakpoint
ALTER TABLE `attachments` ADD `thumb_path` text;--> statement-breakpoint
ALTER TABLE `attachments` ADD `caption` text;--> statement-breakpoint
CREATE INDEX `attachments_sha_idx` ON `attachments` (`sha256`);--> statement-breakpoint
ALTER TABLE `defects` ADD `reporter_name` text;--> statement-breakpoint
ALTER TABLE `defects` ADD `verification_note` text;