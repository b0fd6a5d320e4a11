//! The unit table of `calc::quantity` against REFERENCES.md "Units" and against the `uom`
//! crate (a general-purpose units library from crates.io).

use crate::close;
use loadhold::calc::quantity::{self, Dimension, UNITS};
use uom::si::f64 as q;
use uom::si::{
    area, force, length, pressure, temperature_interval as ti, thermodynamic_temperature as tt,
    time, velocity, volume, volume_rate,
};

fn si(value: f64, unit: &str, dimension: Dimension) -> f64 {
    quantity::to_si(value, unit, dimension).expect("a unit in the table")
}

#[test]
fn inch_is_exactly_25_4_mm() {
    // NIST SP 811 (1959 international yard and pound) [S]: 0.0254 m exactly.
    assert_eq!(si(1.0, "in", Dimension::Length), 0.0254);
    close(
        si(1.0, "ft", Dimension::Length),
        0.3048,
        1e-15,
        "foot (12 in)",
    );
}

#[test]
fn pound_force_is_0_45359237_kg_times_standard_gravity() {
    // NIST SP 811 [S]: 4.4482216152605 N; also scipy.constants.lbf.
    close(
        si(1.0, "lbf", Dimension::Force),
        4.448_221_615_260_5,
        1e-12,
        "lbf",
    );
}

#[test]
fn psi_matches_the_scipy_constant() {
    // [C] lbf/in²; scipy.constants.psi = 6.89475729316836e3.
    close(
        si(1.0, "psi", Dimension::Pressure),
        6.894_757_293_168_36e3,
        1e-12,
        "psi",
    );
    close(
        si(1.0, "ksi", Dimension::Pressure),
        6.894_757_293_168_36e6,
        1e-12,
        "ksi",
    );
}

#[test]
fn bar_and_megapascal_are_exact_powers_of_ten() {
    // ISO 80000-4 [S].
    assert_eq!(si(1.0, "bar", Dimension::Pressure), 1e5);
    assert_eq!(si(1.0, "MPa", Dimension::Pressure), 1e6);
}

#[test]
fn us_gallon_and_cubic_inch() {
    // NIST Handbook 44, Appendix C [S]: 231 in³ = 3.785411784 L; [C] in³ = 16.387064 cm³.
    close(
        si(1.0, "gal", Dimension::Volume),
        3.785_411_784e-3,
        1e-12,
        "US gallon",
    );
    close(
        si(1.0, "in3", Dimension::Volume),
        16.387_064e-6,
        1e-12,
        "cubic inch",
    );
    // [C] 1 gpm = 3.785411784 L/min.
    close(
        si(1.0, "gpm", Dimension::Flow),
        si(3.785_411_784, "L/min", Dimension::Flow),
        1e-12,
        "gpm in L/min",
    );
}

#[test]
fn fahrenheit_to_celsius_is_f_minus_32_times_5_9() {
    // NIST SP 811 [S]: (F - 32) x 5/9.
    for f in [-40.0, 32.0, 68.0, 140.0, 212.0] {
        let kelvin = si(f, "degF", Dimension::Temperature);
        close(
            kelvin - 273.15 + 1000.0,
            (f - 32.0) * 5.0 / 9.0 + 1000.0,
            1e-12,
            "degF",
        );
    }
    // A temperature change carries no offset: 18 degF of change is 10 K.
    close(
        si(18.0, "degF", Dimension::TemperatureChange),
        10.0,
        1e-12,
        "degF change",
    );
    // "°C" is read as degC.
    close(si(20.0, "°C", Dimension::Temperature), 293.15, 1e-12, "°C");
}

