-- A photo whose file ends before its image data does (a JPEG with no end-of-image
-- marker after its scan) is kept, since it may be the only evidence, and flagged for
-- the reviewer: `cut_short` joins the photo flags. SQLite cannot change a CHECK in
-- place, so the table is made again with the wider CHECK and its rows copied over.

CREATE TABLE photo_flags_new (
    observation_id  INTEGER NOT NULL,
    photo_sha256    TEXT NOT NULL,
    flag            TEXT NOT NULL CHECK (flag IN ('taken_long_before_record', 'taken_far_from_record', 'cut_short')),
    PRIMARY KEY (observation_id, photo_sha256, flag),
    FOREIGN KEY (observation_id, photo_sha256) REFERENCES observation_photos(observation_id, photo_sha256)
);
INSERT INTO photo_flags_new (observation_id, photo_sha256, flag) SELECT observation_id, photo_sha256, flag FROM photo_flags;
DROP TABLE photo_flags;
ALTER TABLE photo_flags_new RENAME TO photo_flags;
