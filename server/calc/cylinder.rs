//! Cylinder geometry and holding pressures.
//!
//! A double-acting differential cylinder: bore `D`, rod `d`, stroke `L`; position `x` is the
//! extension from fully retracted (0) to fully extended (`L`). SI units throughout.

use super::error::{CalcError, MAX_FORCE, MAX_LENGTH, in_range};
use serde::Serialize;
use std::f64::consts::PI;

/// Smallest bore or rod diameter accepted, m (0.1 mm).
const MIN_DIAMETER: f64 = 1e-4;

/// A cylinder's geometry, m. Built with [`Cylinder::new`], which checks `0 < rod < bore`.
#[derive(Clone, Copy, Debug, PartialEq, Serialize)]
pub struct Cylinder {
    pub bore: f64,
    pub rod: f64,
    pub stroke: f64,
}

/// Which way the held load acts on the rod.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize)]
#[serde(rename_all = "snake_case")]
pub enum LoadDirection {
    /// The load pushes the rod in; the cap end holds it.
    Retract,
    /// The load pulls the rod out; the rod end holds it.
    Extend,
}

impl LoadDirection {
    pub fn parse(text: &str) -> Option<Self> {
        match text {
            "retract" => Some(LoadDirection::Retract),
            "extend" => Some(LoadDirection::Extend),
            _ => None,
        }
    }

    pub fn as_str(self) -> &'static str {
        match self {
            LoadDirection::Retract => "retract",
            LoadDirection::Extend => "extend",
        }
    }

    /// The end whose trapped oil holds the load.
    pub fn holding_end(self) -> End {
        match self {
            LoadDirection::Retract => End::Cap,
            LoadDirection::Extend => End::Rod,
        }
    }
}

/// One end (chamber) of the cylinder.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize)]
#[serde(rename_all = "snake_case")]
pub enum End {
    Cap,
    Rod,
}

impl End {
    pub fn as_str(self) -> &'static str {
        match self {
            End::Cap => "cap",
            End::Rod => "rod",
        }
    }

    pub fn other(self) -> End {
        match self {
            End::Cap => End::Rod,
            End::Rod => End::Cap,
        }
    }
}

impl Cylinder {
    /// Checks the geometry: every size finite and positive, `rod < bore`, within sanity limits.
    /// Errors name the field (`bore`, `rod`, `stroke`).
    pub fn new(bore: f64, rod: f64, stroke: f64) -> Result<Self, CalcError> {
        in_range("bore", "the bore", bore, MIN_DIAMETER, MAX_LENGTH)?;
        in_range("rod", "the rod diameter", rod, MIN_DIAMETER, MAX_LENGTH)?;
        in_range("stroke", "the stroke", stroke, 1e-4, MAX_LENGTH)?;
        if rod >= bore {
            return Err(CalcError::new(
                "rod",
                "the rod diameter must be smaller than the bore",
            ));
        }
        Ok(Cylinder { bore, rod, stroke })
    }

    /// Piston (cap-end) area `pi D² / 4`, m². Geometry.
    pub fn cap_area(&self) -> f64 {
        PI * self.bore * self.bore / 4.0
    }

    /// Rod cross-section `pi d² / 4`, m². Geometry.
    pub fn rod_area(&self) -> f64 {
        PI * self.rod * self.rod / 4.0
    }

    /// Annulus (rod-end) area `pi (D² - d²) / 4`, m². Geometry.
    pub fn annulus_area(&self) -> f64 {
        PI * (self.bore * self.bore - self.rod * self.rod) / 4.0
    }

    /// Area ratio `phi = A_cap / A_annulus` (dimensionless), as the ISO 3320 ratio series
    /// states it (REFERENCES.md, from memory).
    pub fn area_ratio(&self) -> f64 {
        self.bore * self.bore / (self.bore * self.bore - self.rod * self.rod)
    }

    /// Piston area that the oil of one end acts on, m²: `A_cap` or `A_annulus`.
    pub fn area(&self, end: End) -> f64 {
        match end {
            End::Cap => self.cap_area(),
            End::Rod => self.annulus_area(),
        }
    }

    /// Position clamped to the stroke, m.
    pub fn clamp(&self, position: f64) -> f64 {
        if position.is_nan() {
            return self.stroke / 2.0;
        }
        position.clamp(0.0, self.stroke)
    }

    /// Swept oil volume in the cap end at extension `position`, m³: `A_cap x`
    /// (dead volume at the end caps not counted).
    pub fn cap_volume(&self, position: f64) -> f64 {
        self.cap_area() * self.clamp(position)
    }

    /// Swept oil volume in the rod end at extension `position`, m³: `A_annulus (L - x)`.
    pub fn rod_volume(&self, position: f64) -> f64 {
        self.annulus_area() * (self.stroke - self.clamp(position))
    }

    /// Chamber volume of one end at `position`, m³.
    pub fn volume(&self, end: End, position: f64) -> f64 {
        match end {
            End::Cap => self.cap_volume(position),
            End::Rod => self.rod_volume(position),
        }
    }
}

/// Checks a position (extension from fully retracted) against the stroke, naming `field`.
pub fn check_position(cylinder: &Cylinder, field: &str, position: f64) -> Result<f64, CalcError> {
    if !position.is_finite() || position < 0.0 || position > cylinder.stroke {
        return Err(CalcError::new(
            field,
            "the position is the extension from fully retracted and must lie between 0 and the stroke",
        ));
    }
    Ok(position)
}

/// Checks a load (a force magnitude, N), naming the field `load`.
pub fn check_load(load: f64) -> Result<f64, CalcError> {
    in_range("load", "the load", load, 0.0, MAX_FORCE)
}

/// Gauge pressures in both ends while the load is held with both ports blocked, Pa.
#[derive(Clone, Copy, Debug, PartialEq, Serialize)]
pub struct Holding {
    pub cap_pressure: f64,
    pub rod_pressure: f64,
}

impl Holding {
    pub fn at(&self, end: End) -> f64 {
        match end {
            End::Cap => self.cap_pressure,
            End::Rod => self.rod_pressure,
        }
    }
}

/// Holding pressures for a load `load` (N) acting in `direction`, Pa gauge.
///
/// A load that pushes the rod in is held by the cap end: `p_cap = F / A_cap`, rod end at 0.
/// A load that pulls the rod out is held by the rod end: `p_rod = F / A_annulus`, cap at 0.
/// Origin: force balance on the piston (common practice, REFERENCES.md "Trade facts").
pub fn holding_pressures(cylinder: &Cylinder, load: f64, direction: LoadDirection) -> Holding {
    match direction {
        LoadDirection::Retract => Holding {
            cap_pressure: load / cylinder.cap_area(),
            rod_pressure: 0.0,
        },
        LoadDirection::Extend => Holding {
            cap_pressure: 0.0,
            rod_pressure: load / cylinder.annulus_area(),
        },
    }
}
