-- Hardening: an inspection may say its hour meter was replaced; every API token has an owner
-- account and may expire; unlocks of throttled logins; the keys that make unit numbers and
-- site names unique regardless of case, separators and look-alike characters.
-- Plain SQL, portable to PostgreSQL.

-- A reading of a new hour meter may be below the machine's last reading (0 = a normal reading).
ALTER TABLE inspections ADD COLUMN hour_meter_replaced INTEGER NOT NULL DEFAULT 0
    CHECK (hour_meter_replaced IN (0, 1));

-- The account a token acts for: the token stops when the owner is disabled or holds a lower
-- role than the token. Tokens made before owners existed belong to the user who made them.
ALTER TABLE api_tokens ADD COLUMN owner_id INTEGER REFERENCES users (id);
ALTER TABLE api_tokens ADD COLUMN expires_at TEXT;
-- Tokens made on the command line (no maker recorded) go to the first enabled admin; with no
-- users at all they stay ownerless and work as before until revoked.
UPDATE api_tokens SET owner_id = created_by WHERE owner_id IS NULL;
UPDATE api_tokens SET owner_id = (SELECT id FROM users WHERE role = 'admin'
    ORDER BY disabled_at IS NOT NULL, id LIMIT 1) WHERE owner_id IS NULL;

-- An admin's unlock (or a password reset) of a throttled account: failed logins up to
-- `after_attempt_id` no longer count against it.
CREATE TABLE login_unlocks (
    id INTEGER PRIMARY KEY,
    at TEXT NOT NULL,
    username TEXT NOT NULL,
    after_attempt_id INTEGER NOT NULL,
    actor TEXT NOT NULL
);
CREATE INDEX login_unlocks_username ON login_unlocks (username, after_attempt_id);
CREATE INDEX login_attempts_pair ON login_attempts (username, address, id);

-- Unit numbers and site names compared as people read them (db/names.rs): NFKC, case-folded,
-- separators dropped, look-alike characters mapped to one skeleton. Filled by the server for
-- rows written before this migration; checked on every write (not UNIQUE: rows stored before
-- may already clash, and those must stay readable).
ALTER TABLE machines ADD COLUMN unit_key TEXT;
CREATE INDEX machines_unit_key ON machines (unit_key);
ALTER TABLE sites ADD COLUMN name_key TEXT;
CREATE INDEX sites_name_key ON sites (name_key);
