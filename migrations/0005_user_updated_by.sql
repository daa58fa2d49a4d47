-- Who changed an account last, beside its revision and updated_at, so that a role
-- change made on a stale revision can be refused naming who changed it and when.
-- Accounts created before this migration read as changed by the system.

ALTER TABLE user ADD COLUMN updated_by TEXT NOT NULL DEFAULT 'system';
