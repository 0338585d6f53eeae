-- The tank band's column default becomes the exact 5–20 mg/L NO3 band (DEFAULT_NITRATE_TARGETS in
-- app/features/tanks/nitrate-targets.ts) instead of the rounded 1.13 and 4.52 mg N/L. SQLite
-- changes a default only by rebuilding the table; app/db/client.server.ts runs migrations with
-- foreign keys off, so dropping the old table does not cascade to scenarios, readings or journals.
PRAGMA foreign_keys=OFF;--> statement-breakpoint
CREATE TABLE `__new_tanks` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`owner_id` integer NOT NULL,
	`name` text NOT NULL,
	`notes` text DEFAULT '' NOT NULL,
	`nitrate_target_low` real DEFAULT 1.1295239016837624 NOT NULL,
	`nitrate_target_high` real DEFAULT 4.5180956067350495 NOT NULL,
	`created_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	`updated_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	FOREIGN KEY (`owner_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
INSERT INTO `__new_tanks`("id", "owner_id", "name", "notes", "nitrate_target_low", "nitrate_target_high", "created_at", "updated_at") SELECT "id", "owner_id", "name", "notes", "nitrate_target_low", "nitrate_target_high", "created_at", "updated_at" FROM `tanks`;--> statement-breakpoint
-- Keep the id sequence, so a deleted tank's id is never given again (the copy above only raised
-- it to the highest id still in use).
INSERT INTO `sqlite_sequence` (`name`, `seq`) SELECT '__new_tanks', 0
WHERE NOT EXISTS (SELECT 1 FROM `sqlite_sequence` WHERE `name` = '__new_tanks');--> statement-breakpoint
UPDATE `sqlite_sequence` SET `seq` = max(`seq`, coalesce((SELECT `seq` FROM `sqlite_sequence` WHERE `name` = 'tanks'), 0))
WHERE `name` = '__new_tanks';--> statement-breakpoint
DROP TABLE `tanks`;--> statement-breakpoint
ALTER TABLE `__new_tanks` RENAME TO `tanks`;--> statement-breakpoint
PRAGMA foreign_keys=ON;--> statement-breakpoint
CREATE INDEX `tanks_owner_idx` ON `tanks` (`owner_id`);