//! The hose table (`calc::hose_table`) against REFERENCES.md "Hose maximum working pressure by
//! size" [M, medium confidence; editions differ]: every row of each column, its unit, and the
//! "from memory" mark. The expected values are typed here from that table, not from the code.

use loadhold::calc::hose_table::{self, FROM_MEMORY};

/// REFERENCES.md "Units": psi = 6894.757293168 Pa [C]; bar = 1e5 Pa exactly [S] ISO 80000-4.
const PSI_PA: f64 = 6894.757293168;
const BAR_PA: f64 = 1e5;

/// One column: (type, unit, [(dash, value)]).
type Column = (&'static str, &'static str, Vec<(u8, f64)>);

/// (type, unit, [(dash, value)]): REFERENCES.md's hose table, column by column ("-" left out).
fn references() -> Vec<Column> {
    let dashes = [4u8, 6, 8, 10, 12, 16, 20, 24, 32];
    let col = |values: [Option<f64>; 9]| -> Vec<(u8, f64)> {
        dashes
            .iter()
            .zip(values)
            .filter_map(|(d, v)| v.map(|v| (*d, v)))
            .collect()
    };
    let all = |v: [f64; 9]| col(v.map(Some));
    vec![
        (
            "SAE 100R1AT",
            "psi",
            all([2750., 2250., 2000., 1500., 1250., 1000., 625., 500., 375.]),
        ),
        (
            "EN 853 1SN",
            "bar",
            all([225., 180., 160., 130., 105., 88., 63., 50., 40.]),
        ),
        (
            "SAE 100R2AT",
            "psi",
            all([
                5000., 4000., 3500., 2750., 2250., 2000., 1625., 1250., 1125.,
            ]),
        ),
        (
            "EN 853 2SN",
            "bar",
            all([400., 330., 275., 250., 215., 165., 125., 90., 80.]),
        ),
        (
            "SAE 100R12",
            "psi",
            col([
                None,
                Some(4000.),
                Some(4000.),
                Some(4000.),
                Some(4000.),
                Some(4000.),
                Some(3000.),
                Some(2500.),
                Some(2500.),
            ]),
        ),
        (
            "SAE 100R13",
            "psi",
            col([
                None,
                None,
                None,
                None,
                Some(5000.),
                Some(5000.),
                Some(5000.),
                Some(5000.),
                Some(5000.),
            ]),
        ),
    ]
}

#[test]
fn every_row_matches_references_md_with_its_unit_and_mark() {
    let mut expected_rows = 0;
    for (spec, unit, column) in references() {
        let per_unit = if unit == "psi" { PSI_PA } else { BAR_PA };
        for (dash, value) in column {
            expected_rows += 1;
            let row = hose_table::lookup(spec, &format!("-{dash}"))
                .unwrap_or_else(|| panic!("{spec} -{dash} is in REFERENCES.md"));
            assert_eq!(row.spec, spec);
            assert_eq!(row.unit, unit, "{spec} is written in {unit} there");
            assert_eq!(row.value, value, "{spec} -{dash}");
            let pa = value * per_unit;
            assert!(
                (row.max_working_pressure_pa - pa).abs() <= 1e-9 * pa,
                "{spec} -{dash}: {} Pa, expected {pa} Pa",
                row.max_working_pressure_pa
            );
            assert_eq!(row.source, FROM_MEMORY, "REFERENCES.md marks the table [M]");
        }
    }
    assert_eq!(
        hose_table::all().len(),
        expected_rows,
        "the table holds REFERENCES.md's rows and nothing else"
    );
}

#[test]
fn sizes_the_reference_leaves_blank_and_types_it_lacks_have_no_value() {
    assert!(
        hose_table::lookup("SAE 100R12", "-4").is_none(),
        "'-' there"
    );
    assert!(
        hose_table::lookup("SAE 100R13", "-10").is_none(),
        "'-' there"
    );
    for spec in ["EN 856 4SP", "EN 856 4SH", "ISO 18752-DC", "SAE 100R1"] {
        assert!(
            hose_table::find_type(spec).is_none(),
            "{spec}: no value in REFERENCES.md, so none offered"
        );
    }
}

#[test]
fn the_edition_is_named_and_r2at_says_it_predates_2006() {
    // REFERENCES.md: the 100R2AT column is "pre-2006"; SAE J517 since 2006 gives "type S" values.
    let r2 = hose_table::lookup("SAE 100R2AT", "-8").expect("row");
    assert_eq!(r2.standard, "SAE J517");
    assert!(r2.edition.contains("2006"), "{}", r2.edition);
    for row in hose_table::all() {
        assert!(
            !row.edition.is_empty() && !row.standard.is_empty(),
            "{row:?}"
        );
    }
}

#[test]
fn laylines_and_sizes_are_read_in_the_usual_spellings() {
    // Dash size = sixteenths of an inch of bore; EN 853 names the same bores DN 6 .. 51
    // (common practice, from memory): -8 is DN12, -16 is DN25.
    for (spec, size) in [
        ("sae 100r2at", "8"),
        ("SAE J517 100R2AT", "#8"),
        ("100R2AT", "DN12"),
        ("R2AT", "dn 12"),
    ] {
        let row = hose_table::lookup(spec, size).unwrap_or_else(|| panic!("{spec} {size}"));
        assert_eq!((row.spec, row.dash, row.value), ("SAE 100R2AT", 8, 3500.0));
    }
    let row = hose_table::lookup("EN853-2SN", "DN25").expect("row");
    assert_eq!((row.dash, row.value), (16, 165.0));
    assert!(
        hose_table::parse_size("-5").is_none(),
        "not a size of the table"
    );
    assert!(hose_table::parse_size("half inch").is_none());
}
