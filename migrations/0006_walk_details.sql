-- Survey walks as the phone sends them: the whole submission kept, its fingerprint for
-- telling a retry from a changed resend, and the effort worked out on arrival. Records
-- name their walk by the walk's client id, since a record may arrive before its walk.
ALTER TABLE walks ADD COLUMN content_sha256 TEXT;
ALTER TABLE walks ADD COLUMN submission_json TEXT;
ALTER TABLE walks ADD COLUMN stretch TEXT;
ALTER TABLE walks ADD COLUMN observer_name TEXT;
ALTER TABLE walks ADD COLUMN duration_s REAL;
ALTER TABLE walks ADD COLUMN distance_source TEXT;
ALTER TABLE observations ADD COLUMN walk_client_id TEXT;
CREATE INDEX observations_walk ON observations(walk_client_id);
