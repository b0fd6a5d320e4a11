-- Shop records: test procedures, drift tests, pressure-decay tests and inspections.
--
-- Quantities are SI REAL columns named with their unit (m, s, K, Pa, N, h, 1/K). Dates are
-- ISO 8601 TEXT: `YYYY-MM-DD` for calendar dates, RFC 3339 UTC for timestamps. Plain SQL,
-- portable to PostgreSQL.
--
-- Records (drift_tests, decay_tests, inspections) are append-only: the server never updates
-- or deletes a row. A correction is a new row whose `amends_id` names the row it corrects;
-- both stay visible. The records in force are those that no other row amends:
--   NOT EXISTS (SELECT 1 FROM drift_tests a WHERE a.amends_id = drift_tests.id)
-- `client_token` is chosen by the form or client that submits the record, so that a resubmit
-- finds the stored row instead of storing it twice.

-- How a machine maker says to run a test, kept per cylinder (`cylinder_id`) or shared by the
-- machines of one kind (`machine_kind`, matching machines.kind). `kind` is `drift` (a load held
-- part-way, the movement over a duration, limit `limit_distance_m` per `limit_period_s`) or
-- `decay` (a cylinder blocked at end of stroke, limit `limit_pressure_drop_pa` per
-- `limit_period_s`). Procedures are edited in place (the audit log keeps every version) and
-- archived, never deleted; a test keeps the limit it was judged by in its own row.
CREATE TABLE test_procedures (
    id INTEGER PRIMARY KEY,
    kind TEXT NOT NULL DEFAULT 'drift' CHECK (kind IN ('drift', 'decay')),
    name TEXT NOT NULL CHECK (length(name) > 0),
    cylinder_id INTEGER REFERENCES cylinders (id),
    machine_kind TEXT,
    -- The load and posture to hold ("bucket empty, boom level, arm vertical").
    hold_load TEXT,
    posture TEXT,
    -- Where and how to measure ("rod exposed length, mark on chrome to gland face").
    measure_at TEXT,
    oil_temperature_min_k REAL CHECK (oil_temperature_min_k IS NULL OR oil_temperature_min_k > 0),
    oil_temperature_max_k REAL CHECK (oil_temperature_max_k IS NULL OR oil_temperature_max_k > 0),
    duration_s REAL NOT NULL CHECK (duration_s > 0),
    limit_distance_m REAL CHECK (limit_distance_m IS NULL OR limit_distance_m >= 0),
    limit_pressure_drop_pa REAL CHECK (limit_pressure_drop_pa IS NULL OR limit_pressure_drop_pa >= 0),
    limit_period_s REAL CHECK (limit_period_s IS NULL OR limit_period_s > 0),
    oil_expansion_per_k REAL CHECK (oil_expansion_per_k IS NULL OR oil_expansion_per_k > 0),
    notes TEXT,
    created_at TEXT NOT NULL,
    created_by TEXT NOT NULL,
    updated_at TEXT NOT NULL,
    archived_at TEXT,
    CHECK ((cylinder_id IS NOT NULL AND machine_kind IS NULL)
        OR (cylinder_id IS NULL AND machine_kind IS NOT NULL)),
    CHECK (oil_temperature_min_k IS NULL OR oil_temperature_max_k IS NULL
        OR oil_temperature_min_k <= oil_temperature_max_k)
);

CREATE INDEX test_procedures_cylinder ON test_procedures (cylinder_id);
CREATE INDEX test_procedures_machine_kind ON test_procedures (machine_kind);

-- A limit that depends on oil temperature: from `oil_temperature_from_k` up to the next row's
-- temperature, the allowed movement (or pressure drop) is the distance (or drop) per period.
-- Replacing a procedure's table archives the old rows (`archived_at`) and adds new ones.
CREATE TABLE test_procedure_limits (
    id INTEGER PRIMARY KEY,
    procedure_id INTEGER NOT NULL REFERENCES test_procedures (id),
    oil_temperature_from_k REAL NOT NULL CHECK (oil_temperature_from_k > 0),
    limit_distance_m REAL CHECK (limit_distance_m IS NULL OR limit_distance_m >= 0),
    limit_pressure_drop_pa REAL CHECK (limit_pressure_drop_pa IS NULL OR limit_pressure_drop_pa >= 0),
    limit_period_s REAL NOT NULL CHECK (limit_period_s > 0),
    created_at TEXT NOT NULL,
    archived_at TEXT,
    CHECK (limit_distance_m IS NOT NULL OR limit_pressure_drop_pa IS NOT NULL)
);

CREATE INDEX test_procedure_limits_procedure ON test_procedure_limits (procedure_id, oil_temperature_from_k);

