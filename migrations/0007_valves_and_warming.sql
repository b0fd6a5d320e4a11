-- Issue 12: the valves that hold a cylinder's oil, and the trapped-oil warming per site.
-- Plain SQL, portable to PostgreSQL. Every column may be NULL: not recorded.

-- Load-holding valve on the holding end: 'counterbalance' or 'pilot_check'.
ALTER TABLE cylinders ADD COLUMN holding_valve TEXT
    CHECK (holding_valve IS NULL OR holding_valve IN ('counterbalance', 'pilot_check'));
-- Counterbalance valve setting, Pa.
ALTER TABLE cylinders ADD COLUMN holding_valve_setting_pa REAL
    CHECK (holding_valve_setting_pa IS NULL OR holding_valve_setting_pa > 0);
ALTER TABLE cylinders ADD COLUMN holding_valve_pilot_ratio REAL
    CHECK (holding_valve_pilot_ratio IS NULL OR holding_valve_pilot_ratio > 0);
-- Where the pilot comes from: 'other_port' (teed off the other work port) or 'external'.
ALTER TABLE cylinders ADD COLUMN holding_valve_pilot TEXT
    CHECK (holding_valve_pilot IS NULL OR holding_valve_pilot IN ('other_port', 'external'));
-- The directional valve's centre at each work port: 'blocked' or 'open_to_tank'.
ALTER TABLE cylinders ADD COLUMN cap_port_centre TEXT
    CHECK (cap_port_centre IS NULL OR cap_port_centre IN ('blocked', 'open_to_tank'));
ALTER TABLE cylinders ADD COLUMN rod_port_centre TEXT
    CHECK (rod_port_centre IS NULL OR rod_port_centre IN ('blocked', 'open_to_tank'));

-- How much trapped oil may warm on this site (a machine parked in the sun), K. NULL: the
-- default of 10 K (ours, calc::fluid::DEFAULT_TRAPPED_TEMPERATURE_RISE).
ALTER TABLE sites ADD COLUMN trapped_oil_warming_k REAL
    CHECK (trapped_oil_warming_k IS NULL OR (trapped_oil_warming_k >= 0 AND trapped_oil_warming_k <= 200));
