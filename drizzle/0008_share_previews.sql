CREATE TABLE `share_previews` (
	`run_id` integer PRIMARY KEY NOT NULL,
	`png` blob NOT NULL,
	`created_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	FOREIGN KEY (`run_id`) REFERENCES `runs`(`id`) ON UPDATE no action ON DELETE cascade
);
