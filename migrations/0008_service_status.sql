-- Status driven by records: the decision each shop record ends in, who signed it, and the
-- status history of machines and cylinders. Plain SQL, portable to PostgreSQL.

-- Each record's decision (`fit_for_service`, `restricted`, `remove_from_service`) and its
-- reasons and restrictions as JSON ({"reasons": [...], "restrictions": [...], "rules": [...]}),
-- as decided when the record was stored. NULL on records stored before this migration (the
-- API then decides from the stored verdict, diagnosis or result). `signed_by_user_id` is the
-- account that signed the record (`created_by` holds its display name); NULL for bearer
-- tokens and the server itself.
ALTER TABLE drift_tests ADD COLUMN decision TEXT
    CHECK (decision IS NULL OR decision IN ('fit_for_service', 'restricted', 'remove_from_service'));
ALTER TABLE drift_tests ADD COLUMN decision_json TEXT;
ALTER TABLE drift_tests ADD COLUMN signed_by_user_id INTEGER REFERENCES users (id);
ALTER TABLE decay_tests ADD COLUMN decision TEXT
    CHECK (decision IS NULL OR decision IN ('fit_for_service', 'restricted', 'remove_from_service'));
ALTER TABLE decay_tests ADD COLUMN decision_json TEXT;
ALTER TABLE decay_tests ADD COLUMN signed_by_user_id INTEGER REFERENCES users (id);
ALTER TABLE inspections ADD COLUMN decision TEXT
    CHECK (decision IS NULL OR decision IN ('fit_for_service', 'restricted', 'remove_from_service'));
ALTER TABLE inspections ADD COLUMN decision_json TEXT;
ALTER TABLE inspections ADD COLUMN signed_by_user_id INTEGER REFERENCES users (id);

-- Every change of a machine's or a cylinder's service status: who, when, why, and which
-- record (`record_kind` + `record_id`: a drift test, decay test or inspection whose decision
-- set it, or `return_to_service` for a manager's approval, whose `record_id` names the retest
-- that made the machine eligible). `machine_status` and `cylinder_status` are the statuses
-- after the change (`cylinder_status` NULL for a row about the machine alone). The current
-- status is the latest row's. Append-only: the triggers refuse any update or delete.
CREATE TABLE status_changes (
    id INTEGER PRIMARY KEY,
    at TEXT NOT NULL,
    actor TEXT NOT NULL,
    actor_user_id INTEGER REFERENCES users (id),
    machine_id INTEGER NOT NULL REFERENCES machines (id),
    cylinder_id INTEGER REFERENCES cylinders (id),
    machine_status TEXT NOT NULL
        CHECK (machine_status IN ('in_service', 'restricted', 'out_of_service')),
    cylinder_status TEXT
        CHECK (cylinder_status IS NULL OR cylinder_status IN ('in_service', 'restricted', 'out_of_service')),
    decision TEXT
        CHECK (decision IS NULL OR decision IN ('fit_for_service', 'restricted', 'remove_from_service')),
    reason TEXT NOT NULL CHECK (length(reason) > 0),
    restrictions_json TEXT NOT NULL DEFAULT '[]',
    record_kind TEXT NOT NULL
        CHECK (record_kind IN ('drift_test', 'decay_test', 'inspection', 'return_to_service')),
    record_id INTEGER,
    note TEXT
);

CREATE INDEX status_changes_machine ON status_changes (machine_id, id);
CREATE INDEX status_changes_cylinder ON status_changes (cylinder_id, id);

CREATE TRIGGER status_changes_no_update BEFORE UPDATE ON status_changes
BEGIN
    SELECT RAISE(ABORT, 'status history is append-only');
END;

CREATE TRIGGER status_changes_no_delete BEFORE DELETE ON status_changes
BEGIN
    SELECT RAISE(ABORT, 'status history is append-only');
END;

-- The site a user works at (optional): a technician's shop work list shows that site's due
-- items; with none set, every site's.
ALTER TABLE users ADD COLUMN site_id INTEGER REFERENCES sites (id);
