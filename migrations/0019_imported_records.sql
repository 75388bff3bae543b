-- Where an imported record came from: the dataset it was kept in before, the file it was
-- read from, and the source's own id for its row (the row's occurrenceID, or a hash of
-- the row when it had none), so an import can be traced back to its row and a re-run
-- recognised. One row per imported observation; records made with the phone have none.
CREATE TABLE imported_records (
    observation_id INTEGER PRIMARY KEY REFERENCES observations(id),
    dataset_name TEXT NOT NULL,
    source_file TEXT NOT NULL,
    source_row_id TEXT NOT NULL,
    source_line INTEGER NOT NULL,
    imported_at TEXT NOT NULL
);
