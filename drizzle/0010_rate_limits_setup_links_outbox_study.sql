CREATE TABLE `rate_limits` (
	`key` text PRIMARY KEY NOT NULL,
	`points` integer NOT NULL,
	`expire` integer
);
--> statement-breakpoint
CREATE TABLE `setup_links` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`token_hash` text NOT NULL,
	`expires_at` integer NOT NULL,
	`used_at` integer,
	`created_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL
);
--> statement-breakpoint
CREATE UNIQUE INDEX `setup_links_token_hash_unique` ON `setup_links` (`token_hash`);--> statement-breakpoint
DROP TABLE `rate_limit_hits`;--> statement-breakpoint
ALTER TABLE `attachments` ADD `thumbnail_sha256` text;--> statement-breakpoint
ALTER TABLE `email_outbox` ADD `study_id` integer REFERENCES studies(id);