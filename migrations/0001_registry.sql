-- placeholder until the registry schema lands
CREATE TABLE IF NOT EXISTS schema_note (id INTEGER PRIMARY KEY, note TEXT NOT NULL);
