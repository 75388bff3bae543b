-- Flags raised when a record arrives (oversize, out of range), each with its reason in
-- plain words, kept for reviewers. A flag is never deleted; a later review decision
-- supersedes it.
CREATE TABLE observation_flags (
    observation_id  INTEGER NOT NULL REFERENCES observations(id),
    kind            TEXT NOT NULL,
    reason          TEXT NOT NULL,
    raised_at       TEXT NOT NULL,
    PRIMARY KEY (observation_id, kind)
);
