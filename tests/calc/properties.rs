//! Property tests (proptest): no panic for any input, finite results, bypass pressure never
//! below holding (short of a stop), settle never beyond the travel left, a free piston's
//! rod-end heating rise at least K alpha dT, refusals for bad input, settle drift grows with
//! oil volume and falls with bulk modulus, unit round trips.

use loadhold::calc::analysis::{self, CylinderInput};
use loadhold::calc::bypass::{self, Line, Trapped, TubeWall};
use loadhold::calc::cylinder::{self, Cylinder, End, LoadDirection};
use loadhold::calc::decay::{self, DecayLimit, DecayReadings};
use loadhold::calc::drift::{self, DriftReadings, Limit, Movement, PortPressures};
use loadhold::calc::quantity::{self, Dimension, UNITS, UnitSystem};
use loadhold::calc::ratings::{Exposure, Rating};
use loadhold::calc::valves::{HoldingValve, PilotSource, ValveKind};
use proptest::prelude::*;

/// Any f64 at all, weighted toward the awkward ones.
fn wild() -> impl Strategy<Value = f64> {
    prop_oneof![
        Just(f64::NAN),
        Just(f64::INFINITY),
        Just(f64::NEG_INFINITY),
        Just(0.0),
        Just(-0.0),
        Just(f64::MIN_POSITIVE),
        Just(f64::MAX),
        -1e3..1e3f64,
        0.0..2.0f64,
        any::<f64>(),
    ]
}

fn direction() -> impl Strategy<Value = LoadDirection> {
    prop_oneof![Just(LoadDirection::Retract), Just(LoadDirection::Extend)]
}

/// A valid geometry: bore 10 mm to 1 m, rod 5 % to 95 % of it, stroke 10 mm to 10 m.
fn geometry() -> impl Strategy<Value = Cylinder> {
    (0.01..1.0f64, 0.05..0.95f64, 0.01..10.0f64).prop_map(|(bore, k, stroke)| {
        Cylinder::new(bore, bore * k, stroke).expect("valid by construction")
    })
}

