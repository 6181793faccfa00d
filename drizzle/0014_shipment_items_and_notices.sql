CREATE TABLE `notice_preferences` (
	`user_id` integer PRIMARY KEY NOT NULL,
	`result_reminders` integer DEFAULT true NOT NULL,
	`enrollment_answers` integer DEFAULT true NOT NULL,
	FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE TABLE `notices` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`kind` text NOT NULL,
	`study_id` integer NOT NULL,
	`subject_id` integer NOT NULL,
	`recipient` text NOT NULL,
	`unique_key` text NOT NULL,
	`email_id` integer,
	`created_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	FOREIGN KEY (`study_id`) REFERENCES `studies`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`email_id`) REFERENCES `email_outbox`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE UNIQUE INDEX `notices_unique_key_unique` ON `notices` (`unique_key`);--> statement-breakpoint
CREATE INDEX `notices_study` ON `notices` (`study_id`);--> statement-breakpoint
CREATE TABLE `shipment_items` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`shipment_id` integer NOT NULL,
	`sort_order` integer DEFAULT 0 NOT NULL,
	`description` text NOT NULL,
	`quantity` real NOT NULL,
	`unit` text NOT NULL,
	`lot` text DEFAULT '' NOT NULL,
	`container_count` integer DEFAULT 1 NOT NULL,
	FOREIGN KEY (`shipment_id`) REFERENCES `shipments`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE INDEX `shipment_items_shipment` ON `shipment_items` (`shipment_id`);--> statement-breakpoint
ALTER TABLE `shipments` ADD `note` text DEFAULT '' NOT NULL;