/// One unit of `symbol` in SI according to uom (`None` where uom has no such unit).
fn uom_si(symbol: &str, dimension: Dimension) -> Option<f64> {
    use Dimension as D;
    let per_interval = |k: f64| 1.0 / k;
    Some(match (dimension, symbol) {
        (D::Length, "m") => q::Length::new::<length::meter>(1.0).value,
        (D::Length, "mm") => q::Length::new::<length::millimeter>(1.0).value,
        (D::Length, "cm") => q::Length::new::<length::centimeter>(1.0).value,
        (D::Length, "in") => q::Length::new::<length::inch>(1.0).value,
        (D::Length, "ft") => q::Length::new::<length::foot>(1.0).value,
        (D::Area, "m2") => q::Area::new::<area::square_meter>(1.0).value,
        (D::Area, "mm2") => q::Area::new::<area::square_millimeter>(1.0).value,
        (D::Area, "cm2") => q::Area::new::<area::square_centimeter>(1.0).value,
        (D::Area, "in2") => q::Area::new::<area::square_inch>(1.0).value,
        (D::Volume, "m3") => q::Volume::new::<volume::cubic_meter>(1.0).value,
        (D::Volume, "L") => q::Volume::new::<volume::liter>(1.0).value,
        (D::Volume, "mL") => q::Volume::new::<volume::milliliter>(1.0).value,
        (D::Volume, "cm3" | "cc") => q::Volume::new::<volume::cubic_centimeter>(1.0).value,
        (D::Volume, "in3") => q::Volume::new::<volume::cubic_inch>(1.0).value,
        (D::Volume, "gal") => q::Volume::new::<volume::gallon>(1.0).value,
        (D::Force, "N") => q::Force::new::<force::newton>(1.0).value,
        (D::Force, "kN") => q::Force::new::<force::kilonewton>(1.0).value,
        (D::Force, "lbf") => q::Force::new::<force::pound_force>(1.0).value,
        (D::Force, "kgf") => q::Force::new::<force::kilogram_force>(1.0).value,
        // A tonne's weight: 1000 kgf.
        (D::Force, "t") => q::Force::new::<force::kilogram_force>(1000.0).value,
        (D::Force, "kip") => q::Force::new::<force::kip>(1.0).value,
        (D::Pressure, "Pa") => q::Pressure::new::<pressure::pascal>(1.0).value,
        (D::Pressure, "kPa") => q::Pressure::new::<pressure::kilopascal>(1.0).value,
        (D::Pressure, "MPa") => q::Pressure::new::<pressure::megapascal>(1.0).value,
        (D::Pressure, "GPa") => q::Pressure::new::<pressure::gigapascal>(1.0).value,
        (D::Pressure, "bar") => q::Pressure::new::<pressure::bar>(1.0).value,
        (D::Pressure, "psi") => q::Pressure::new::<pressure::psi>(1.0).value,
        (D::Pressure, "ksi") => q::Pressure::new::<pressure::psi>(1e3).value,
        (D::Flow, "m3/s") => q::VolumeRate::new::<volume_rate::cubic_meter_per_second>(1.0).value,
        (D::Flow, "L/min") => q::VolumeRate::new::<volume_rate::liter_per_minute>(1.0).value,
        (D::Flow, "gpm") => q::VolumeRate::new::<volume_rate::gallon_per_minute>(1.0).value,
        (D::Speed, "m/s") => q::Velocity::new::<velocity::meter_per_second>(1.0).value,
        (D::Speed, "mm/s") => q::Velocity::new::<velocity::millimeter_per_second>(1.0).value,
        (D::Speed, "in/s") => q::Velocity::new::<velocity::inch_per_second>(1.0).value,
        (D::Speed, "ft/min") => q::Velocity::new::<velocity::foot_per_minute>(1.0).value,
        (D::Temperature, "K") => q::ThermodynamicTemperature::new::<tt::kelvin>(1.0).value,
        (D::Temperature, "degC") => {
            q::ThermodynamicTemperature::new::<tt::degree_celsius>(1.0).value
        }
        (D::Temperature, "degF") => {
            q::ThermodynamicTemperature::new::<tt::degree_fahrenheit>(1.0).value
        }
        (D::TemperatureChange, "K") => q::TemperatureInterval::new::<ti::kelvin>(1.0).value,
        (D::TemperatureChange, "degC") => {
            q::TemperatureInterval::new::<ti::degree_celsius>(1.0).value
        }
        (D::TemperatureChange, "degF") => {
            q::TemperatureInterval::new::<ti::degree_fahrenheit>(1.0).value
        }
        (D::Time, "s") => q::Time::new::<time::second>(1.0).value,
        (D::Time, "min") => q::Time::new::<time::minute>(1.0).value,
        (D::Time, "h") => q::Time::new::<time::hour>(1.0).value,
        (D::Expansion, "1/K") => per_interval(q::TemperatureInterval::new::<ti::kelvin>(1.0).value),
        (D::Expansion, "1/degC") => {
            per_interval(q::TemperatureInterval::new::<ti::degree_celsius>(1.0).value)
        }
        (D::Expansion, "1/degF") => {
            per_interval(q::TemperatureInterval::new::<ti::degree_fahrenheit>(1.0).value)
        }
        (D::Compliance, "m3/Pa") => {
            (q::Volume::new::<volume::cubic_meter>(1.0) / q::Pressure::new::<pressure::pascal>(1.0))
                .value
        }
        (D::Compliance, "cm3/bar" | "mL/bar") => {
            (q::Volume::new::<volume::cubic_centimeter>(1.0)
                / q::Pressure::new::<pressure::bar>(1.0))
            .value
        }
        (D::Compliance, "L/bar") => {
            (q::Volume::new::<volume::liter>(1.0) / q::Pressure::new::<pressure::bar>(1.0)).value
        }
        (D::Compliance, "in3/psi") => {
            (q::Volume::new::<volume::cubic_inch>(1.0) / q::Pressure::new::<pressure::psi>(1.0))
                .value
        }
        _ => return None,
    })
}

