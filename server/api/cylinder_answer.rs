//! The answer of `POST /api/v1/calc/cylinder` as typed structs: serialised straight to the
//! response body, with no `serde_json::Value` tree built in between (that tree was most of
//! the route's allocations; tests/bench/ANALYSIS.md). Every quantity is `{"si", "value",
//! "unit"}` in the request's unit system (DESIGN.md "API conventions").

use crate::calc::CALC_VERSION;
use crate::calc::analysis::{CylinderInput, CylinderReport, ROD_SIDE_INTENSIFICATION};
use crate::calc::quantity::{self, Dimension as D, Shown, UnitSystem};
use crate::calc::{buckling, worst_load};
use serde::Serialize;

#[derive(Serialize)]
pub struct CylinderAnswer<'a> {
    calc_version: &'static str,
    units: &'static str,
    load_direction: &'static str,
    load_range: LoadRange,
    position: Shown,
    areas: Areas,
    volumes: Pair,
    holding: Holding,
    seal_bypass: SealBypass,
    rod_side_intensification: Option<RodSide>,
    speeds: Option<Speeds>,
    forces: Option<Forces>,
    counterbalance: Counterbalance,
    trapped_oil_heating: Heating,
    seal_bypass_warming: Option<BypassWarming>,
    holding_valve: Option<HoldingValve>,
    valve_centre: ValveCentre,
    entrained_air: f64,
    tube: Option<Tube>,
    buckling: Option<Buckling>,
    highest_pressure: Shown,
    scenarios: Vec<ScenarioOut>,
    checks: Vec<Check<'a>>,
    hazards: &'a [String],
    notes: &'a [String],
    cautions: &'a [&'static str],
}

/// The load range the scenarios were judged over, N.
#[derive(Serialize)]
struct LoadRange {
    min_load: Shown,
    load: Shown,
}

/// A scenario's pressure at each end, at the load in the range that makes it highest.
#[derive(Serialize)]
struct ScenarioOut {
    name: &'static str,
    cap_pressure: Shown,
    rod_pressure: Shown,
    cap_load: Shown,
    rod_load: Shown,
}

#[derive(Serialize)]
struct Areas {
    cap: Shown,
    rod: Shown,
    annulus: Shown,
    ratio: f64,
}

#[derive(Serialize)]
struct Pair {
    cap: Shown,
    rod: Shown,
}

#[derive(Serialize)]
struct Holding {
    holding_end: &'static str,
    cap_pressure: Shown,
    rod_pressure: Shown,
}

#[derive(Serialize)]
struct SealBypass {
    outcome: &'static str,
    final_pressure: Option<Shown>,
    intensification_factor: Option<f64>,
    settle_drift: Option<Shown>,
    explanation: &'static str,
    travel_left: Shown,
    bottoms: bool,
    settle_drift_oil_only: Option<Shown>,
    settle_drift_one_percent_air: Option<Shown>,
}

#[derive(Serialize)]
struct RodSide {
    supply_pressure: Shown,
    rod_pressure: Shown,
    /// The load behind `rod_pressure` (the lightest of the range for a pushing load).
    load: Shown,
}

#[derive(Serialize)]
struct Speeds {
    extend: Shown,
    retract: Shown,
    regenerative_extend: Shown,
    retract_return_flow: Shown,
    extend_return_flow: Shown,
}

#[derive(Serialize)]
struct Forces {
    extend: Shown,
    retract: Shown,
    regenerative_extend: Shown,
}

#[derive(Serialize)]
struct Counterbalance {
    setting: Shown,
    load_pressure: Shown,
    pilot_ratio: Option<f64>,
    pilot_opening_pressure: Option<Shown>,
    pilot_source: &'static str,
    setting_used: Shown,
    setting_recorded: bool,
}

#[derive(Serialize)]
struct Heating {
    temperature_rise: Shown,
    cap_rise: Shown,
    rod_rise: Shown,
    cap_pressure: Shown,
    rod_pressure: Shown,
    model: &'static str,
    piston_motion: Shown,
    bottoms: bool,
    relieves: bool,
    held_oil_rise: Shown,
}

#[derive(Serialize)]
struct BypassWarming {
    temperature_rise: Shown,
    pressure: Shown,
    piston_motion: Shown,
    reaches_stop: bool,
}

#[derive(Serialize)]
struct HoldingValve {
    kind: &'static str,
    setting: Option<Shown>,
    pilot_ratio: Option<f64>,
    pilot_source: &'static str,
    pilot_opening_pressure: Option<Shown>,
    relieves: bool,
}

/// Each work port's centre as recorded (`not_recorded`: analysed as blocked).
#[derive(Serialize)]
struct ValveCentre {
    cap: &'static str,
    rod: &'static str,
}

