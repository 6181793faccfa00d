CREATE TABLE `comparisons` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`user_id` integer NOT NULL,
	`statement_id` integer NOT NULL,
	`response` text NOT NULL,
	`setting` text NOT NULL,
	`reference_label` text NOT NULL,
	`trial_label` text NOT NULL,
	`reference_values` text NOT NULL,
	`trial_values` text NOT NULL,
	`notes` text DEFAULT '' NOT NULL,
	`outcome` text NOT NULL,
	`created_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`statement_id`) REFERENCES `precision_statements`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `comparisons_user` ON `comparisons` (`user_id`,`created_at`);--> statement-breakpoint
CREATE TABLE `ruggedness_factors` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`study_id` integer NOT NULL,
	`column` integer NOT NULL,
	`name` text NOT NULL,
	`unit` text DEFAULT '' NOT NULL,
	`low` text NOT NULL,
	`high` text NOT NULL,
	FOREIGN KEY (`study_id`) REFERENCES `studies`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE UNIQUE INDEX `ruggedness_factors_study_column` ON `ruggedness_factors` (`study_id`,`column`);--> statement-breakpoint
CREATE TABLE `ruggedness_plans` (
	`study_id` integer PRIMARY KEY NOT NULL,
	`runs` integer NOT NULL,
	`replicates` integer NOT NULL,
	`run_order_seed` integer NOT NULL,
	`run_order` text NOT NULL,
	`created_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	FOREIGN KEY (`study_id`) REFERENCES `studies`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE TABLE `ruggedness_results` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`study_id` integer NOT NULL,
	`run` integer NOT NULL,
	`response_id` integer NOT NULL,
	`replicate` integer NOT NULL,
	`value` real NOT NULL,
	`entered_by` integer NOT NULL,
	`updated_at` integer NOT NULL,
	FOREIGN KEY (`study_id`) REFERENCES `studies`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`response_id`) REFERENCES `responses`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`entered_by`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE UNIQUE INDEX `ruggedness_results_run_response_replicate` ON `ruggedness_results` (`study_id`,`run`,`response_id`,`replicate`);