fn trapped(b: f64, cap_line: f64, rod_line: f64) -> Trapped {
    Trapped {
        bulk_modulus: b,
        cap_line: Line {
            volume: cap_line,
            expansion: 0.0,
        },
        rod_line: Line {
            volume: rod_line,
            expansion: 0.0,
        },
        tube: None,
    }
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(256))]

    #[test]
    fn no_input_makes_the_cylinder_analysis_panic(
        g in prop::array::uniform8(wild()),
        h in prop::array::uniform6(wild()),
        dir in direction(),
        us in any::<bool>(),
    ) {
        let mut input = CylinderInput::new(Cylinder { bore: g[0], rod: g[1], stroke: g[2] }, g[3], dir);
        input.position = Some(g[4]);
        input.trapped = Trapped {
            bulk_modulus: g[5],
            cap_line: Line { volume: g[6], expansion: g[7] },
            rod_line: Line { volume: h[0], expansion: h[1] },
            tube: Some(TubeWall::steel(h[2])),
        };
        input.supply_pressure = Some(h[3]);
        input.flow = Some(h[4]);
        input.tube_yield = Some(h[5]);
        input.ratings.push(Rating { component: "cylinder".into(), exposure: Exposure::Both, rating: g[3] });
        let units = if us { UnitSystem::Us } else { UnitSystem::Metric };
        let _ = analysis::analyse(&input, units);
    }

    #[test]
    fn no_readings_make_the_test_analyses_panic(
        r in prop::array::uniform8(wild()),
        s in prop::array::uniform4(wild()),
        g in geometry(),
        dir in direction(),
        positions in any::<bool>(),
    ) {
        let input = CylinderInput::new(g, 1e4, dir);
        let movement = if positions { Movement::Positions { start: r[1], end: r[2] } } else { Movement::Drift(r[1]) };
        let readings = DriftReadings {
            duration: r[0],
            movement,
            oil_temperature_start: r[3],
            oil_temperature_end: r[4],
            pressures: PortPressures { cap_start: Some(r[5]), cap_end: Some(r[6]), rod_start: Some(r[7]), rod_end: Some(s[0]) },
            limit: Some(Limit { distance: s[1], per: s[2] }),
        };
        let _ = drift::analyse_drift(&input, &readings, UnitSystem::Metric);
        let decay_readings = DecayReadings {
            pressurised_end: if positions { End::Cap } else { End::Rod },
            duration: r[0],
            pressure_start: r[5],
            pressure_end: r[6],
            oil_temperature_start: r[3],
            oil_temperature_end: r[4],
            other_pressure_start: Some(r[7]),
            other_pressure_end: Some(s[0]),
            limit: Some(DecayLimit { pressure: s[1], per: s[3] }),
        };
        let _ = decay::analyse_decay(&input, &decay_readings, UnitSystem::Us);
    }

    #[test]
    fn valid_drift_tests_always_give_finite_figures(
        g in geometry(),
        dir in direction(),
        drift_frac in -0.01..0.01f64,
        minutes in 1.0..600.0f64,
        t0 in 0.0..90.0f64,
        dt in -20.0..20.0f64,
    ) {
        let input = CylinderInput::new(g, 1e4, dir);
        let readings = DriftReadings {
            duration: minutes * 60.0,
            movement: Movement::Drift(drift_frac * g.stroke),
            oil_temperature_start: 273.15 + t0,
            oil_temperature_end: 273.15 + t0 + dt,
            pressures: PortPressures::default(),
            limit: None,
        };
        let report = drift::analyse_drift(&input, &readings, UnitSystem::Metric).expect("valid readings");
        for v in [report.drift_rate, report.thermal_drift, report.leak_drift, report.leak_flow, report.scaled_drift] {
            prop_assert!(v.is_finite());
        }
        prop_assert!(!report.reasoning.is_empty());
    }

    #[test]
    fn bypass_pressure_is_never_below_the_holding_pressure(
        g in geometry(),
        load in 0.0..1e7f64,
        pos in 0.0..1.0f64,
    ) {
        let holding = cylinder::holding_pressures(&g, load, LoadDirection::Retract);
        let x = pos * g.stroke;
        let b = bypass::seal_bypass(&g, x, load, LoadDirection::Retract, &trapped(1.5e9, 0.0, 0.0));
        let p = b.final_pressure.expect("a pushing load intensifies");
        prop_assert!(p.is_finite());
        // Force balance: F / A_rod above F / A_cap. Only a piston that bottoms first (the stop
        // then carries part of the load) equalises lower, and never above F / A_rod.
        prop_assert!(b.bottoms || p >= holding.cap_pressure * (1.0 - 1e-12));
        prop_assert!(p >= holding.rod_pressure);
        prop_assert!(p <= load / g.rod_area() * (1.0 + 1e-9));
        prop_assert!(b.bottoms || b.intensification_factor.unwrap() > 1.0);
        let settle = b.settle_drift.unwrap();
        prop_assert!(settle >= 0.0);
        prop_assert!(settle <= x * (1.0 + 1e-12), "settle {settle} beyond the travel left {x}");
    }

    #[test]
    fn the_analysis_is_finite_and_never_shows_less_than_the_holding_pressure(
        g in geometry(),
        load in 0.0..1e7f64,
        pos in 0.0..=1.0f64,
        dir in direction(),
        dt in 0.0..60.0f64,
        od_extra in 0.001..0.2f64,
        air in 0.0..0.05f64,
    ) {
        let mut input = CylinderInput::new(g, load, dir);
        input.position = Some(pos * g.stroke);
        input.temperature_rise = dt;
        input.trapped.tube = Some(TubeWall::steel(g.bore * (1.0 + od_extra)));
        input.entrained_air = air;
        let r = analysis::analyse(&input, UnitSystem::Metric).expect("valid input");
        let hold = input.load_direction.holding_end();
        for s in &r.scenarios {
            prop_assert!(s.cap.is_finite() && s.rod.is_finite(), "{}", s.name);
        }
        prop_assert!(r.highest_pressure.is_finite());
        prop_assert!(r.highest_pressure >= r.holding.at(hold) * (1.0 - 1e-12));
        prop_assert!(r.heating.piston_motion.is_finite());
        if let Some(settle) = r.seal_bypass.settle_drift {
            prop_assert!(settle <= r.seal_bypass.travel_left * (1.0 + 1e-12));
        }
        // Air only adds room: the settle with 1 % air is at least the oil-only settle.
        if let (Some(oil), Some(air)) = (r.seal_bypass.settle_drift_oil_only, r.seal_bypass.settle_drift_one_percent_air) {
            prop_assert!(air >= oil * (1.0 - 1e-9));
        }
    }

    #[test]
    fn a_free_piston_raises_the_rod_end_at_least_k_alpha_dt(
        g in geometry(),
        load in 0.0..1e7f64,
        pos in 0.001..0.999f64,
        dir in direction(),
        dt in 0.1..60.0f64,
        b in 0.5e9..2.5e9f64,
    ) {
        // Oil only, rigid walls, both ends blocked (REFERENCES.md "Added 2026-12-02": the rod
        // end rises by K alpha dT times 1 + A_rod/(A_cap (L-x)/x + A_ann) >= 1).
        let mut input = CylinderInput::new(g, load, dir);
        input.position = Some(pos * g.stroke);
        input.temperature_rise = dt;
        input.trapped.bulk_modulus = b;
        let h = analysis::analyse(&input, UnitSystem::Metric).expect("valid input").heating;
        let k_alpha_dt = b * input.oil_expansion * dt;
        prop_assert!(h.rod_rise >= k_alpha_dt * (1.0 - 1e-9), "{} < {}", h.rod_rise, k_alpha_dt);
        prop_assert!(h.cap_rise <= k_alpha_dt * (1.0 + 1e-9));
        prop_assert!(h.cap_rise >= 0.0);
    }

    #[test]
    fn bad_valve_and_air_inputs_are_refused_naming_the_field(
        bad in prop_oneof![Just(f64::NAN), Just(f64::INFINITY), Just(-1.0), Just(0.0), Just(1e15)],
        which in 0..3usize,
    ) {
        let g = Cylinder::new(0.1, 0.07, 1.0).unwrap();
        let mut input = CylinderInput::new(g, 1e4, LoadDirection::Retract);
        let field = match which {
            0 => { input.entrained_air = if bad == 0.0 { 0.9 } else { bad }; "entrained_air" }
            1 => {
                input.valves.holding = Some(HoldingValve { kind: ValveKind::Counterbalance, setting: Some(bad), pilot_ratio: None, pilot: PilotSource::OtherPort });
                "holding_valve_setting"
            }
            _ => {
                input.valves.holding = Some(HoldingValve { kind: ValveKind::PilotCheck, setting: None, pilot_ratio: Some(bad), pilot: PilotSource::External });
                "holding_valve_pilot_ratio"
            }
        };
        let err = analysis::analyse(&input, UnitSystem::Metric).expect_err("refused");
        prop_assert_eq!(err.field, field);
    }

    #[test]
    fn settle_drift_grows_with_oil_volume_and_falls_with_bulk_modulus(
        g in geometry(),
        load in 1.0..1e7f64,
        pos in 0.0..1.0f64,
        v1 in 0.0..0.01f64,
        extra in 1e-5..0.01f64,
        b1 in 0.5e9..2.0e9f64,
        b_extra in 0.05e9..1.0e9f64,
    ) {
        let x = pos * g.stroke;
        let settle = |t: Trapped| bypass::seal_bypass(&g, x, load, LoadDirection::Retract, &t).settle_drift.unwrap();
        // Never beyond the travel left, so a piston that bottoms settles by that travel for
        // either volume: the growth is strict only while it stops short of the stop.
        let more = |a: f64, b: f64| a > b || (a == b && b >= x * (1.0 - 1e-12));
        prop_assert!(more(settle(trapped(b1, v1 + extra, 0.0)), settle(trapped(b1, v1, 0.0))));
        prop_assert!(more(settle(trapped(b1, 0.0, v1 + extra)), settle(trapped(b1, 0.0, v1))));
        prop_assert!(more(settle(trapped(b1, v1, v1)), settle(trapped(b1 + b_extra, v1, v1))));
    }

    #[test]
    fn every_unit_round_trips(index in 0..UNITS.len(), value in -1e9..1e9f64) {
        let unit = &UNITS[index];
        let value = if unit.dimension == Dimension::Temperature { value.abs() } else { value };
        let si = quantity::to_si(value, unit.symbol, unit.dimension).unwrap();
        let back = quantity::from_si(si, unit.symbol, unit.dimension).unwrap();
        prop_assert!((back - value).abs() <= 1e-9 * value.abs().max(1.0), "{} {}: {back}", value, unit.symbol);
        let text = format!("{value} {}", unit.symbol);
        let parsed = quantity::parse_str(&text, unit.dimension).unwrap();
        prop_assert!((parsed - si).abs() <= 1e-12 * si.abs().max(1e-300), "{text}");
        // Shown in either system and parsed back, the SI value survives.
        for units in [UnitSystem::Us, UnitSystem::Metric] {
            let shown = quantity::show(si, unit.dimension, units);
            let again = quantity::to_si(shown.value, shown.unit, unit.dimension).unwrap();
            prop_assert!((again - si).abs() <= 1e-9 * si.abs().max(1e-9));
        }
    }

    #[test]
    fn parsing_any_text_never_panics(text in ".{0,40}") {
        for dimension in [Dimension::Length, Dimension::Pressure, Dimension::Temperature, Dimension::Flow] {
            if let Ok(v) = quantity::parse_str(&text, dimension) {
                prop_assert!(v.is_finite());
            }
        }
    }
}
