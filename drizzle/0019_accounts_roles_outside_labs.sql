CREATE TABLE `user_roles` (
	`user_id` integer NOT NULL,
	`role` text NOT NULL,
	PRIMARY KEY(`user_id`, `role`),
	FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
ALTER TABLE `labs` ADD `listing` text;--> statement-breakpoint
ALTER TABLE `labs` ADD `merged_into_id` integer REFERENCES labs(id);--> statement-breakpoint
ALTER TABLE `password_tokens` ADD `purpose` text DEFAULT 'welcome' NOT NULL;