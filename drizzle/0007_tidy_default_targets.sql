-- Tanks made before the exact defaults stored the 5–20 mg/L NO3 band as 1.13 and 4.52 mg N/L,
-- which reads back as 5.002 and 20.01 mg/L NO3 (issue 12, item 4). For owners who work in
-- mg/L NO3 nobody typed those, so they become the exact conversions of 5 and 20
-- (app/features/tanks/nitrate-targets.ts). Owners who work in NO3-N see 1.13 and 4.52 as shown
-- and perhaps typed: left alone.
UPDATE `tanks` SET `nitrate_target_low` = 1.1295239016837624
WHERE `nitrate_target_low` = 1.13
  AND `owner_id` IN (SELECT `id` FROM `users` WHERE `nitrate_unit` = 'NO3');
--> statement-breakpoint
UPDATE `tanks` SET `nitrate_target_high` = 4.5180956067350495
WHERE `nitrate_target_high` = 4.52
  AND `owner_id` IN (SELECT `id` FROM `users` WHERE `nitrate_unit` = 'NO3');
