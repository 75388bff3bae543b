-- For the people who go out (server/src/store/fieldwork.rs, server/src/notify/).
--
-- people: a new role, `responder` (trained people who go out to live animals). The
--         role's CHECK cannot be altered in place, so the table is rebuilt with the same
--         columns and rows, the way SQLite's documentation of ALTER TABLE describes:
--         foreign keys off while it runs, checked before it commits (migrate.rs).
-- responses: what responders did about a live animal (who went, when, the outcome),
--            logged by a signed-in responder, reviewer or admin. Rows are never changed
--            or deleted; a later response is a new row.
-- samples: samples taken from an animal, each with its own id or barcode (`code`,
--          unique), how it is kept, where and by whom. Added on one record
--          (`observation_id`); the animal's samples are those of all its records, read
--          through `observations.organism_id`, so a merge and its undo carry them along.
-- carcasses: the carcass's fate and what an examination found, one row per record it
--            was reported on, replaced when corrected (the trail keeps every version).
-- fieldwork_events: every change to a sample or a carcass report: who, when, what.
-- notifications: one row per urgent record and channel (webhook, email), made when
--                the record arrives; delivered in the background and retried until the
--                receiver acknowledges. The unique key makes a resend notify no one twice.
CREATE TABLE people_rebuilt (
    id                   INTEGER PRIMARY KEY,
    role                 TEXT NOT NULL CHECK (role IN ('observer', 'reviewer', 'admin', 'responder')),
    display_name         TEXT,
    -- Contact details never leave the server.
    contact              TEXT,
    created_at           TEXT NOT NULL,
    username             TEXT,
    password_hash        TEXT,
    device_token_sha256  TEXT,
    disabled             INTEGER NOT NULL DEFAULT 0,
    name_public          INTEGER NOT NULL DEFAULT 0,
    public_id            TEXT
);
INSERT INTO people_rebuilt (id, role, display_name, contact, created_at, username, password_hash, device_token_sha256, disabled, name_public, public_id)
    SELECT id, role, display_name, contact, created_at, username, password_hash, device_token_sha256, disabled, name_public, public_id FROM people;
DROP TABLE people;
ALTER TABLE people_rebuilt RENAME TO people;
CREATE UNIQUE INDEX people_username ON people(username) WHERE username IS NOT NULL;
CREATE UNIQUE INDEX people_device ON people(device_token_sha256) WHERE device_token_sha256 IS NOT NULL;
CREATE UNIQUE INDEX people_public_id ON people(public_id);

CREATE TABLE responses (
    id              INTEGER PRIMARY KEY,
    observation_id  INTEGER NOT NULL REFERENCES observations(id),
    who_went        TEXT NOT NULL,
    went_at         TEXT NOT NULL,
    outcome         TEXT NOT NULL,
    notes           TEXT,
    person_id       INTEGER NOT NULL REFERENCES people(id),
    logged_at       TEXT NOT NULL
);
CREATE INDEX responses_observation ON responses(observation_id);

CREATE TABLE samples (
    id              INTEGER PRIMARY KEY,
    code            TEXT NOT NULL UNIQUE,
    observation_id  INTEGER NOT NULL REFERENCES observations(id),
    kind            TEXT NOT NULL,
    preservation    TEXT NOT NULL,
    stored_at       TEXT NOT NULL,
    held_by         TEXT NOT NULL,
    notes           TEXT,
    person_id       INTEGER NOT NULL REFERENCES people(id),
    added_at        TEXT NOT NULL,
    changed_at      TEXT
);
CREATE INDEX samples_observation ON samples(observation_id);

CREATE TABLE carcasses (
    observation_id  INTEGER PRIMARY KEY REFERENCES observations(id),
    report_json     TEXT NOT NULL,
    person_id       INTEGER NOT NULL REFERENCES people(id),
    recorded_at     TEXT NOT NULL
);

CREATE TABLE fieldwork_events (
    id              INTEGER PRIMARY KEY,
    observation_id  INTEGER NOT NULL REFERENCES observations(id),
    sample_code     TEXT,
    person_id       INTEGER NOT NULL REFERENCES people(id),
    detail          TEXT NOT NULL,
    at              TEXT NOT NULL
);
CREATE INDEX fieldwork_events_observation ON fieldwork_events(observation_id);

CREATE TABLE notifications (
    id              INTEGER PRIMARY KEY,
    observation_id  INTEGER NOT NULL REFERENCES observations(id),
    channel         TEXT NOT NULL,
    delivery_id     TEXT NOT NULL UNIQUE,
    attempts        INTEGER NOT NULL DEFAULT 0,
    next_attempt_at TEXT NOT NULL,
    last_error      TEXT,
    created_at      TEXT NOT NULL,
    delivered_at    TEXT,
    UNIQUE (observation_id, channel)
);
CREATE INDEX notifications_due ON notifications(next_attempt_at) WHERE delivered_at IS NULL;
