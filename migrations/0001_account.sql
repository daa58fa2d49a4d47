-- Accounts: people, their browser sessions and their API tokens.
-- Secrets are never stored in clear: passwords as Argon2id PHC strings,
-- session and API tokens as SHA-256 hex digests.

CREATE TABLE user (
    id            INTEGER PRIMARY KEY,
    username      TEXT NOT NULL UNIQUE,
    password_hash TEXT NOT NULL,
    role          TEXT NOT NULL CHECK (role IN ('viewer', 'editor', 'admin')),
    revision      INTEGER NOT NULL DEFAULT 1,
    created_at    TEXT NOT NULL,
    updated_at    TEXT NOT NULL
);

CREATE TABLE session (
    token_hash TEXT PRIMARY KEY,
    user_id    INTEGER NOT NULL REFERENCES user (id) ON DELETE CASCADE,
    -- Per-session anti-forgery token echoed by every state-changing form.
    csrf_token TEXT NOT NULL,
    created_at TEXT NOT NULL,
    -- Unix seconds; a session past this instant is treated as absent.
    expires_at INTEGER NOT NULL
);
CREATE INDEX session_user ON session (user_id);

CREATE TABLE api_token (
    id         INTEGER PRIMARY KEY,
    token_hash TEXT NOT NULL UNIQUE,
    user_id    INTEGER NOT NULL REFERENCES user (id) ON DELETE CASCADE,
    created_at TEXT NOT NULL
);
