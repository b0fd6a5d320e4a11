//! The input of the cylinder analysis, with its documented defaults and its checks.

use super::bypass::{Line, Trapped};
use super::cylinder::{self, Cylinder, LoadDirection};
use super::error::{CalcError, MAX_LENGTH, MAX_PRESSURE, in_range};
use super::fluid;
use super::ratings::Rating;
use super::strength::{self, EndCondition};
use super::valves::Valves;
use serde::Serialize;

/// Rod buckling inputs.
#[derive(Clone, Copy, Debug, PartialEq, Serialize)]
pub struct RodBuckling {
    /// False skips the check: where the mounting is not known, the default end condition is a
    /// guess and a guessed alarm teaches people to ignore the real ones.
    pub checked: bool,
    pub end_condition: EndCondition,
    /// Free length at full extension, m; `None` takes twice the stroke (see [`analyse`]).
    pub length: Option<f64>,
    pub safety_factor: f64,
    /// Young's modulus of the rod, Pa.
    pub youngs: f64,
    /// Poisson's ratio of the rod.
    pub poisson: f64,
    /// Yield strength of the rod, Pa, for the Johnson range; `None` takes
    /// [`super::buckling::DEFAULT_ROD_YIELD`] (said in the answer as assumed).
    pub yield_strength: Option<f64>,
}

/// Everything the cylinder analysis takes. SI units; pressures gauge.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct CylinderInput {
    pub cylinder: Cylinder,
    /// Extension from fully retracted, m; `None` means half the stroke.
    pub position: Option<f64>,
    /// Held load, N (a magnitude; its direction is `load_direction`): the heaviest of the range.
    pub load: f64,
    /// Lightest held load of the range, N; `None` means the range is `load` alone. Every
    /// scenario is judged at the load in `[min_load, load]` that gives each end its highest
    /// pressure ([`super::worst_load`]).
    pub min_load: Option<f64>,
    pub load_direction: LoadDirection,
    /// Oil modulus, lines and tube wall.
    pub trapped: Trapped,
    /// Supply (relief) pressure, Pa.
    pub supply_pressure: Option<f64>,
    /// Supply flow, m³/s.
    pub flow: Option<f64>,
    /// Oil's cubical expansion coefficient, 1/K.
    pub oil_expansion: f64,
    /// Temperature rise of trapped oil for the heating scenario, K.
    pub temperature_rise: f64,
    /// Counterbalance valve pilot ratio.
    pub pilot_ratio: Option<f64>,
    /// Rated components (cap line, rod line, cylinder, hoses).
    pub ratings: Vec<Rating>,
    /// Tube yield strength, Pa (needs the tube outside diameter).
    pub tube_yield: Option<f64>,
    pub tube_safety_factor: f64,
    pub buckling: RodBuckling,
    /// Load-holding valve and directional-valve centre at each work port.
    pub valves: Valves,
    /// Entrained air, volume fraction at atmospheric pressure (0: none), for settle and decay.
    pub entrained_air: f64,
}

impl CylinderInput {
    /// An input with the documented defaults: mineral oil (1.5 GPa, 7e-4 /K), no lines, no tube
    /// wall, a 10 K trapped-oil rise, pinned-pinned rod in steel with a factor of 3.
    pub fn new(cylinder: Cylinder, load: f64, load_direction: LoadDirection) -> Self {
        CylinderInput {
            cylinder,
            position: None,
            load,
            min_load: None,
            load_direction,
            trapped: Trapped {
                bulk_modulus: fluid::DEFAULT_BULK_MODULUS,
                cap_line: Line::default(),
                rod_line: Line::default(),
                tube: None,
            },
            supply_pressure: None,
            flow: None,
            oil_expansion: fluid::DEFAULT_EXPANSION,
            temperature_rise: fluid::DEFAULT_TRAPPED_TEMPERATURE_RISE,
            pilot_ratio: None,
            ratings: Vec::new(),
            tube_yield: None,
            tube_safety_factor: strength::DEFAULT_TUBE_SAFETY_FACTOR,
            buckling: RodBuckling {
                checked: true,
                end_condition: EndCondition::PinnedPinned,
                length: None,
                safety_factor: strength::DEFAULT_BUCKLING_SAFETY_FACTOR,
                youngs: fluid::STEEL_YOUNGS_MODULUS,
                poisson: fluid::STEEL_POISSON_RATIO,
                yield_strength: None,
            },
            valves: Valves::default(),
            entrained_air: 0.0,
        }
    }

