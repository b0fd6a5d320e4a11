-- The fleet registry: sites, machines, cylinders, hose assemblies, and the audit log.
--
-- Quantities are SI REAL columns named with their unit (m, Pa, N, h). Dates are ISO 8601 TEXT:
-- `YYYY-MM-DD` for calendar dates, RFC 3339 UTC for timestamps. Nothing is deleted: a record
-- leaves the lists when `archived_at` is set. `created_at` is the registration time (a machine
-- never inspected is due from the day it was registered). Plain SQL, portable to PostgreSQL.

CREATE TABLE sites (
    id INTEGER PRIMARY KEY,
    name TEXT NOT NULL CHECK (length(name) > 0),
    units TEXT NOT NULL DEFAULT 'metric' CHECK (units IN ('us', 'metric')),
    created_at TEXT NOT NULL,
    updated_at TEXT NOT NULL,
    archived_at TEXT
);

CREATE UNIQUE INDEX sites_name_unique ON sites (name);

CREATE TABLE machines (
    id INTEGER PRIMARY KEY,
    unit_number TEXT NOT NULL CHECK (length(unit_number) > 0),
    site_id INTEGER REFERENCES sites (id),
    kind TEXT NOT NULL CHECK (length(kind) > 0),
    description TEXT,
    serial TEXT,
    status TEXT NOT NULL DEFAULT 'in_service'
        CHECK (status IN ('in_service', 'out_of_service')),
    out_of_service_reason TEXT,
    out_of_service_since TEXT,
    relief_pressure_pa REAL CHECK (relief_pressure_pa IS NULL OR relief_pressure_pa > 0),
    hour_meter_h REAL CHECK (hour_meter_h IS NULL OR hour_meter_h >= 0),
    hour_meter_read_on TEXT,
    periodic_interval_days INTEGER
        CHECK (periodic_interval_days IS NULL OR periodic_interval_days > 0),
    periodic_interval_hours REAL
        CHECK (periodic_interval_hours IS NULL OR periodic_interval_hours > 0),
    frequent_interval_days INTEGER
        CHECK (frequent_interval_days IS NULL OR frequent_interval_days > 0),
    created_at TEXT NOT NULL,
    updated_at TEXT NOT NULL,
    archived_at TEXT
);

CREATE UNIQUE INDEX machines_unit_number_unique ON machines (unit_number);
CREATE INDEX machines_site ON machines (site_id);
CREATE INDEX machines_status ON machines (status);
CREATE INDEX machines_kind ON machines (kind);

CREATE TABLE cylinders (
    id INTEGER PRIMARY KEY,
    machine_id INTEGER NOT NULL REFERENCES machines (id),
    function TEXT,
    bore_m REAL NOT NULL CHECK (bore_m > 0),
    rod_m REAL NOT NULL CHECK (rod_m > 0 AND rod_m < bore_m),
    stroke_m REAL NOT NULL CHECK (stroke_m > 0),
    -- 'retract': the load pushes the rod in (held by the cap end);
    -- 'extend': the load pulls the rod out (held by the rod end).
    load_direction TEXT NOT NULL CHECK (load_direction IN ('retract', 'extend')),
    max_load_n REAL CHECK (max_load_n IS NULL OR max_load_n >= 0),
    -- Highest pressure read on the holding end, for cylinders whose load is not known.
    holding_pressure_pa REAL CHECK (holding_pressure_pa IS NULL OR holding_pressure_pa >= 0),
    rated_pressure_pa REAL CHECK (rated_pressure_pa IS NULL OR rated_pressure_pa > 0),
    tube_outside_diameter_m REAL
        CHECK (tube_outside_diameter_m IS NULL OR tube_outside_diameter_m > bore_m),
    tube_yield_pa REAL CHECK (tube_yield_pa IS NULL OR tube_yield_pa > 0),
    end_condition TEXT CHECK (end_condition IS NULL OR end_condition IN
        ('fixed_free', 'pinned_pinned', 'fixed_pinned', 'fixed_fixed')),
    serial TEXT,
    notes TEXT,
    drift_test_interval_days INTEGER
        CHECK (drift_test_interval_days IS NULL OR drift_test_interval_days > 0),
    created_at TEXT NOT NULL,
    updated_at TEXT NOT NULL,
    archived_at TEXT
);

CREATE INDEX cylinders_machine ON cylinders (machine_id);

CREATE TABLE hoses (
    id INTEGER PRIMARY KEY,
    machine_id INTEGER NOT NULL REFERENCES machines (id),
    cylinder_id INTEGER REFERENCES cylinders (id),
    -- The cylinder port the assembly feeds; NULL for a hose on a circuit (then `circuit` names it).
    port TEXT CHECK (port IS NULL OR port IN ('cap', 'rod')),
    circuit TEXT,
    spec TEXT,
    size TEXT,
    inside_diameter_m REAL CHECK (inside_diameter_m IS NULL OR inside_diameter_m > 0),
    length_m REAL CHECK (length_m IS NULL OR length_m > 0),
    -- The assembly's maximum working pressure: the lower of hose and fittings.
    working_pressure_pa REAL CHECK (working_pressure_pa IS NULL OR working_pressure_pa > 0),
    made_in TEXT,
    installed_on TEXT,
    replace_by TEXT,
    created_at TEXT NOT NULL,
    updated_at TEXT NOT NULL,
    archived_at TEXT,
    CHECK ((cylinder_id IS NOT NULL AND port IS NOT NULL)
        OR (cylinder_id IS NULL AND port IS NULL AND circuit IS NOT NULL))
);

CREATE INDEX hoses_machine ON hoses (machine_id);
CREATE INDEX hoses_cylinder ON hoses (cylinder_id);
CREATE INDEX hoses_replace_by ON hoses (replace_by);

-- Every change to the registry: who, when, what, and the record before and after (JSON text).
CREATE TABLE audit_log (
    id INTEGER PRIMARY KEY,
    at TEXT NOT NULL,
    actor TEXT NOT NULL,
    action TEXT NOT NULL,
    entity TEXT NOT NULL,
    entity_id INTEGER NOT NULL,
    before_json TEXT,
    after_json TEXT
);

CREATE INDEX audit_log_entity ON audit_log (entity, entity_id);
CREATE INDEX audit_log_at ON audit_log (at);