#[test]
fn every_unit_in_the_table_agrees_with_uom() {
    // uom 0.38 (crates.io). uom rounds some US units to 7 significant figures (psi 6.894757e3,
    // lbf 4.448222, gallon 3.785412e-3, in³ 1.638706e-5), so the tolerance is 1e-6; the exact
    // definitions are checked to 1e-12 in the tests above.
    for unit in UNITS {
        let theirs = uom_si(unit.symbol, unit.dimension).unwrap_or_else(|| {
            panic!(
                "no uom counterpart listed for {} ({:?})",
                unit.symbol, unit.dimension
            )
        });
        let ours = si(1.0, unit.symbol, unit.dimension);
        close(
            ours,
            theirs,
            1e-6,
            &format!("1 {} ({:?}) against uom", unit.symbol, unit.dimension),
        );
    }
}

#[test]
fn temperature_offsets_agree_with_uom() {
    // uom 0.38: thermodynamic temperatures with their offsets.
    for v in [-40.0, 0.0, 20.0, 100.0, 250.0] {
        let c = q::ThermodynamicTemperature::new::<tt::degree_celsius>(v).value;
        let f = q::ThermodynamicTemperature::new::<tt::degree_fahrenheit>(v).value;
        close(
            si(v, "degC", Dimension::Temperature),
            c,
            1e-12,
            "degC against uom",
        );
        close(
            si(v, "degF", Dimension::Temperature),
            f,
            1e-12,
            "degF against uom",
        );
    }
}

#[test]
fn display_units_show_the_same_quantity() {
    // [C] 4 in shown in metric is 101.6 mm; 3000 psi in bar is 206.84 bar.
    let shown = quantity::show(
        4.0 * 0.0254,
        Dimension::Length,
        quantity::UnitSystem::Metric,
    );
    close(shown.value, 101.6, 1e-12, "4 in in mm");
    let shown = quantity::show(
        3000.0 * crate::PSI,
        Dimension::Pressure,
        quantity::UnitSystem::Metric,
    );
    close(shown.value, 206.842_718_795, 1e-9, "3000 psi in bar");
}
