-- Design reviews: a frozen snapshot of a study (the engine's study file, its results and
-- the engine version), who takes part, what is on screen, and what was said and decided.
-- The snapshot columns are written once and never updated; a review outlives later edits
-- of its study. A study with reviews cannot be deleted while they exist (no cascade), so
-- the record of decisions is never lost by accident.

CREATE TABLE review (
    id             INTEGER PRIMARY KEY,
    study_id       INTEGER NOT NULL REFERENCES study (id),
    title          TEXT NOT NULL CHECK (length(title) BETWEEN 1 AND 200),
    -- The study's revision when the snapshot was taken (for the record only).
    study_revision INTEGER NOT NULL,
    study_json     TEXT NOT NULL CHECK (json_valid(study_json)),
    results_json   TEXT NOT NULL CHECK (json_valid(results_json)),
    engine_version TEXT NOT NULL,
    status         TEXT NOT NULL DEFAULT 'open' CHECK (status IN ('open', 'closed')),
    -- Username of whoever chooses what is on screen, and the view they chose
    -- ("" overview, "compare", "trade", "candidates/N", "segments/N").
    presenter      TEXT NOT NULL,
    current_view   TEXT NOT NULL DEFAULT '',
    created_by     TEXT NOT NULL,
    created_at     TEXT NOT NULL,
    closed_by      TEXT,
    closed_at      TEXT
);
CREATE INDEX review_study ON review (study_id, id);

-- People invited to or present at a review (usernames of accounts).
CREATE TABLE review_participant (
    review_id INTEGER NOT NULL REFERENCES review (id) ON DELETE CASCADE,
    username  TEXT NOT NULL,
    added_at  TEXT NOT NULL,
    PRIMARY KEY (review_id, username)
);

-- Comments on the whole review (candidate NULL) or on one candidate of the snapshot.
CREATE TABLE review_comment (
    id         INTEGER PRIMARY KEY,
    review_id  INTEGER NOT NULL REFERENCES review (id) ON DELETE CASCADE,
    candidate  TEXT,
    body       TEXT NOT NULL CHECK (length(body) BETWEEN 1 AND 2000),
    created_by TEXT NOT NULL,
    created_at TEXT NOT NULL
);
CREATE INDEX review_comment_review ON review_comment (review_id, id);

-- Decisions per candidate, append-only: the latest row for a candidate is in force,
-- earlier ones stay as the record of how the decision moved.
CREATE TABLE review_decision (
    id         INTEGER PRIMARY KEY,
    review_id  INTEGER NOT NULL REFERENCES review (id) ON DELETE CASCADE,
    candidate  TEXT NOT NULL,
    outcome    TEXT NOT NULL CHECK (outcome IN ('carry_forward', 'hold', 'drop')),
    rationale  TEXT NOT NULL CHECK (length(rationale) BETWEEN 1 AND 2000),
    decided_by TEXT NOT NULL,
    decided_at TEXT NOT NULL
);
CREATE INDEX review_decision_review ON review_decision (review_id, id);
