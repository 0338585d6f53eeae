CREATE TABLE `reminder_subscriptions` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`tank_id` integer NOT NULL,
	`user_id` integer NOT NULL,
	`mode` text NOT NULL,
	`hour` integer NOT NULL,
	`next_due_at` integer NOT NULL,
	`claimed_by` text,
	`claimed_until` integer,
	`last_sent_at` integer,
	`created_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	FOREIGN KEY (`tank_id`) REFERENCES `tanks`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE UNIQUE INDEX `reminder_subscriptions_tank_id_unique` ON `reminder_subscriptions` (`tank_id`);--> statement-breakpoint
CREATE INDEX `reminder_subscriptions_due_idx` ON `reminder_subscriptions` (`next_due_at`);