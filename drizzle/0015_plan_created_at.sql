ALTER TABLE `maintenance_plans` ADD `created_at` integer DEFAULT 0 NOT NULL;--> statement-breakpoint
-- Plans saved before this column knew only their last save: that is their first as far as we know.
UPDATE `maintenance_plans` SET `created_at` = `updated_at`;
