-- The current identification by taxon name. Intake asks, for every arriving record
-- that names a checklist species, where that species has been confirmed before (the
-- out-of-range flag); without this index that question read every identification, so
-- each arrival cost more as the network's records grew.
CREATE INDEX identifications_current_taxon ON identifications(taxon_name) WHERE superseded_by IS NULL;