-- One position-drift test. The readings are kept as SI columns and, exactly as they were sent
-- to the engineering core with the cylinder's geometry, in `readings_json`; `analysis_json` is
-- the core's answer as computed then, by `calc_version`. `verdict`, `diagnosis` and the scaled
-- drifts are copied out of the analysis for lists and charts. `flags` is a JSON array of words
-- (`oil_temperature_below_window`, `oil_temperature_above_window`,
-- `oil_temperature_changed`).
CREATE TABLE drift_tests (
    id INTEGER PRIMARY KEY,
    cylinder_id INTEGER NOT NULL REFERENCES cylinders (id),
    procedure_id INTEGER REFERENCES test_procedures (id),
    tested_at TEXT NOT NULL,
    technician TEXT NOT NULL CHECK (length(technician) > 0),
    duration_s REAL NOT NULL CHECK (duration_s > 0),
    drift_m REAL,
    start_position_m REAL,
    end_position_m REAL,
    oil_temperature_start_k REAL NOT NULL,
    oil_temperature_end_k REAL NOT NULL,
    ambient_temperature_k REAL,
    cap_pressure_start_pa REAL,
    cap_pressure_end_pa REAL,
    rod_pressure_start_pa REAL,
    rod_pressure_end_pa REAL,
    load_n REAL CHECK (load_n IS NULL OR load_n >= 0),
    load_direction TEXT NOT NULL CHECK (load_direction IN ('retract', 'extend')),
    limit_distance_m REAL,
    limit_period_s REAL,
    readings_json TEXT NOT NULL,
    analysis_json TEXT NOT NULL,
    calc_version TEXT NOT NULL,
    verdict TEXT NOT NULL,
    diagnosis TEXT NOT NULL,
    -- Measured drift scaled to the limit's period (one hour without a limit), m.
    scaled_drift_m REAL NOT NULL,
    -- Measured minus the drift the oil's temperature change explains, m; and that scaled.
    leak_drift_m REAL NOT NULL,
    scaled_leak_drift_m REAL NOT NULL,
    -- The period the drifts are scaled to, s.
    scaled_period_s REAL NOT NULL CHECK (scaled_period_s > 0),
    flags TEXT NOT NULL DEFAULT '[]',
    notes TEXT,
    client_token TEXT UNIQUE,
    amends_id INTEGER REFERENCES drift_tests (id),
    created_at TEXT NOT NULL,
    created_by TEXT NOT NULL
);

CREATE INDEX drift_tests_cylinder_tested ON drift_tests (cylinder_id, tested_at);
CREATE INDEX drift_tests_amends ON drift_tests (amends_id);

-- One pressure-decay test: the cylinder blocked at end of stroke, one end pressurised and
-- held, the pressure read at start and end with the oil temperatures. Same shape as a drift
-- test: readings as SI columns and as sent, the analysis as computed.
CREATE TABLE decay_tests (
    id INTEGER PRIMARY KEY,
    cylinder_id INTEGER NOT NULL REFERENCES cylinders (id),
    procedure_id INTEGER REFERENCES test_procedures (id),
    tested_at TEXT NOT NULL,
    technician TEXT NOT NULL CHECK (length(technician) > 0),
    pressurised_end TEXT NOT NULL CHECK (pressurised_end IN ('cap', 'rod')),
    duration_s REAL NOT NULL CHECK (duration_s > 0),
    pressure_start_pa REAL NOT NULL,
    pressure_end_pa REAL NOT NULL,
    other_pressure_start_pa REAL,
    other_pressure_end_pa REAL,
    oil_temperature_start_k REAL NOT NULL,
    oil_temperature_end_k REAL NOT NULL,
    ambient_temperature_k REAL,
    limit_pressure_drop_pa REAL,
    limit_period_s REAL,
    readings_json TEXT NOT NULL,
    analysis_json TEXT NOT NULL,
    calc_version TEXT NOT NULL,
    verdict TEXT NOT NULL,
    diagnosis TEXT NOT NULL,
    -- Measured pressure change, end minus start, Pa; the part the temperature explains; and the
    -- drop (start minus end) scaled to the limit's period (one hour without a limit).
    pressure_change_pa REAL NOT NULL,
    thermal_pressure_change_pa REAL NOT NULL,
    scaled_drop_pa REAL NOT NULL,
    scaled_period_s REAL NOT NULL CHECK (scaled_period_s > 0),
    flags TEXT NOT NULL DEFAULT '[]',
    notes TEXT,
    client_token TEXT UNIQUE,
    amends_id INTEGER REFERENCES decay_tests (id),
    created_at TEXT NOT NULL,
    created_by TEXT NOT NULL
);

CREATE INDEX decay_tests_cylinder_tested ON decay_tests (cylinder_id, tested_at);
CREATE INDEX decay_tests_amends ON decay_tests (amends_id);

-- One inspection of a machine. `items_json` is a JSON array of
-- {"item", "outcome" ("ok" | "attention" | "fail" | "not_checked"), "leakage_class" (0..5, for
-- external leakage as ISO/TR 11340 grades it, else null), "note"}.
-- A `fail` puts the machine out of service in the same transaction (machines.status, reason,
-- since, and `machines.out_of_service_inspection_id` below); a later `pass` or
-- `pass_with_deficiencies` of the same machine clears it.
CREATE TABLE inspections (
    id INTEGER PRIMARY KEY,
    machine_id INTEGER NOT NULL REFERENCES machines (id),
    kind TEXT NOT NULL CHECK (kind IN ('periodic', 'frequent')),
    performed_on TEXT NOT NULL,
    hour_meter_h REAL CHECK (hour_meter_h IS NULL OR hour_meter_h >= 0),
    inspector TEXT NOT NULL CHECK (length(inspector) > 0),
    result TEXT NOT NULL CHECK (result IN ('pass', 'pass_with_deficiencies', 'fail')),
    items_json TEXT NOT NULL DEFAULT '[]',
    deficiencies TEXT,
    corrective_action TEXT,
    client_token TEXT UNIQUE,
    amends_id INTEGER REFERENCES inspections (id),
    created_at TEXT NOT NULL,
    created_by TEXT NOT NULL
);

CREATE INDEX inspections_machine_kind_performed ON inspections (machine_id, kind, performed_on);
CREATE INDEX inspections_amends ON inspections (amends_id);

-- The inspection that put a machine out of service (NULL when in service, or when the status
-- was set by hand in the registry).
ALTER TABLE machines ADD COLUMN out_of_service_inspection_id INTEGER REFERENCES inspections (id);
