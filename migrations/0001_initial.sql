-- The whole job's shape, filled in as capabilities land.
--
-- An observation is what one person submitted. An organism is the animal it shows:
-- several observations may be one organism once a reviewer merges them. Photos are
-- stored once by content (SHA-256) and may belong to several observations.
-- Identifications form a history; the newest one not superseded is current.

CREATE TABLE people (
    id            INTEGER PRIMARY KEY,
    role          TEXT NOT NULL CHECK (role IN ('observer', 'reviewer', 'admin')),
    display_name  TEXT,
    -- Contact details never leave the server.
    contact       TEXT,
    created_at    TEXT NOT NULL
);

CREATE TABLE walks (
    id                   INTEGER PRIMARY KEY,
    client_id            TEXT NOT NULL UNIQUE,
    observer_id          INTEGER REFERENCES people(id),
    started_at           TEXT NOT NULL,
    ended_at             TEXT,
    all_finds_reported   INTEGER NOT NULL DEFAULT 0,
    distance_m           REAL,
    received_at          TEXT NOT NULL
);

CREATE TABLE organisms (
    id          INTEGER PRIMARY KEY,
    created_at  TEXT NOT NULL
);

CREATE TABLE observations (
    id                  INTEGER PRIMARY KEY,
    client_id           TEXT NOT NULL UNIQUE,
    -- SHA-256 over the submission and its photos' hashes: a resend with the same id
    -- must carry the same content.
    content_sha256      TEXT NOT NULL,
    organism_id         INTEGER NOT NULL REFERENCES organisms(id),
    observer_id         INTEGER REFERENCES people(id),
    walk_id             INTEGER REFERENCES walks(id),
    observed_at         TEXT NOT NULL,   -- RFC 3339 with the phone's offset
    observed_at_utc     TEXT NOT NULL,   -- the same instant in UTC, for sorting
    latitude            REAL,
    longitude           REAL,
    accuracy_m          REAL,
    position_source     TEXT,
    count               INTEGER NOT NULL,
    condition           TEXT NOT NULL,
    setting             TEXT NOT NULL,
    sex                 TEXT NOT NULL,
    notes               TEXT,
    observer_name       TEXT,
    review_state        TEXT NOT NULL DEFAULT 'awaiting_review',
    -- The submission exactly as received, so nothing the phone said is ever lost.
    submission_json     TEXT NOT NULL,
    received_at         TEXT NOT NULL
);
CREATE INDEX observations_observed_at ON observations(observed_at_utc);
CREATE INDEX observations_organism ON observations(organism_id);

CREATE TABLE measurements (
    id              INTEGER PRIMARY KEY,
    observation_id  INTEGER NOT NULL REFERENCES observations(id),
    kind            TEXT NOT NULL,
    value           REAL NOT NULL,
    unit            TEXT NOT NULL,
    value_cm        REAL NOT NULL,
    method          TEXT NOT NULL
);
CREATE INDEX measurements_observation ON measurements(observation_id);

CREATE TABLE human_signs (
    observation_id  INTEGER NOT NULL REFERENCES observations(id),
    sign            TEXT NOT NULL,
    PRIMARY KEY (observation_id, sign)
);

CREATE TABLE photos (
    sha256              TEXT PRIMARY KEY,
    media_type          TEXT NOT NULL,
    byte_len            INTEGER NOT NULL,
    exif_taken_local    TEXT,
    exif_offset         TEXT,
    exif_latitude       REAL,
    exif_longitude      REAL,
    exif_altitude_m     REAL,
    exif_h_error_m      REAL,
    exif_orientation    INTEGER,
    stored_at           TEXT NOT NULL
);

CREATE TABLE observation_photos (
    observation_id  INTEGER NOT NULL REFERENCES observations(id),
    photo_sha256    TEXT NOT NULL REFERENCES photos(sha256),
    position        INTEGER NOT NULL,
    -- The photo's EXIF time turned into an instant for this observation, and which
    -- offset did it (the photo's own, or the record's when the photo had none).
    exif_taken_at   TEXT,
    offset_source   TEXT,
    PRIMARY KEY (observation_id, photo_sha256)
);

CREATE TABLE identifications (
    id                  INTEGER PRIMARY KEY,
    observation_id      INTEGER NOT NULL REFERENCES observations(id),
    taxon_name          TEXT NOT NULL,
    taxon_rank          TEXT,
    identified_by       TEXT,
    identified_by_id    INTEGER REFERENCES people(id),
    identified_at       TEXT NOT NULL,
    remarks             TEXT,
    -- 'observer guess' for the first, reviewer decisions after.
    basis               TEXT NOT NULL,
    superseded_by       INTEGER REFERENCES identifications(id)
);
CREATE INDEX identifications_observation ON identifications(observation_id);
