-- The manager's reports: shop-wide settings and the indexes the fleet-wide report queries use.
-- Plain SQL, portable to PostgreSQL.

-- One row of settings for the whole shop. `hose_age_limit_years`: a hose assembly older than
-- this many years (from its manufacture date, else its install date) is due for replacement;
-- NULL means the shop has set no age limit (ISO/TS 17165-2 sets no fixed interval; the shop
-- chooses one). Edited in place; the audit log keeps each change (entity `report_settings`).
CREATE TABLE report_settings (
    id INTEGER PRIMARY KEY CHECK (id = 1),
    hose_age_limit_years INTEGER
        CHECK (hose_age_limit_years IS NULL OR (hose_age_limit_years > 0 AND hose_age_limit_years <= 100)),
    updated_at TEXT NOT NULL,
    updated_by TEXT NOT NULL
);

INSERT INTO report_settings (id, hose_age_limit_years, updated_at, updated_by)
VALUES (1, NULL, '1970-01-01T00:00:00Z', 'system');

-- The latest reading of a machine's hour meter among its inspections, and per-kind lookups.
CREATE INDEX inspections_machine_performed ON inspections (machine_id, performed_on);
-- Lists filtered by site and status leave out archived machines.
CREATE INDEX machines_site_status ON machines (site_id, status, archived_at);
