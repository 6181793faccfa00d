ALTER TABLE `results` ADD `version` integer DEFAULT 1 NOT NULL;--> statement-breakpoint
ALTER TABLE `results` ADD `updated_by` integer REFERENCES users(id);