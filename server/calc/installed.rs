//! A cylinder as it is installed on a machine (its recorded geometry, load, relief setting,
//! tube and the ratings of the lines fitted to it) turned into the core's [`CylinderInput`].
//! The cylinder page's safety panel and the fleet hazard list both start here, so they always
//! agree.

use super::analysis::CylinderInput;
use super::bypass::TubeWall;
use super::cylinder::{Cylinder, End, LoadDirection};
use super::error::CalcError;
use super::ratings::{Exposure, Rating};
use super::strength::EndCondition;
use super::valves::Valves;

/// Where the held load figure came from.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum LoadSource {
    /// The recorded highest load.
    Recorded,
    /// The recorded holding pressure times the holding end's area.
    FromHoldingPressure,
    /// Neither was recorded: the figures use no load.
    Unknown,
}

/// What the registry knows of one installed cylinder, SI units.
#[derive(Clone, Debug, Default)]
pub struct Installed {
    pub bore: f64,
    pub rod: f64,
    pub stroke: f64,
    /// `retract` (load pushes the rod in) or `extend`; anything else is read as `retract`.
    pub load_direction: String,
    /// Highest held load, N.
    pub max_load: Option<f64>,
    /// Lowest held load, N; none recorded counts as 0 N (the load may be taken off).
    pub min_load: Option<f64>,
    /// Holding pressure, Pa, used when the load is not recorded.
    pub holding_pressure: Option<f64>,
    /// The machine's system relief setting, Pa (the supply pressure for rod-side intensification).
    pub relief_pressure: Option<f64>,
    /// The cylinder's rated pressure, Pa (applies to both ends).
    pub rated_pressure: Option<f64>,
    pub tube_outside_diameter: Option<f64>,
    pub tube_yield: Option<f64>,
    /// Buckling end condition as stored (`fixed_free`, `pinned_pinned`, ...).
    pub end_condition: Option<String>,
    /// Rod free length at full extension, m; none: twice the stroke, said as assumed.
    pub buckling_length: Option<f64>,
    /// Rod yield strength, Pa; none: the core's default, said as assumed.
    pub rod_yield: Option<f64>,
    /// The load-holding valve and the valve centre at each port, as recorded.
    pub valves: Valves,
    /// The site's trapped-oil warming, K; `None` takes the default (10 K, ours).
    pub temperature_rise: Option<f64>,
}

/// A rated line fitted to one port of the cylinder.
#[derive(Clone, Debug)]
pub struct RatedLine {
    /// How the line is named in the checks, e.g. `H17 (cap port, SAE 100R2AT, -8)`.
    pub label: String,
    /// `cap` or `rod` as stored; anything else counts as the cap end.
    pub port: String,
    /// The assembly's maximum working pressure, Pa.
    pub rating: f64,
}

/// Where a line sits: `cap port`, `rod port (boom)`, or its circuit label.
pub fn place(port: Option<&str>, circuit: Option<&str>) -> String {
    match (port, circuit) {
        (Some(port), Some(circuit)) => format!("{port} port ({circuit})"),
        (Some(port), None) => format!("{port} port"),
        (None, Some(circuit)) => circuit.to_string(),
        (None, None) => "—".into(),
    }
}

/// A line's name among a cylinder's ratings: `H17 (cap port, SAE 100R2AT, -8)`.
pub fn line_label(id: i64, place: &str, spec: Option<&str>, size: Option<&str>) -> String {
    let mut parts = vec![place.to_string()];
    parts.extend(spec.map(str::to_string));
    parts.extend(size.map(str::to_string));
    format!("H{id} ({})", parts.join(", "))
}

impl Installed {
    fn direction(&self) -> LoadDirection {
        LoadDirection::parse(&self.load_direction).unwrap_or(LoadDirection::Retract)
    }

    /// The held load, N, and where it came from: the recorded highest load, else the recorded
    /// holding pressure times the holding end's area (F = p A), else none.
    pub fn held_load(&self, geometry: &Cylinder) -> (f64, LoadSource) {
        match (self.max_load, self.holding_pressure) {
            (Some(load), _) => (load, LoadSource::Recorded),
            (None, Some(p)) => (
                p * geometry.area(self.direction().holding_end()),
                LoadSource::FromHoldingPressure,
            ),
            (None, None) => (0.0, LoadSource::Unknown),
        }
    }

    /// The core's input: geometry, held load range, the relief setting as supply pressure, tube wall
    /// (steel) and yield, rod end condition (no buckling check without one), and the ratings (the cylinder's on both ends; each
    /// rated line on its port's end).
    pub fn input(&self, lines: &[RatedLine]) -> Result<(CylinderInput, LoadSource), CalcError> {
        let geometry = Cylinder::new(self.bore, self.rod, self.stroke)?;
        let (load, source) = self.held_load(&geometry);
        let mut input = CylinderInput::new(geometry, load, self.direction());
        // The load range: from the recorded lowest load (0 N when none; never above the
        // held load, which may come from a holding pressure) to the held load.
        input.min_load = Some(self.min_load.unwrap_or(0.0).min(load));
        input.buckling.length = self.buckling_length;
        input.buckling.yield_strength = self.rod_yield;
        input.supply_pressure = self.relief_pressure;
        input.valves = self.valves;
        if let Some(rise) = self.temperature_rise {
            input.temperature_rise = rise;
        }
        input.trapped.tube = self.tube_outside_diameter.map(TubeWall::steel);
        input.tube_yield = self.tube_outside_diameter.and(self.tube_yield);
        // Rod buckling is checked only where the mounting (end condition) is recorded.
        match self.end_condition.as_deref().and_then(EndCondition::parse) {
            Some(condition) => input.buckling.end_condition = condition,
            None => input.buckling.checked = false,
        }
        if let Some(rating) = self.rated_pressure {
            input.ratings.push(Rating {
                component: "cylinder".into(),
                exposure: Exposure::Both,
                rating,
            });
        }
        for line in lines {
            let end = if line.port == "rod" {
                End::Rod
            } else {
                End::Cap
            };
            input.ratings.push(Rating {
                component: line.label.clone(),
                exposure: Exposure::from(end),
                rating: line.rating,
            });
        }
        Ok((input, source))
    }
}
