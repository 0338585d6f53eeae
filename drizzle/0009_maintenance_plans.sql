CREATE TABLE `maintenance_plans` (
	`tank_id` integer PRIMARY KEY NOT NULL,
	`scenario_id` integer NOT NULL,
	`plan` text NOT NULL,
	`updated_at` integer NOT NULL,
	FOREIGN KEY (`tank_id`) REFERENCES `tanks`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`scenario_id`) REFERENCES `scenarios`(`id`) ON UPDATE no action ON DELETE cascade
);
