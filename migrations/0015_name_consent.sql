-- Whether an observer agreed to be named in open data, and a stable pseudonymous id to
-- publish in their name's place when they did not.
--
-- name_public: 1 once the observer ticked "publish my name with my records" on their
-- phone; 0 otherwise. Existing people keep 0: nobody was asked before this migration,
-- so nobody is named.
-- public_id: 32 random hex digits, made here (and by the server for each new person);
-- never derived from a device token or anything else, so it says nothing about who
-- the person is. Exports print a short label made from it ("observer-3f9a2c1d4e5b").
ALTER TABLE people ADD COLUMN name_public INTEGER NOT NULL DEFAULT 0;
ALTER TABLE people ADD COLUMN public_id TEXT;
UPDATE people SET public_id = lower(hex(randomblob(16))) WHERE public_id IS NULL;
CREATE UNIQUE INDEX people_public_id ON people(public_id);
