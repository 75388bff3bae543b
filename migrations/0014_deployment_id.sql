-- A random identifier of this wrackline installation, made once when this migration runs,
-- so that identifiers derived from it stay the same from one export to the next: each
-- dataset's EML packageId is built from it and from what the dataset holds.
CREATE TABLE deployment (
    id      TEXT NOT NULL,   -- 32 lowercase hex digits
    made_at TEXT NOT NULL    -- RFC 3339, UTC
);
INSERT INTO deployment (id, made_at) VALUES (lower(hex(randomblob(16))), strftime('%Y-%m-%dT%H:%M:%fZ', 'now'));
