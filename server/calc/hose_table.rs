//! Maximum working pressure of common hydraulic hose types by dash size: a default to offer a
//! planner, never a rating. The rating a shop records (from the hose's own layline, the lower
//! of hose and fittings) is what every check uses.
//!
//! The values are those of `../shared/REFERENCES.md` ("Hose maximum working pressure by
//! size"), marked there from memory with medium confidence: they were not read in the
//! standards themselves, and editions differ. Types whose values the project has not got
//! (EN 856 4SP and 4SH, ISO 18752 classes) are left out rather than guessed.

use super::quantity::PSI;

/// How a value was obtained.
pub const FROM_MEMORY: &str = "from memory";

/// A hose type of the table: the standard it comes from and the unit its values are given in.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct HoseType {
    /// The type as a layline names it, e.g. `SAE 100R2AT`.
    pub spec: &'static str,
    /// The standard, e.g. `SAE J517`.
    pub standard: &'static str,
    /// The edition the values belong to, as far as the project knows it.
    pub edition: &'static str,
    /// `psi` or `bar`: the unit the values are written in.
    pub unit: &'static str,
    /// Pascals per unit.
    factor: f64,
    /// The spellings recognised (upper case, no spaces or punctuation).
    keys: &'static [&'static str],
    /// (dash size, value in `unit`) for each size the table has.
    values: &'static [(u8, f64)],
}

/// One row: a hose type at one size.
#[derive(Clone, Debug, PartialEq)]
pub struct HoseRating {
    pub spec: &'static str,
    pub standard: &'static str,
    pub edition: &'static str,
    /// Dash size (sixteenths of an inch of bore), e.g. 8 for `-8`.
    pub dash: u8,
    /// The nominal bore DN usually printed beside the dash size (common practice, from memory).
    pub dn: u8,
    /// Maximum working pressure in Pa.
    pub max_working_pressure_pa: f64,
    /// The value as the table writes it, in `unit`.
    pub value: f64,
    pub unit: &'static str,
    /// `from memory`: confirm against the hose's layline before relying on it.
    pub source: &'static str,
}

const BAR: f64 = 1e5;
const NO_EDITION: &str = "edition not confirmed";

/// Dash size and the DN printed with it (EN 853 nominal bores; common practice, from memory).
pub const DASH_DN: &[(u8, u8)] = &[
    (4, 6),
    (6, 10),
    (8, 12),
    (10, 16),
    (12, 19),
    (16, 25),
    (20, 31),
    (24, 38),
    (32, 51),
];

/// Every type the table holds, in the order of REFERENCES.md's columns.
pub const TYPES: &[HoseType] = &[
    HoseType {
        spec: "SAE 100R1AT",
        standard: "SAE J517",
        edition: NO_EDITION,
        unit: "psi",
        factor: PSI,
        keys: &["100R1AT", "R1AT"],
        values: &[
            (4, 2750.0),
            (6, 2250.0),
            (8, 2000.0),
            (10, 1500.0),
            (12, 1250.0),
            (16, 1000.0),
            (20, 625.0),
            (24, 500.0),
            (32, 375.0),
        ],
    },
    HoseType {
        spec: "EN 853 1SN",
        standard: "EN 853",
        edition: NO_EDITION,
        unit: "bar",
        factor: BAR,
        keys: &["1SN"],
        values: &[
            (4, 225.0),
            (6, 180.0),
            (8, 160.0),
            (10, 130.0),
            (12, 105.0),
            (16, 88.0),
            (20, 63.0),
            (24, 50.0),
            (32, 40.0),
        ],
    },
    HoseType {
        spec: "SAE 100R2AT",
        standard: "SAE J517",
        edition: "before the 2006 revision (type AT; since 2006 'type S' values replace these)",
        unit: "psi",
        factor: PSI,
        keys: &["100R2AT", "R2AT"],
        values: &[
            (4, 5000.0),
            (6, 4000.0),
            (8, 3500.0),
            (10, 2750.0),
            (12, 2250.0),
            (16, 2000.0),
            (20, 1625.0),
            (24, 1250.0),
            (32, 1125.0),
        ],
    },
    HoseType {
        spec: "EN 853 2SN",
        standard: "EN 853",
        edition: NO_EDITION,
        unit: "bar",
        factor: BAR,
        keys: &["2SN"],
        values: &[
            (4, 400.0),
            (6, 330.0),
            (8, 275.0),
            (10, 250.0),
            (12, 215.0),
            (16, 165.0),
            (20, 125.0),
            (24, 90.0),
            (32, 80.0),
        ],
    },
    HoseType {
        spec: "SAE 100R12",
        standard: "SAE J517",
        edition: NO_EDITION,
        unit: "psi",
        factor: PSI,
        keys: &["100R12", "R12"],
        values: &[
            (6, 4000.0),
            (8, 4000.0),
            (10, 4000.0),
            (12, 4000.0),
            (16, 4000.0),
            (20, 3000.0),
            (24, 2500.0),
            (32, 2500.0),
        ],
    },
    HoseType {
        spec: "SAE 100R13",
        standard: "SAE J517",
        edition: NO_EDITION,
        unit: "psi",
        factor: PSI,
        keys: &["100R13", "R13"],
        values: &[
            (12, 5000.0),
            (16, 5000.0),
            (20, 5000.0),
            (24, 5000.0),
            (32, 5000.0),
        ],
    },
];

