CREATE TABLE `jobs` (
	`id` text PRIMARY KEY NOT NULL,
	`user_id` integer NOT NULL,
	`kind` text NOT NULL,
	`label` text NOT NULL,
	`params` text,
	`status` text NOT NULL,
	`done` integer DEFAULT 0 NOT NULL,
	`total` integer DEFAULT 0 NOT NULL,
	`partial` text,
	`result` text,
	`error` text,
	`cancel_requested` integer DEFAULT false NOT NULL,
	`instance` text,
	`attempts` integer DEFAULT 0 NOT NULL,
	`started_at` integer NOT NULL,
	`ran_at` integer,
	`finished_at` integer,
	`heartbeat_at` integer
);
--> statement-breakpoint
CREATE INDEX `jobs_user_status_idx` ON `jobs` (`user_id`,`status`);--> statement-breakpoint
CREATE INDEX `jobs_status_idx` ON `jobs` (`status`,`started_at`);--> statement-breakpoint
CREATE TABLE `rate_limits` (
	`key` text PRIMARY KEY NOT NULL,
	`points` integer DEFAULT 0 NOT NULL,
	`expire` integer
);
