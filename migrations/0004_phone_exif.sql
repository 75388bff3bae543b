-- The phone reads each original photo's EXIF before it makes the upload copy (which
-- carries no EXIF) and sends that reading with the record. It is kept per record and
-- photo beside the server's own reading of the file it received, never mixed with it:
--
-- phone_exif_json: the phone's reading as sent (a shared_types::PhotoExif), with the
--                  instant worked out by the server; NULL when the phone sent none.
-- exif_reading:    whose reading the time/place comparison used: 'received_file' or
--                  'phone'; NULL when neither said when or where.

ALTER TABLE observation_photos ADD COLUMN phone_exif_json TEXT;
ALTER TABLE observation_photos ADD COLUMN exif_reading TEXT;
