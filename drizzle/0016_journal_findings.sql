CREATE TABLE `journal_findings` (
	`tank_id` integer PRIMARY KEY NOT NULL,
	`journal_version` integer NOT NULL,
	`settings_hash` text NOT NULL,
	`computed_at` integer NOT NULL,
	`free_nh3_above_caution` integer DEFAULT false NOT NULL,
	`nitrite_above_caution` integer DEFAULT false NOT NULL,
	`warning_codes` text DEFAULT '[]' NOT NULL,
	FOREIGN KEY (`tank_id`) REFERENCES `tanks`(`id`) ON UPDATE no action ON DELETE cascade
);
