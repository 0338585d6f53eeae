CREATE TABLE `sign_up_requests` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`email` text NOT NULL,
	`name` text NOT NULL,
	`password_hash` text NOT NULL,
	`token_hash` text NOT NULL,
	`redirect_to` text DEFAULT '/tanks' NOT NULL,
	`created_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	`expires_at` integer NOT NULL,
	`used_at` integer
);
--> statement-breakpoint
CREATE UNIQUE INDEX `sign_up_requests_token_hash_unique` ON `sign_up_requests` (`token_hash`);--> statement-breakpoint
CREATE INDEX `sign_up_requests_email_idx` ON `sign_up_requests` (`email`);