ALTER TABLE `users` ADD `time_zone` text;--> statement-breakpoint
ALTER TABLE `users` ADD `browser_time_zone` text;