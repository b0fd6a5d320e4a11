-- Issue 12: the lowest load held (the worst case of some scenarios is the lightest load:
-- rod-side intensification with a load pushing the rod in), the rod's free length for
-- buckling (before: twice the stroke, assumed) and the rod's yield strength (Johnson range).
-- All optional: no lowest load means none (0 N); no free length, twice the stroke (said as
-- an assumption); no yield, the core's documented default.
ALTER TABLE cylinders ADD COLUMN min_load_n REAL CHECK (min_load_n IS NULL OR min_load_n >= 0);
ALTER TABLE cylinders ADD COLUMN buckling_length_m REAL
    CHECK (buckling_length_m IS NULL OR buckling_length_m > 0);
ALTER TABLE cylinders ADD COLUMN rod_yield_pa REAL CHECK (rod_yield_pa IS NULL OR rod_yield_pa > 0);
