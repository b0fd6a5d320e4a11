-- Accounts and access: users with roles, login sessions, API bearer tokens, login attempts.
--
-- Secrets are never stored in the clear: a password is an Argon2id PHC string, a session or
-- bearer token is stored as the hex SHA-256 of the random value handed to the client.
-- Timestamps are RFC 3339 UTC TEXT. Users and tokens are never deleted: they are disabled or
-- revoked, so the audit log keeps pointing at them. Plain SQL, portable to PostgreSQL.

CREATE TABLE users (
    id INTEGER PRIMARY KEY,
    username TEXT NOT NULL CHECK (length(username) > 0),
    display_name TEXT NOT NULL CHECK (length(display_name) > 0),
    role TEXT NOT NULL CHECK (role IN ('technician', 'manager', 'admin')),
    password_hash TEXT NOT NULL,
    created_at TEXT NOT NULL,
    updated_at TEXT NOT NULL,
    disabled_at TEXT
);

CREATE UNIQUE INDEX users_username_unique ON users (username);

-- A browser login. The cookie holds the token; only its hash is kept here. `csrf_token` is the
-- anti-forgery value every form of this session must echo back.
CREATE TABLE sessions (
    id INTEGER PRIMARY KEY,
    token_hash TEXT NOT NULL,
    user_id INTEGER NOT NULL REFERENCES users (id),
    csrf_token TEXT NOT NULL,
    created_at TEXT NOT NULL,
    expires_at TEXT NOT NULL,
    last_seen_at TEXT NOT NULL
);

CREATE UNIQUE INDEX sessions_token_hash_unique ON sessions (token_hash);
CREATE INDEX sessions_user ON sessions (user_id);
CREATE INDEX sessions_expires ON sessions (expires_at);

-- A bearer token for an integration. It acts with its own role; `created_by` is the admin who
-- made it (NULL when made from the command line). `token_prefix` is the first characters of the
-- token, shown in lists so a token can be recognised without revealing it.
CREATE TABLE api_tokens (
    id INTEGER PRIMARY KEY,
    name TEXT NOT NULL CHECK (length(name) > 0),
    token_hash TEXT NOT NULL,
    token_prefix TEXT NOT NULL,
    role TEXT NOT NULL CHECK (role IN ('technician', 'manager', 'admin')),
    created_by INTEGER REFERENCES users (id),
    created_at TEXT NOT NULL,
    last_used_at TEXT,
    revoked_at TEXT
);

CREATE UNIQUE INDEX api_tokens_token_hash_unique ON api_tokens (token_hash);

-- Every login attempt, kept for throttling (failures per account and per address in a window)
-- and as a record of who logged in when. `username` is as typed, lower-cased.
CREATE TABLE login_attempts (
    id INTEGER PRIMARY KEY,
    at TEXT NOT NULL,
    username TEXT NOT NULL,
    address TEXT NOT NULL,
    succeeded INTEGER NOT NULL CHECK (succeeded IN (0, 1))
);

CREATE INDEX login_attempts_username ON login_attempts (username, at);
CREATE INDEX login_attempts_address ON login_attempts (address, at);
