//! Ratings check: the highest pressure each scenario puts on each rated component, against
//! its rating.

use super::cylinder::End;
use serde::Serialize;

/// A pressure within this fraction below a rating counts as low margin (10 %, our threshold
/// for drawing attention; a rating is a maximum, not a target).
pub const LOW_MARGIN: f64 = 0.10;

/// Which chamber pressures a component sees.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize)]
#[serde(rename_all = "snake_case")]
pub enum Exposure {
    /// The cap-end line and its hoses.
    Cap,
    /// The rod-end line and its hoses.
    Rod,
    /// The cylinder itself: the higher of both ends.
    Both,
}

impl Exposure {
    pub fn as_str(self) -> &'static str {
        match self {
            Exposure::Cap => "cap",
            Exposure::Rod => "rod",
            Exposure::Both => "both",
        }
    }
}

impl From<End> for Exposure {
    fn from(end: End) -> Self {
        match end {
            End::Cap => Exposure::Cap,
            End::Rod => Exposure::Rod,
        }
    }
}

/// A rated component: its name in the response (`cap_line`, `rod_line`, `cylinder`, or a
/// hose's label), which pressures it sees, and its maximum working pressure (Pa).
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct Rating {
    pub component: String,
    pub exposure: Exposure,
    pub rating: f64,
}

/// A scenario and the gauge pressure it puts in each end, Pa, with the load (N) each end's
/// figure was found at: the load in the recorded range that gives that end its highest
/// pressure ([`super::worst_load`]).
#[derive(Clone, Copy, Debug, PartialEq, Serialize)]
pub struct Scenario {
    pub name: &'static str,
    pub cap: f64,
    pub rod: f64,
    /// Load behind the cap-end figure, N.
    pub cap_load: f64,
    /// Load behind the rod-end figure, N.
    pub rod_load: f64,
}

impl Scenario {
    /// A scenario whose figures were both found at one `load` (N).
    pub fn at(name: &'static str, cap: f64, rod: f64, load: f64) -> Self {
        Scenario {
            name,
            cap,
            rod,
            cap_load: load,
            rod_load: load,
        }
    }

    /// The load behind [`Scenario::pressure_on`] for `exposure`, N (for both ends, the load of
    /// the end with the higher pressure; the cap end on a tie).
    pub fn load_on(&self, exposure: Exposure) -> f64 {
        match exposure {
            Exposure::Cap => self.cap_load,
            Exposure::Rod => self.rod_load,
            Exposure::Both if self.cap >= self.rod => self.cap_load,
            Exposure::Both => self.rod_load,
        }
    }

    /// The highest pressure this scenario puts on a component with `exposure`, Pa.
    pub fn pressure_on(&self, exposure: Exposure) -> f64 {
        match exposure {
            Exposure::Cap => self.cap,
            Exposure::Rod => self.rod,
            Exposure::Both => self.cap.max(self.rod),
        }
    }
}

/// How a pressure stands against a rating.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize)]
#[serde(rename_all = "snake_case")]
pub enum Status {
    Ok,
    LowMargin,
    Exceeds,
}

impl Status {
    pub fn as_str(self) -> &'static str {
        match self {
            Status::Ok => "ok",
            Status::LowMargin => "low_margin",
            Status::Exceeds => "exceeds",
        }
    }
}

/// `exceeds` when `pressure > rating`; `low_margin` when `pressure >= (1 - 10 %) rating`;
/// otherwise `ok`. A non-finite pressure counts as exceeding.
pub fn status(pressure: f64, rating: f64) -> Status {
    if pressure.is_nan() || pressure > rating {
        Status::Exceeds
    } else if pressure >= (1.0 - LOW_MARGIN) * rating {
        Status::LowMargin
    } else {
        Status::Ok
    }
}

/// One line of the ratings check.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct Check {
    pub component: String,
    /// Which pressures the component sees.
    pub exposure: Exposure,
    pub scenario: &'static str,
    /// Highest pressure the scenario puts on the component, Pa.
    pub pressure: f64,
    /// The component's rating, Pa.
    pub rating: f64,
    pub status: Status,
    /// The load (in the recorded range) behind `pressure`, N.
    pub load: f64,
}

/// Every rating against every scenario, in the order given (ratings outer, scenarios inner).
pub fn check_ratings(ratings: &[Rating], scenarios: &[Scenario]) -> Vec<Check> {
    ratings
        .iter()
        .flat_map(|r| {
            scenarios.iter().map(move |s| {
                let pressure = s.pressure_on(r.exposure);
                Check {
                    component: r.component.clone(),
                    exposure: r.exposure,
                    scenario: s.name,
                    pressure,
                    rating: r.rating,
                    status: status(pressure, r.rating),
                    load: s.load_on(r.exposure),
                }
            })
        })
        .collect()
}
