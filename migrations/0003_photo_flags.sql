-- Each photo compared with the record it came with (server/src/intake/flags.rs): how
-- long before the record's time it was taken (seconds; negative = after) and how far
-- from the record's position (geodesic metres, WGS84). NULL when either side does not
-- say. A photo shared by two records is compared with each.

ALTER TABLE observation_photos ADD COLUMN seconds_before_record REAL;
ALTER TABLE observation_photos ADD COLUMN metres_from_record REAL;

-- The questions those raise for the reviewer. A flag is kept until a reviewer's decision
-- supersedes it (review comes with a later issue); it is never a refusal.
CREATE TABLE photo_flags (
    observation_id  INTEGER NOT NULL,
    photo_sha256    TEXT NOT NULL,
    flag            TEXT NOT NULL CHECK (flag IN ('taken_long_before_record', 'taken_far_from_record')),
    PRIMARY KEY (observation_id, photo_sha256, flag),
    FOREIGN KEY (observation_id, photo_sha256) REFERENCES observation_photos(observation_id, photo_sha256)
);