#[derive(Serialize)]
struct Tube {
    pressure: Shown,
    hoop_stress: Shown,
    equivalent_stress: Shown,
    criterion: &'static str,
    equivalent_utilisation: f64,
    /// The tube material used for its growth under pressure.
    youngs_modulus: Option<Shown>,
    poisson_ratio: Option<f64>,
    yield_strength: Shown,
    safety_factor: f64,
    allowable_stress: Shown,
    utilisation: f64,
    status: &'static str,
}

#[derive(Serialize)]
struct Buckling {
    end_condition: &'static str,
    effective_length_factor: f64,
    length: Shown,
    critical_load: Shown,
    safety_factor: f64,
    allowable_load: Shown,
    load: Shown,
    /// The strictest of Euler, Johnson and the design factor.
    status: &'static str,
    euler_status: &'static str,
    length_assumed: bool,
    length_basis: &'static str,
    youngs_modulus: Shown,
    rod_yield_strength: Shown,
    rod_yield_assumed: bool,
    inelastic_method: &'static str,
    slenderness: f64,
    transition_slenderness: f64,
    theoretical: BucklingFigure,
    design: BucklingFigure,
    governing_allowable_load: Shown,
}

#[derive(Serialize)]
struct BucklingFigure {
    effective_length_factor: f64,
    slenderness: f64,
    range: &'static str,
    method: &'static str,
    critical_load: Shown,
    allowable_load: Shown,
}

#[derive(Serialize)]
struct Check<'a> {
    component: &'a str,
    exposure: &'static str,
    scenario: &'static str,
    pressure: Shown,
    rating: Shown,
    status: &'static str,
    load: Shown,
}

const LENGTH_ASSUMED: &str = "assumed: twice the stroke (no free length given; enter the pin-to-pin length at full extension)";

