CREATE TABLE `review_rounds` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`statement_id` integer NOT NULL,
	`chair_id` integer NOT NULL,
	`opened_by` integer NOT NULL,
	`outcome` text DEFAULT 'open' NOT NULL,
	`closed_at` integer,
	`created_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	FOREIGN KEY (`statement_id`) REFERENCES `precision_statements`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`chair_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`opened_by`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE UNIQUE INDEX `review_rounds_statement_id_unique` ON `review_rounds` (`statement_id`);--> statement-breakpoint
CREATE TABLE `round_reviewers` (
	`round_id` integer NOT NULL,
	`user_id` integer NOT NULL,
	PRIMARY KEY(`round_id`, `user_id`),
	FOREIGN KEY (`round_id`) REFERENCES `review_rounds`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
ALTER TABLE `amendments` ADD `query_id` integer REFERENCES queries(id);--> statement-breakpoint
ALTER TABLE `queries` ADD `asks_correction` integer DEFAULT false NOT NULL;--> statement-breakpoint
ALTER TABLE `results` ADD `version` integer DEFAULT 1 NOT NULL;--> statement-breakpoint
ALTER TABLE `results` ADD `updated_by` integer REFERENCES users(id);--> statement-breakpoint
ALTER TABLE `votes` ADD `objector_reply` text;--> statement-breakpoint
ALTER TABLE `votes` ADD `objector_reply_note` text;--> statement-breakpoint
ALTER TABLE `votes` ADD `objector_replied_at` integer;--> statement-breakpoint
ALTER TABLE `votes` ADD `ruling` text;--> statement-breakpoint
ALTER TABLE `votes` ADD `ruling_reason` text;--> statement-breakpoint
ALTER TABLE `votes` ADD `ruled_by` integer REFERENCES users(id);--> statement-breakpoint
ALTER TABLE `votes` ADD `ruled_at` integer;