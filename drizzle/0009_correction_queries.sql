ALTER TABLE `amendments` ADD `query_id` integer REFERENCES queries(id);--> statement-breakpoint
ALTER TABLE `queries` ADD `asks_correction` integer DEFAULT false NOT NULL;