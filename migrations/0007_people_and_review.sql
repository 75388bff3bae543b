-- People and review. Reviewers and admins sign in with a password (argon2 hash);
-- observers are a device identity (a random token, stored only as its SHA-256).
-- Sessions are stored by the hash of their cookie token, with their CSRF token.
-- Every review action is a row in review_events; nothing is deleted, only superseded.
ALTER TABLE people ADD COLUMN username TEXT;
ALTER TABLE people ADD COLUMN password_hash TEXT;
ALTER TABLE people ADD COLUMN device_token_sha256 TEXT;
ALTER TABLE people ADD COLUMN disabled INTEGER NOT NULL DEFAULT 0;
CREATE UNIQUE INDEX people_username ON people(username) WHERE username IS NOT NULL;
CREATE UNIQUE INDEX people_device ON people(device_token_sha256) WHERE device_token_sha256 IS NOT NULL;

CREATE TABLE sessions (
    token_sha256  TEXT PRIMARY KEY,
    person_id     INTEGER NOT NULL REFERENCES people(id),
    csrf_token    TEXT NOT NULL,
    created_at    TEXT NOT NULL,
    expires_at    TEXT NOT NULL
);

CREATE TABLE review_events (
    id              INTEGER PRIMARY KEY,
    observation_id  INTEGER NOT NULL REFERENCES observations(id),
    person_id       INTEGER REFERENCES people(id),
    action          TEXT NOT NULL,
    from_state      TEXT NOT NULL,
    to_state        TEXT NOT NULL,
    detail          TEXT,
    at              TEXT NOT NULL
);
CREATE INDEX review_events_observation ON review_events(observation_id);

-- The conversation between reviewers and the observer about one record. A reply made
-- on the phone carries the phone's id, so a resend is not a second reply.
CREATE TABLE messages (
    id              INTEGER PRIMARY KEY,
    client_id       TEXT UNIQUE,
    observation_id  INTEGER NOT NULL REFERENCES observations(id),
    person_id       INTEGER REFERENCES people(id),
    author_role     TEXT NOT NULL,
    body            TEXT NOT NULL,
    at              TEXT NOT NULL
);
CREATE INDEX messages_observation ON messages(observation_id);
