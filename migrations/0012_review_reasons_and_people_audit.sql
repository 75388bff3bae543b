-- Why each review action was taken (the reviewer's reason, remark or question), kept
-- beside what it changed (`detail`); and an audit trail of changes to people with a
-- sign-in: added, role changed, password reset, turned off or on. Nothing here is
-- ever deleted.
ALTER TABLE review_events ADD COLUMN reason TEXT;

CREATE TABLE people_events (
    id              INTEGER PRIMARY KEY,
    -- Whose sign-in changed.
    person_id       INTEGER NOT NULL REFERENCES people(id),
    -- The admin who changed it; NULL when done on the server (`wrackline user add`).
    by_person_id    INTEGER REFERENCES people(id),
    action          TEXT NOT NULL,
    detail          TEXT,
    at              TEXT NOT NULL
);
CREATE INDEX people_events_person ON people_events(person_id);