impl HoseType {
    fn row(&self, dash: u8, value: f64) -> HoseRating {
        HoseRating {
            spec: self.spec,
            standard: self.standard,
            edition: self.edition,
            dash,
            dn: dn_of_dash(dash).unwrap_or(0),
            max_working_pressure_pa: value * self.factor,
            value,
            unit: self.unit,
            source: FROM_MEMORY,
        }
    }

    /// Every size of this type.
    pub fn rows(&self) -> Vec<HoseRating> {
        self.values.iter().map(|&(d, v)| self.row(d, v)).collect()
    }
}

/// The DN printed beside a dash size (common practice, from memory).
pub fn dn_of_dash(dash: u8) -> Option<u8> {
    DASH_DN.iter().find(|(d, _)| *d == dash).map(|(_, dn)| *dn)
}

/// Every row of the table: each type at each size it has.
pub fn all() -> Vec<HoseRating> {
    TYPES.iter().flat_map(HoseType::rows).collect()
}

/// The type a layline's wording names (`SAE 100R2AT`, `100r2at`, `EN853 2SN`, `2SN`), if the
/// table has it. Spaces, dashes, dots and slashes are ignored, letters compared in upper case.
pub fn find_type(spec: &str) -> Option<&'static HoseType> {
    let key: String = spec
        .chars()
        .filter(|c| c.is_ascii_alphanumeric())
        .map(|c| c.to_ascii_uppercase())
        .collect();
    let key = key
        .strip_prefix("SAE")
        .or_else(|| key.strip_prefix("EN853"))
        .or_else(|| key.strip_prefix("EN"))
        .unwrap_or(&key);
    let key = key.strip_prefix("J517").unwrap_or(key);
    TYPES.iter().find(|t| t.keys.contains(&key))
}

/// The dash size a size text names: `-8`, `8`, `#8`, `DN12`, `DN 12` (DN by [`DASH_DN`]).
pub fn parse_size(size: &str) -> Option<u8> {
    let text = size.trim().to_ascii_uppercase();
    if let Some(dn) = text.strip_prefix("DN") {
        let dn: u8 = dn.trim().parse().ok()?;
        return DASH_DN.iter().find(|(_, n)| *n == dn).map(|(d, _)| *d);
    }
    let dash: u8 = text.trim_start_matches(['-', '#']).trim().parse().ok()?;
    dn_of_dash(dash).map(|_| dash)
}

/// The table's maximum working pressure for `spec` at `size`, if it has that row.
pub fn lookup(spec: &str, size: &str) -> Option<HoseRating> {
    let t = find_type(spec)?;
    let dash = parse_size(size)?;
    t.values
        .iter()
        .find(|(d, _)| *d == dash)
        .map(|&(d, v)| t.row(d, v))
}
