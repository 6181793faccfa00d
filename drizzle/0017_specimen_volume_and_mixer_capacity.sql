ALTER TABLE `enrollments` ADD `mixer_capacity_m3` real;--> statement-breakpoint
ALTER TABLE `studies` ADD `specimen_volume_m3` real;--> statement-breakpoint
ALTER TABLE `studies` ADD `waste_percent` real;