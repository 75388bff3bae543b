-- Duplicates, made exact (server/src/store/duplicates.rs).
--
-- merge_moves: every record a merge moved, with its organism and review state before
-- the merge. A merge moves the whole animal it joins (a record that already holds others
-- brings them along), and undoing it puts exactly these rows back. Merges made before
-- this migration moved one record, the one named in `merges`; it is copied here.
CREATE TABLE merge_moves (
    merge_id                INTEGER NOT NULL REFERENCES merges(id),
    observation_id          INTEGER NOT NULL REFERENCES observations(id),
    previous_organism_id    INTEGER NOT NULL REFERENCES organisms(id),
    previous_state          TEXT NOT NULL,
    PRIMARY KEY (merge_id, observation_id)
);
CREATE INDEX merge_moves_observation ON merge_moves(observation_id);
INSERT INTO merge_moves (merge_id, observation_id, previous_organism_id, previous_state)
    SELECT id, merged_observation_id, previous_organism_id, previous_state FROM merges;

-- duplicate_searches: records whose search for duplicates completed. A record stored
-- without one (the search failed after the record was) is searched again when the phone
-- resends it, and at start-up. Records stored before this migration were searched.
CREATE TABLE duplicate_searches (
    observation_id  INTEGER PRIMARY KEY REFERENCES observations(id),
    searched_at     TEXT NOT NULL
);
INSERT INTO duplicate_searches (observation_id, searched_at) SELECT id, received_at FROM observations;

-- original_sha256: SHA-256 of the original file the phone picked (it sends only an
-- upload copy), from the phone's reading; the same original on two phones gives two
-- different upload copies but one original_sha256. NULL when the phone sent none.
ALTER TABLE observation_photos ADD COLUMN original_sha256 TEXT;
CREATE INDEX observation_photos_original ON observation_photos(original_sha256) WHERE original_sha256 IS NOT NULL;
-- Records sharing a photo file are looked up by the file's hash.
CREATE INDEX observation_photos_photo ON observation_photos(photo_sha256);
