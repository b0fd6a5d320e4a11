//! What people type for a quantity (`calc::quantity::parse_str`, rules in `calc::spelling`):
//! decimal commas, digit grouping, unit spellings. Expected values come from the definitions
//! in REFERENCES.md "Units" (NIST SP 811, NIST Handbook 44, ISO 80000-4), worked by hand here.

use crate::close;
use loadhold::calc::quantity::{Dimension as D, parse_str};

fn read(text: &str, dimension: D) -> f64 {
    parse_str(text, dimension).unwrap_or_else(|e| panic!("{text:?} refused: {e}"))
}

fn refused(text: &str, dimension: D) -> String {
    match parse_str(text, dimension) {
        Ok(v) => panic!("{text:?} read as {v}, expected a refusal"),
        Err(e) => e.message,
    }
}

#[test]
fn a_decimal_comma_is_read_where_nothing_else_fits() {
    // 101.6 mm = 0.1016 m (1 mm = 1e-3 m, SI prefix).
    close(read("101,6 mm", D::Length), 0.1016, 1e-12, "101,6 mm");
    // 4 in = 4 x 0.0254 m = 0.1016 m (NIST SP 811).
    close(read("4,0 in", D::Length), 0.1016, 1e-12, "4,0 in");
    // A leading zero cannot start a thousands group: 0,450 bar = 0.45 x 1e5 Pa = 45 000 Pa.
    close(read("0,450 bar", D::Pressure), 45_000.0, 1e-12, "0,450 bar");
    // Two decimals cannot be a thousands group: 2,45 bar = 245 000 Pa.
    close(read("2,45 bar", D::Pressure), 245_000.0, 1e-12, "2,45 bar");
}

#[test]
fn a_comma_before_three_digits_is_refused_naming_both_readings() {
    let message = refused("2,450 bar", D::Pressure);
    assert!(message.contains("2450"), "{message}");
    assert!(message.contains("2.45"), "{message}");
    let message = refused("-1,500 mm", D::Length);
    assert!(
        message.contains("-1500") && message.contains("-1.500"),
        "{message}"
    );
}

#[test]
fn digit_grouping_is_read_when_every_group_has_three_digits() {
    // 3,000 psi alone is ambiguous; 1,234,567 Pa can only be grouping.
    close(
        read("1,234,567 Pa", D::Pressure),
        1_234_567.0,
        1e-15,
        "commas",
    );
    close(
        read("1.234.567 Pa", D::Pressure),
        1_234_567.0,
        1e-15,
        "points",
    );
    // 10 000 lbf = 10 000 x 4.4482216152605 N = 44 482.216152605 N (NIST SP 811).
    close(
        read("10 000 lbf", D::Force),
        44_482.216_152_605,
        1e-12,
        "space",
    );
    close(
        read("10\u{202f}000 lbf", D::Force),
        44_482.216_152_605,
        1e-12,
        "narrow space",
    );
    // Both marks: the last is the decimal mark. 1,234.5 bar = 123 450 000 Pa.
    close(read("1,234.5 bar", D::Pressure), 1.2345e8, 1e-12, "1,234.5");
    close(read("1.234,5 bar", D::Pressure), 1.2345e8, 1e-12, "1.234,5");
    // Groups that are not threes are no number at all.
    refused("1,23,4 bar", D::Pressure);
    refused("1.2.3 bar", D::Pressure);
    refused("1,234,5.6 bar", D::Pressure);
}

#[test]
fn pound_spellings_in_a_force_field_are_pound_force() {
    // 1 lbf = 0.45359237 kg x 9.80665 m/s² = 4.4482216152605 N (NIST SP 811).
    for text in ["1 lb", "1 lbs", "1 LBS", "1lbf"] {
        close(read(text, D::Force), 4.448_221_615_260_5, 1e-12, text);
    }
    // A pound is not a length or a pressure.
    refused("1 lb", D::Length);
}

#[test]
fn a_tonne_in_a_force_field_is_its_weight_under_standard_gravity() {
    // 10 t: 10 x 1000 kg x 9.80665 m/s² = 98 066.5 N (standard gravity, NIST SP 811 B.8).
    close(read("10 t", D::Force), 98_066.5, 1e-12, "10 t");
    close(read("10 tonne", D::Force), 98_066.5, 1e-12, "10 tonne");
    // 500 kg: 500 x 9.80665 = 4 903.325 N.
    close(read("500 kg", D::Force), 4_903.325, 1e-12, "500 kg");
    // "ton" has three meanings (1000 kg, 2000 lb, 2240 lb): refused, saying what to type.
    let message = refused("5 ton", D::Force);
    assert!(message.contains("write t"), "{message}");
    // A tonne is no pressure.
    refused("10 t", D::Pressure);
}

#[test]
fn inch_spellings_are_the_inch() {
    // 2 in = 0.0508 m exactly (NIST SP 811).
    for text in ["2 inch", "2 inches", "2″", "2\"", "2 IN"] {
        close(read(text, D::Length), 0.0508, 1e-12, text);
    }
    // 3 ft = 36 in = 0.9144 m.
    close(read("3 feet", D::Length), 0.9144, 1e-12, "3 feet");
}

#[test]
fn temperature_and_flow_spellings() {
    // degC: T/K = t/°C + 273.15; degF: t/°C = (t/°F - 32) x 5/9 (NIST SP 811).
    close(read("60 °C", D::Temperature), 333.15, 1e-12, "60 °C");
    close(read("60 ºC", D::Temperature), 333.15, 1e-12, "60 ºC");
    close(read("140 °F", D::Temperature), 333.15, 1e-12, "140 °F");
    close(
        read("18 °F", D::TemperatureChange),
        10.0,
        1e-12,
        "18 °F change",
    );
    // 60 L/min = 60 x 1e-3 m³ / 60 s = 1e-3 m³/s.
    for text in ["60 L/min", "60 l/min", "60 lpm", "60 LPM"] {
        close(read(text, D::Flow), 1e-3, 1e-12, text);
    }
    // 1 gpm = 231 in³/min = 3.785411784e-3 m³ / 60 s (NIST Handbook 44).
    for text in ["1 gpm", "1 GPM", "1 gal/min"] {
        close(read(text, D::Flow), 3.785_411_784e-3 / 60.0, 1e-12, text);
    }
    // 45 kN = 45 000 N.
    close(read("45 KN", D::Force), 45_000.0, 1e-12, "45 KN");
}

#[test]
fn case_is_not_forgiven_where_it_changes_the_unit() {
    // mPa (millipascal) against MPa (megapascal): a factor of 1e9; refused, not guessed.
    let message = refused("20 mpa", D::Pressure);
    assert!(message.contains("MPa"), "{message}");
    close(read("20 MPa", D::Pressure), 2e7, 1e-15, "20 MPa");
}

#[test]
fn messages_say_what_to_type() {
    let message = refused("2,4,5", D::Pressure);
    assert!(message.contains("type"), "{message}");
    let message = refused("300", D::Pressure);
    assert!(message.contains("unit is required"), "{message}");
}