/// The answer of `POST /api/v1/calc/cylinder`.
pub fn cylinder_response<'a>(
    input: &CylinderInput,
    r: &'a CylinderReport,
    units: UnitSystem,
) -> CylinderAnswer<'a> {
    let q = |si: f64, dimension: D| quantity::show(si, dimension, units);
    let oq = |si: Option<f64>, dimension: D| si.map(|v| q(v, dimension));
    let p = |si: f64| q(si, D::Pressure);
    let b = &r.seal_bypass;
    CylinderAnswer {
        calc_version: CALC_VERSION,
        units: units.as_str(),
        load_direction: input.load_direction.as_str(),
        load_range: {
            let (light, heavy) = worst_load::range(input);
            LoadRange {
                min_load: q(light, D::Force),
                load: q(heavy, D::Force),
            }
        },
        position: q(r.position, D::Length),
        areas: Areas {
            cap: q(r.areas.cap, D::Area),
            rod: q(r.areas.rod, D::Area),
            annulus: q(r.areas.annulus, D::Area),
            ratio: r.areas.ratio,
        },
        volumes: Pair {
            cap: q(r.volumes.cap, D::Volume),
            rod: q(r.volumes.rod, D::Volume),
        },
        holding: Holding {
            holding_end: input.load_direction.holding_end().as_str(),
            cap_pressure: p(r.holding.cap_pressure),
            rod_pressure: p(r.holding.rod_pressure),
        },
        seal_bypass: SealBypass {
            outcome: b.outcome.as_str(),
            final_pressure: oq(b.final_pressure, D::Pressure),
            intensification_factor: b.intensification_factor,
            settle_drift: oq(b.settle_drift, D::Length),
            explanation: b.outcome.explanation(),
            travel_left: q(b.travel_left, D::Length),
            bottoms: b.bottoms,
            settle_drift_oil_only: oq(b.settle_drift_oil_only, D::Length),
            settle_drift_one_percent_air: oq(b.settle_drift_one_percent_air, D::Length),
        },
        rod_side_intensification: r.rod_side_intensification.zip(input.supply_pressure).map(
            |(rod, supply)| RodSide {
                supply_pressure: p(supply),
                rod_pressure: p(rod),
                load: q(
                    worst_load::find(&r.scenarios, ROD_SIDE_INTENSIFICATION)
                        .map_or(input.load, |s| s.rod_load),
                    D::Force,
                ),
            },
        ),
        speeds: r.speeds.map(|s| Speeds {
            extend: q(s.extend, D::Speed),
            retract: q(s.retract, D::Speed),
            regenerative_extend: q(s.regenerative_extend, D::Speed),
            retract_return_flow: q(s.retract_return_flow, D::Flow),
            extend_return_flow: q(s.extend_return_flow, D::Flow),
        }),
        forces: r.forces.map(|f| Forces {
            extend: q(f.extend, D::Force),
            retract: q(f.retract, D::Force),
            regenerative_extend: q(f.regenerative_extend, D::Force),
        }),
        counterbalance: Counterbalance {
            setting: p(r.counterbalance.setting),
            load_pressure: p(r.counterbalance.load_pressure),
            pilot_ratio: r.counterbalance.pilot_ratio,
            pilot_opening_pressure: oq(r.counterbalance.pilot_opening_pressure, D::Pressure),
            pilot_source: r.counterbalance.pilot_source.as_str(),
            setting_used: p(r.counterbalance.setting_used),
            setting_recorded: r.counterbalance.setting_recorded,
        },
        trapped_oil_heating: Heating {
            temperature_rise: q(r.heating.temperature_rise, D::TemperatureChange),
            cap_rise: p(r.heating.cap_rise),
            rod_rise: p(r.heating.rod_rise),
            cap_pressure: p(r.heating.cap_pressure),
            rod_pressure: p(r.heating.rod_pressure),
            model: "free_piston",
            piston_motion: q(r.heating.piston_motion, D::Length),
            bottoms: r.heating.bottoms,
            relieves: r.heating.relieves,
            held_oil_rise: p(r.heating.held_oil_rise),
        },
        seal_bypass_warming: r.bypass_warming.map(|w| BypassWarming {
            temperature_rise: q(w.temperature_rise, D::TemperatureChange),
            pressure: p(w.pressure),
            piston_motion: q(w.piston_motion, D::Length),
            reaches_stop: w.reaches_stop,
        }),
        holding_valve: r.holding_valve.map(|v| HoldingValve {
            kind: v.kind.as_str(),
            setting: oq(v.setting, D::Pressure),
            pilot_ratio: v.pilot_ratio,
            pilot_source: v.pilot_source.as_str(),
            pilot_opening_pressure: oq(v.pilot_opening_pressure, D::Pressure),
            relieves: v.relieves,
        }),
        valve_centre: ValveCentre {
            cap: input
                .valves
                .cap_centre
                .map_or("not_recorded", |c| c.as_str()),
            rod: input
                .valves
                .rod_centre
                .map_or("not_recorded", |c| c.as_str()),
        },
        entrained_air: input.entrained_air,
        tube: r.tube.map(|t| Tube {
            pressure: p(t.pressure),
            hoop_stress: p(t.hoop_stress),
            equivalent_stress: p(t.equivalent_stress),
            criterion: t.criterion,
            equivalent_utilisation: t.equivalent_utilisation,
            youngs_modulus: input.trapped.tube.map(|w| p(w.youngs)),
            poisson_ratio: input.trapped.tube.map(|w| w.poisson),
            yield_strength: p(t.yield_strength),
            safety_factor: t.safety_factor,
            allowable_stress: p(t.allowable_stress),
            utilisation: t.utilisation,
            status: t.status.as_str(),
        }),
        buckling: r.buckling.map(|b| {
            let k = &b.euler;
            let figure = |f: &buckling::Figure| BucklingFigure {
                effective_length_factor: f.effective_length_factor,
                slenderness: f.slenderness,
                range: f.range.as_str(),
                method: f.range.method(),
                critical_load: q(f.critical_load, D::Force),
                allowable_load: q(f.allowable_load, D::Force),
            };
            Buckling {
                end_condition: k.end_condition.as_str(),
                effective_length_factor: k.end_condition.factor(),
                length: q(k.length, D::Length),
                critical_load: q(k.critical_load, D::Force),
                safety_factor: k.safety_factor,
                allowable_load: q(k.allowable_load, D::Force),
                load: q(k.load, D::Force),
                status: b.status.as_str(),
                euler_status: k.status.as_str(),
                length_assumed: b.length_assumed,
                length_basis: if b.length_assumed {
                    LENGTH_ASSUMED
                } else {
                    "given"
                },
                youngs_modulus: p(b.youngs),
                rod_yield_strength: p(b.yield_strength),
                rod_yield_assumed: b.yield_assumed,
                inelastic_method: "johnson",
                slenderness: b.theoretical.slenderness,
                transition_slenderness: b.transition_slenderness,
                theoretical: figure(&b.theoretical),
                design: figure(&b.design),
                governing_allowable_load: q(b.governing_allowable_load, D::Force),
            }
        }),
        highest_pressure: p(r.highest_pressure),
        scenarios: r
            .scenarios
            .iter()
            .map(|s| ScenarioOut {
                name: s.name,
                cap_pressure: p(s.cap),
                rod_pressure: p(s.rod),
                cap_load: q(s.cap_load, D::Force),
                rod_load: q(s.rod_load, D::Force),
            })
            .collect(),
        checks: r
            .checks
            .iter()
            .map(|c| Check {
                component: &c.component,
                exposure: c.exposure.as_str(),
                scenario: c.scenario,
                pressure: p(c.pressure),
                rating: p(c.rating),
                status: c.status.as_str(),
                load: q(c.load, D::Force),
            })
            .collect(),
        hazards: &r.hazards,
        notes: &r.notes,
        cautions: &r.cautions,
    }
}
