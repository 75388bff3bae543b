-- When an observer named their own record (a typed guess, or a pick with the guided key),
-- identified_at held the moment the server received the record, which can be days later
-- (phones send when they find a signal). The observer named it when they made the record:
-- the submission's own time. New rows store that instant (in UTC, like every other
-- identification time, so the history sorts in order); this corrects the rows already
-- stored. The receipt time stays in observations.received_at.
UPDATE identifications
SET identified_at = (
    SELECT strftime('%Y-%m-%dT%H:%M:%fZ', o.observed_at_utc)
    FROM observations o
    WHERE o.id = identifications.observation_id
)
WHERE basis IN ('observer guess', 'observer with the guided key');
