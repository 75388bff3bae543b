-- The animal's life stage (egg case, embryo, juvenile, adult), when the observer chose
-- one; exported as Darwin Core lifeStage. Records stored before keep it in
-- submission_json only if they had it (none did), so the copy below is for safety.
ALTER TABLE observations ADD COLUMN life_stage TEXT;
UPDATE observations SET life_stage = json_extract(submission_json, '$.life_stage')
    WHERE json_extract(submission_json, '$.life_stage') IS NOT NULL;
