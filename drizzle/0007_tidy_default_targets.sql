-- Tanks made before the exact defaults stored the nitrate band as 1.13 and 4.52 mg N/L (the
-- schema's defaults), which read back as 5.002 and 20.01 mg/L NO3. Put the exact conversions of
-- 5 and 20 mg/L NO3 (5 and 20 × 14.007/62.004, as DEFAULT_NITRATE_TARGETS) in their place. A
-- value a person typed is never exactly 1.13 or 4.52 unless they typed it in mg N/L, and then
-- it reads back the same to three decimals either way.
UPDATE `tanks` SET `nitrate_target_low` = 1.1295239016837624 WHERE abs(`nitrate_target_low` - 1.13) < 1e-9;
--> statement-breakpoint
UPDATE `tanks` SET `nitrate_target_high` = 4.5180956067350495 WHERE abs(`nitrate_target_high` - 4.52) < 1e-9;
