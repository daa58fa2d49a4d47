-- The audit trail: one row per change of a study, a segment or candidate row, the
-- scoring weights, or an account; who made it, when, and the values before and after
-- (JSON; NULL before a creation and after a deletion). Written in the same
-- transaction as the change itself. Append-only: the triggers refuse updates and
-- deletes. No foreign key on study_id, so a study's history outlives the study.

CREATE TABLE audit_log (
    id          INTEGER PRIMARY KEY,
    at          TEXT NOT NULL,
    actor       TEXT NOT NULL,
    -- The study the change belongs to; NULL for accounts.
    study_id    INTEGER,
    entity_kind TEXT NOT NULL
                CHECK (entity_kind IN ('study', 'segment', 'candidate', 'weights', 'account')),
    entity_id   INTEGER NOT NULL,
    action      TEXT NOT NULL
                CHECK (action IN ('create', 'update', 'replace', 'move', 'delete')),
    before      TEXT CHECK (before IS NULL OR json_valid(before)),
    after       TEXT CHECK (after IS NULL OR json_valid(after))
);
CREATE INDEX audit_log_study ON audit_log (study_id, id);

CREATE TRIGGER audit_log_no_update BEFORE UPDATE ON audit_log
BEGIN
    SELECT RAISE(ABORT, 'audit_log is append-only');
END;

CREATE TRIGGER audit_log_no_delete BEFORE DELETE ON audit_log
BEGIN
    SELECT RAISE(ABORT, 'audit_log is append-only');
END;
