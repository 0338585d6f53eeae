ALTER TABLE `tanks` ADD `journal_version` integer DEFAULT 0 NOT NULL;--> statement-breakpoint
-- Every write to a tank's journal bumps the tank's journal_version, whoever makes it (the page,
-- the API, a CSV upload, the demo seed), so a kept replay can tell it is stale.
CREATE TRIGGER `journal_entries_bump_insert` AFTER INSERT ON `journal_entries` BEGIN
  UPDATE `tanks` SET `journal_version` = `journal_version` + 1 WHERE `id` = NEW.`tank_id`;
END;
--> statement-breakpoint
CREATE TRIGGER `journal_entries_bump_update` AFTER UPDATE ON `journal_entries` BEGIN
  UPDATE `tanks` SET `journal_version` = `journal_version` + 1 WHERE `id` IN (OLD.`tank_id`, NEW.`tank_id`);
END;
--> statement-breakpoint
CREATE TRIGGER `journal_entries_bump_delete` AFTER DELETE ON `journal_entries` BEGIN
  UPDATE `tanks` SET `journal_version` = `journal_version` + 1 WHERE `id` = OLD.`tank_id`;
END;
