-- Studies and their rows. JSON columns hold objects of the study file format
-- (already validated by the engine before they are written). Every editable row
-- carries a revision for optimistic concurrency, and who changed it last and when.
-- Results are not stored here: they are recomputed from these inputs.

CREATE TABLE study (
    id           INTEGER PRIMARY KEY,
    name         TEXT NOT NULL,
    notes        TEXT,
    aircraft     TEXT NOT NULL CHECK (json_valid(aircraft)),
    installation TEXT CHECK (installation IS NULL OR json_valid(installation)),
    integration  TEXT CHECK (integration IS NULL OR json_valid(integration)),
    scoring      TEXT CHECK (scoring IS NULL OR json_valid(scoring)),
    -- Bumped by any change to the study or to one of its rows (the API's ETag).
    revision     INTEGER NOT NULL DEFAULT 1,
    created_at   TEXT NOT NULL,
    updated_at   TEXT NOT NULL,
    updated_by   TEXT NOT NULL
);

-- Mission segment rows, flown in ascending position.
CREATE TABLE segment (
    id         INTEGER PRIMARY KEY,
    study_id   INTEGER NOT NULL REFERENCES study (id) ON DELETE CASCADE,
    position   INTEGER NOT NULL,
    body       TEXT NOT NULL CHECK (json_valid(body)),
    revision   INTEGER NOT NULL DEFAULT 1,
    updated_at TEXT NOT NULL,
    updated_by TEXT NOT NULL
);
CREATE INDEX segment_study ON segment (study_id, position);

-- Motor candidates: the whole candidate object (name, drive, source).
CREATE TABLE candidate (
    id         INTEGER PRIMARY KEY,
    study_id   INTEGER NOT NULL REFERENCES study (id) ON DELETE CASCADE,
    position   INTEGER NOT NULL,
    body       TEXT NOT NULL CHECK (json_valid(body)),
    revision   INTEGER NOT NULL DEFAULT 1,
    updated_at TEXT NOT NULL,
    updated_by TEXT NOT NULL
);
CREATE INDEX candidate_study ON candidate (study_id, position);
