-- Likely duplicates (the same animal reported twice), the reviewers' decisions about
-- them, and merges, which can be undone exactly. Nothing here is ever deleted: a merge
-- that is undone keeps its row with `undone_at`.
CREATE TABLE duplicate_candidates (
    observation_a   INTEGER NOT NULL REFERENCES observations(id),
    observation_b   INTEGER NOT NULL REFERENCES observations(id),
    score           REAL NOT NULL,
    reasons         TEXT NOT NULL,   -- JSON list of plain-words reasons
    found_at        TEXT NOT NULL,
    PRIMARY KEY (observation_a, observation_b),
    CHECK (observation_a < observation_b)
);
CREATE INDEX duplicate_candidates_b ON duplicate_candidates(observation_b);

CREATE TABLE duplicate_decisions (
    id              INTEGER PRIMARY KEY,
    observation_a   INTEGER NOT NULL REFERENCES observations(id),
    observation_b   INTEGER NOT NULL REFERENCES observations(id),
    decision        TEXT NOT NULL CHECK (decision IN ('same animal', 'different animals')),
    person_id       INTEGER REFERENCES people(id),
    at              TEXT NOT NULL,
    CHECK (observation_a < observation_b)
);

CREATE TABLE merges (
    id                      INTEGER PRIMARY KEY,
    kept_observation_id     INTEGER NOT NULL REFERENCES observations(id),
    merged_observation_id   INTEGER NOT NULL REFERENCES observations(id),
    previous_organism_id    INTEGER NOT NULL REFERENCES organisms(id),
    previous_state          TEXT NOT NULL,
    person_id               INTEGER REFERENCES people(id),
    at                      TEXT NOT NULL,
    undone_at               TEXT,
    undone_by               INTEGER REFERENCES people(id)
);
