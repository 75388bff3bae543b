-- Each version of the published dataset (its entity tag) and when it was first built, so
-- `Last-Modified` on /dataset/* stays the same across restarts for as long as the
-- published data, licence and description do.
CREATE TABLE published_versions (
    etag TEXT PRIMARY KEY,
    first_published_at TEXT NOT NULL
);
