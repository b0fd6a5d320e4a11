//! The tables and columns the scale generator fills, in bind order (see `migrations/`).

use super::batch::Table;

pub const SITES: Table = Table {
    name: "sites",
    columns: &["id", "name", "units", "created_at", "updated_at"],
};

pub const PROCEDURES: Table = Table {
    name: "test_procedures",
    columns: &[
        "id",
        "kind",
        "name",
        "machine_kind",
        "hold_load",
        "posture",
        "measure_at",
        "oil_temperature_min_k",
        "oil_temperature_max_k",
        "duration_s",
        "limit_distance_m",
        "limit_period_s",
        "oil_expansion_per_k",
        "created_at",
        "created_by",
        "updated_at",
    ],
};

pub const MACHINES: Table = Table {
    name: "machines",
    columns: &[
        "id",
        "unit_number",
        "site_id",
        "kind",
        "description",
        "serial",
        "status",
        "out_of_service_reason",
        "out_of_service_since",
        "relief_pressure_pa",
        "hour_meter_h",
        "hour_meter_read_on",
        "periodic_interval_days",
        "periodic_interval_hours",
        "frequent_interval_days",
        "created_at",
        "updated_at",
        "out_of_service_inspection_id",
    ],
};

pub const CYLINDERS: Table = Table {
    name: "cylinders",
    columns: &[
        "id",
        "machine_id",
        "function",
        "bore_m",
        "rod_m",
        "stroke_m",
        "load_direction",
        "max_load_n",
        "rated_pressure_pa",
        "tube_outside_diameter_m",
        "tube_yield_pa",
        "end_condition",
        "serial",
        "drift_test_interval_days",
        "created_at",
        "updated_at",
    ],
};

pub const HOSES: Table = Table {
    name: "hoses",
    columns: &[
        "id",
        "machine_id",
        "cylinder_id",
        "port",
        "circuit",
        "spec",
        "size",
        "inside_diameter_m",
        "length_m",
        "working_pressure_pa",
        "made_in",
        "installed_on",
        "replace_by",
        "created_at",
        "updated_at",
        "archived_at",
    ],
};

pub const INSPECTIONS: Table = Table {
    name: "inspections",
    columns: &[
        "id",
        "machine_id",
        "kind",
        "performed_on",
        "hour_meter_h",
        "inspector",
        "result",
        "items_json",
        "deficiencies",
        "corrective_action",
        "amends_id",
        "created_at",
        "created_by",
    ],
};

pub const DRIFT_TESTS: Table = Table {
    name: "drift_tests",
    columns: &[
        "id",
        "cylinder_id",
        "procedure_id",
        "tested_at",
        "technician",
        "duration_s",
        "start_position_m",
        "end_position_m",
        "oil_temperature_start_k",
        "oil_temperature_end_k",
        "ambient_temperature_k",
        "cap_pressure_start_pa",
        "cap_pressure_end_pa",
        "rod_pressure_start_pa",
        "rod_pressure_end_pa",
        "load_n",
        "load_direction",
        "limit_distance_m",
        "limit_period_s",
        "readings_json",
        "analysis_json",
        "calc_version",
        "verdict",
        "diagnosis",
        "scaled_drift_m",
        "leak_drift_m",
        "scaled_leak_drift_m",
        "scaled_period_s",
        "flags",
        "notes",
        "amends_id",
        "created_at",
        "created_by",
    ],
};

/// Parents before children, for flushing.
pub const ORDER: [Table; 7] = [
    SITES,
    PROCEDURES,
    MACHINES,
    CYLINDERS,
    HOSES,
    INSPECTIONS,
    DRIFT_TESTS,
];
