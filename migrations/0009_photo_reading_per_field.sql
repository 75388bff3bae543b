-- Which reading each comparison of a photo with its record used, field by field
-- (server/src/intake/photo_checks.rs): the time and the place are each taken from the
-- server's reading of the file it received when that reading has them, else from the
-- phone's reading of the original. A file with a time but no GPS keeps the phone's GPS.
--
-- time_reading:  'received_file' or 'phone'; NULL when neither reading had a time.
-- place_reading: the same for the position.
--
-- exif_reading (0004) named one reading for both and is no longer written; rows stored
-- before this migration get theirs copied to the fields that reading gave.

ALTER TABLE observation_photos ADD COLUMN time_reading TEXT;
ALTER TABLE observation_photos ADD COLUMN place_reading TEXT;

UPDATE observation_photos SET time_reading = exif_reading WHERE seconds_before_record IS NOT NULL;
UPDATE observation_photos SET place_reading = exif_reading WHERE metres_from_record IS NOT NULL;
