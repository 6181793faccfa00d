-- Float finishing studies made before the batch sheet read the specimen volume from the study keep the form they were planned with:
-- 3 ft × 2 ft × 3 in = 0.0425 m³ per specimen, 10 % waste. Other test methods stay blank until their coordinator sets them.
UPDATE `studies` SET `specimen_volume_m3` = 0.0425, `waste_percent` = 10 WHERE `target_surface_rating` IS NOT NULL AND `specimen_volume_m3` IS NULL;
