//! Pressure-decay test at the end of stroke.

use crate::{FIGURE, close};
use loadhold::calc::analysis::CylinderInput;
use loadhold::calc::cylinder::{Cylinder, End, LoadDirection};
use loadhold::calc::decay::{self, DecayLimit, DecayReadings};
use loadhold::calc::diagnosis::Diagnosis;
use loadhold::calc::drift::Verdict;
use loadhold::calc::quantity::UnitSystem;

const C0: f64 = 273.15;

fn input() -> CylinderInput {
    CylinderInput::new(
        Cylinder::new(0.100, 0.070, 1.0).unwrap(),
        0.0,
        LoadDirection::Retract,
    )
}

fn readings(p_start_bar: f64, p_end_bar: f64, t_start: f64, t_end: f64) -> DecayReadings {
    DecayReadings {
        pressurised_end: End::Cap,
        duration: 600.0,
        pressure_start: p_start_bar * 1e5,
        pressure_end: p_end_bar * 1e5,
        oil_temperature_start: C0 + t_start,
        oil_temperature_end: C0 + t_end,
        other_pressure_start: None,
        other_pressure_end: None,
        limit: None,
    }
}

#[test]
fn cooling_explains_10_5_bar_per_degree() {
    // REFERENCES.md [C]: 1.5 GPa x 7e-4 = 10.5 bar per degC; 2 degC of cooling is -21 bar.
    let report = decay::analyse_decay(
        &input(),
        &readings(200.0, 179.5, 40.0, 38.0),
        UnitSystem::Metric,
    )
    .unwrap();
    close(report.thermal_change / 1e5, -21.0, FIGURE, "thermal change");
    assert_eq!(report.diagnosis, Diagnosis::ThermalContraction);
}

#[test]
fn a_loss_beyond_cooling_is_a_leak_with_its_volume() {
    // [C] 200 -> 150 bar with 2 degC cooling: 29 bar lost to leakage; the leaked volume is
    // dp V / B (definition of the bulk modulus) = 29e5 x 7.854 L / 1.5 GPa = 15.18 mL.
    let mut r = readings(200.0, 150.0, 40.0, 38.0);
    r.other_pressure_start = Some(0.0);
    r.other_pressure_end = Some(30e5);
    r.limit = Some(DecayLimit {
        pressure: 20e5,
        per: 600.0,
    });
    let report = decay::analyse_decay(&input(), &r, UnitSystem::Metric).unwrap();
    close(report.leak_change / 1e5, -29.0, FIGURE, "leak change");
    let volume = 29e5 * input().cylinder.cap_area() * 1.0 / 1.5e9;
    close(report.leak_flow * 600.0, volume, FIGURE, "leaked volume");
    assert_eq!(
        report.diagnosis,
        Diagnosis::PistonSealBypass,
        "the rod end rose 30 bar"
    );
    assert_eq!(report.verdict, Verdict::Fail);
}

#[test]
fn a_steady_pressure_is_no_leak() {
    let report = decay::analyse_decay(
        &input(),
        &readings(200.0, 199.8, 40.0, 40.0),
        UnitSystem::Us,
    )
    .unwrap();
    assert_eq!(report.diagnosis, Diagnosis::NoLeak);
    assert!(
        report.reasoning[0].contains("psi"),
        "{:?}",
        report.reasoning
    );
}

#[test]
fn entrained_air_takes_up_part_of_a_cooling_and_of_a_leak() {
    // 1 % air at atmospheric pressure in the cap end (7.854 L at full extension), 200 -> 170
    // bar, cooled 2 K. Isothermal air (Boyle's law) at the mean 185 bar has the compliance
    // f V p_atm / (p_atm + p)² (REFERENCES.md "Fluid properties": the gas term of the
    // effective bulk modulus, gas modulus = absolute pressure); with the oil's V / K [C]:
    // dp_thermal = alpha V dT / (V/K + f V p_atm/(p_atm + p)²).
    let mut input = input();
    input.entrained_air = 0.01;
    let report = decay::analyse_decay(
        &input,
        &readings(200.0, 170.0, 40.0, 38.0),
        UnitSystem::Metric,
    )
    .unwrap();
    let v = std::f64::consts::PI * 0.01 / 4.0 * 1.0;
    let (pa, p) = (101_325.0, 185e5);
    let c = v / 1.5e9 + 0.01 * v * pa / ((pa + p) * (pa + p));
    let thermal = 7e-4 * v * -2.0 / c;
    close(
        report.thermal_change,
        thermal,
        FIGURE,
        "thermal change with air",
    );
    assert!(
        report.thermal_change > -21e5,
        "air softens the cooling's drop"
    );
    close(
        report.leak_flow * 600.0,
        -c * (-30e5 - thermal),
        FIGURE,
        "leaked volume with air",
    );
}