    /// The position used: the one given, else half the stroke, m.
    pub fn position(&self) -> f64 {
        self.position.unwrap_or(self.cylinder.stroke / 2.0)
    }

    /// Checks every value against what the formulas can take; errors name the request field.
    pub fn validate(&self) -> Result<(), CalcError> {
        let c = &self.cylinder;
        Cylinder::new(c.bore, c.rod, c.stroke)?;
        cylinder::check_load(self.load)?;
        if let Some(light) = self.min_load {
            in_range("min_load", "the lowest load", light, 0.0, self.load).map_err(|_| {
                CalcError::new(
                    "min_load",
                    "the lowest load must lie between 0 and the load (the highest load)",
                )
            })?;
        }
        if let Some(p) = self.position {
            cylinder::check_position(c, "position", p)?;
        }
        let t = &self.trapped;
        in_range(
            "bulk_modulus",
            "the bulk modulus",
            t.bulk_modulus,
            1e6,
            MAX_PRESSURE,
        )?;
        for (name, line) in [("cap_line", t.cap_line), ("rod_line", t.rod_line)] {
            in_range(
                &format!("{name}_volume"),
                "a line volume",
                line.volume,
                0.0,
                1e3,
            )?;
            in_range(
                &format!("{name}_expansion"),
                "a line expansion",
                line.expansion,
                0.0,
                1.0,
            )?;
        }
        if let Some(tube) = t.tube {
            in_range(
                "tube_outside_diameter",
                "the tube outside diameter",
                tube.outside_diameter,
                0.0,
                MAX_LENGTH,
            )?;
            in_range(
                "tube_youngs_modulus",
                "Young's modulus",
                tube.youngs,
                1e9,
                MAX_PRESSURE,
            )?;
            in_range(
                "tube_poisson_ratio",
                "Poisson's ratio",
                tube.poisson,
                0.0,
                0.499,
            )?;
            if tube.outside_diameter <= c.bore {
                return Err(CalcError::new(
                    "tube_outside_diameter",
                    "the tube outside diameter must be larger than the bore",
                ));
            }
        }
        if let Some(p) = self.supply_pressure {
            in_range(
                "supply_pressure",
                "the supply pressure",
                p,
                0.0,
                MAX_PRESSURE,
            )?;
        }
        if let Some(q) = self.flow {
            in_range("flow", "the flow", q, 0.0, 1e3)?;
        }
        in_range(
            "oil_expansion",
            "the expansion coefficient",
            self.oil_expansion,
            0.0,
            0.1,
        )?;
        in_range(
            "temperature_rise",
            "the temperature rise",
            self.temperature_rise,
            0.0,
            500.0,
        )?;
        if let Some(r) = self.pilot_ratio {
            in_range("pilot_ratio", "the pilot ratio", r, 0.1, 1e3)?;
        }
        for rating in &self.ratings {
            in_range(
                &format!("ratings.{}", rating.component),
                "a rating",
                rating.rating,
                1.0,
                MAX_PRESSURE,
            )?;
        }
        if let Some(y) = self.tube_yield {
            in_range(
                "tube_yield",
                "the tube yield strength",
                y,
                1e6,
                MAX_PRESSURE,
            )?;
        }
        in_range(
            "tube_safety_factor",
            "the safety factor",
            self.tube_safety_factor,
            1.0,
            100.0,
        )?;
        let b = &self.buckling;
        if let Some(l) = b.length {
            in_range(
                "buckling_length",
                "the buckling length",
                l,
                1e-3,
                MAX_LENGTH,
            )?;
        }
        in_range(
            "buckling_safety_factor",
            "the safety factor",
            b.safety_factor,
            1.0,
            100.0,
        )?;
        in_range(
            "rod_youngs_modulus",
            "Young's modulus",
            b.youngs,
            1e9,
            MAX_PRESSURE,
        )?;
        in_range(
            "entrained_air",
            "the entrained air fraction",
            self.entrained_air,
            0.0,
            0.5,
        )?;
        in_range(
            "rod_poisson_ratio",
            "Poisson's ratio",
            b.poisson,
            0.0,
            0.499,
        )?;
        if let Some(y) = b.yield_strength {
            in_range("rod_yield", "the rod yield strength", y, 1e6, MAX_PRESSURE)?;
        }
        self.valves.validate(self.load_direction, self.load)?;
        Ok(())
    }
}
