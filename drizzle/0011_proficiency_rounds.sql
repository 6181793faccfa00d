CREATE TABLE `round_assignments` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`study_id` integer NOT NULL,
	`material_id` integer NOT NULL,
	`response_id` integer NOT NULL,
	`assigned_method` text DEFAULT 'consensus' NOT NULL,
	`reference_value` real,
	`reference_uncertainty` real,
	`sigma_method` text DEFAULT 'precision' NOT NULL,
	`fixed_sigma` real,
	`check_justification` text DEFAULT '' NOT NULL,
	`updated_by` integer,
	`updated_at` integer,
	FOREIGN KEY (`study_id`) REFERENCES `studies`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`material_id`) REFERENCES `materials`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`response_id`) REFERENCES `responses`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`updated_by`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE UNIQUE INDEX `round_assignments_group` ON `round_assignments` (`study_id`,`material_id`,`response_id`);--> statement-breakpoint
CREATE TABLE `round_check_results` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`study_id` integer NOT NULL,
	`material_id` integer NOT NULL,
	`response_id` integer NOT NULL,
	`check` text NOT NULL,
	`sample` integer NOT NULL,
	`replicate` integer NOT NULL,
	`value` real NOT NULL,
	FOREIGN KEY (`study_id`) REFERENCES `studies`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`material_id`) REFERENCES `materials`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`response_id`) REFERENCES `responses`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE UNIQUE INDEX `round_check_results_value` ON `round_check_results` (`material_id`,`response_id`,`check`,`sample`,`replicate`);--> statement-breakpoint
CREATE TABLE `round_lab_uncertainties` (
	`enrollment_id` integer NOT NULL,
	`material_id` integer NOT NULL,
	`response_id` integer NOT NULL,
	`standard_uncertainty` real NOT NULL,
	PRIMARY KEY(`enrollment_id`, `material_id`, `response_id`),
	FOREIGN KEY (`enrollment_id`) REFERENCES `enrollments`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`material_id`) REFERENCES `materials`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`response_id`) REFERENCES `responses`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE TABLE `round_scores` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`study_id` integer NOT NULL,
	`lab_id` integer NOT NULL,
	`lab_code` text NOT NULL,
	`material_code` text NOT NULL,
	`response_key` text NOT NULL,
	`result` real NOT NULL,
	`score_kind` text NOT NULL,
	`score` real NOT NULL,
	`zeta` real,
	`verdict` text NOT NULL,
	`published_at` integer NOT NULL,
	FOREIGN KEY (`study_id`) REFERENCES `studies`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`lab_id`) REFERENCES `labs`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `round_scores_lab` ON `round_scores` (`lab_id`,`published_at`);--> statement-breakpoint
CREATE INDEX `round_scores_study` ON `round_scores` (`study_id`);--> statement-breakpoint
CREATE TABLE `round_settings` (
	`study_id` integer PRIMARY KEY NOT NULL,
	`source_study_id` integer,
	`precision` text NOT NULL,
	`published_report` text,
	`published_at` integer,
	`published_by` integer,
	FOREIGN KEY (`study_id`) REFERENCES `studies`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`source_study_id`) REFERENCES `studies`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`published_by`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action
);
