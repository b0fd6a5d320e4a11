//! The reading layer of the fleet import (`server/import/`): encodings, delimiters, RFC 4180
//! quoting, headers with aliases and units, and quantity cells. Expected characters are those
//! of the Windows-1252 code page (WHATWG Encoding Standard, index-windows-1252; from memory)
//! and the quoting rules of RFC 4180 section 2.

use loadhold::calc::quantity::Dimension;
use loadhold::import::columns::{self, Kind};
use loadhold::import::decode::{self, Encoding};
use loadhold::import::table;

#[test]
fn windows_1252_bytes_read_as_their_characters() {
    // "Böschung Süd – 5 €": ö = 0xF6, ü = 0xFC (as in ISO 8859-1), en dash = 0x96, euro = 0x80.
    let bytes = b"name,units\nB\xF6schung S\xFCd \x96 5 \x80,metric\n";
    let t = table::read(bytes).expect("read");
    assert_eq!(t.encoding, Encoding::Windows1252);
    assert_eq!(t.rows[0].1[0], "Böschung Süd – 5 €");
    // The curly quotes 0x93 / 0x94 are U+201C / U+201D.
    assert_eq!(decode::windows_1252(b"\x93x\x94"), "\u{201C}x\u{201D}");
}

#[test]
fn utf8_with_a_bom_semicolons_and_tabs_are_detected() {
    let t = table::read("\u{FEFF}Unit number;Kind;Relief [bar]\nGR-7;grader;210\n".as_bytes())
        .expect("read");
    assert_eq!((t.encoding, t.delimiter), (Encoding::Utf8, b';'));
    assert_eq!(
        t.header[0], "Unit number",
        "the byte-order mark is not part of the name"
    );
    assert_eq!(t.rows[0].1, ["GR-7", "grader", "210"]);
    let t = table::read(b"unit\tkind\nX1\tloader\n").expect("read");
    assert_eq!(t.delimiter, b'\t');
    assert_eq!(t.rows[0].1, ["X1", "loader"]);
}

#[test]
fn rfc_4180_quoting_and_line_numbers() {
    // RFC 4180 2.6: fields with commas or line breaks are quoted; 2.7: a quote is doubled.
    let text = "unit,description\n\"A,1\",\"boom \"\"main\"\"\nleft side\"\n\nB2,plain\n";
    let t = table::read(text.as_bytes()).expect("read");
    assert_eq!(t.rows.len(), 2, "the blank line is no row");
    assert_eq!(t.rows[0].1, ["A,1", "boom \"main\"\nleft side"]);
    assert_eq!(t.rows[0].0, 2, "the first row starts on line 2");
    assert_eq!(
        t.rows[1].0, 5,
        "line numbers count the quoted line break and the blank line"
    );
    assert!(
        table::read(b"").is_err(),
        "an empty file is refused in words"
    );
}

#[test]
fn headers_match_by_alias_in_any_order_with_units() {
    assert_eq!(
        columns::split_header("Bore (in)"),
        ("bore".into(), Some("in".into()))
    );
    assert_eq!(
        columns::split_header("Relief [bar]"),
        ("relief".into(), Some("bar".into()))
    );
    assert_eq!(columns::split_header("Unit_No."), ("unit no".into(), None));
    let header: Vec<String> = [
        "Stroke [mm]",
        "Unit No.",
        "Bore (in)",
        "Colour",
        "Rod (furlong)",
    ]
    .map(String::from)
    .to_vec();
    assert_eq!(columns::guess_kind(&header), Some(Kind::Cylinders));
    let (cols, problems) = columns::match_header(Kind::Cylinders, &header);
    let fields: Vec<&str> = cols.iter().map(|c| c.field).collect();
    assert_eq!(fields, ["stroke", "machine", "bore"]);
    assert_eq!(problems.len(), 2, "{problems:?}");
    assert!(problems[0].1.contains("Colour") && problems[1].1.contains("furlong"));
    let hoses: Vec<String> = ["Unit", "Hose spec", "Size"].map(String::from).to_vec();
    assert_eq!(columns::guess_kind(&hoses), Some(Kind::Hoses));
    let machines: Vec<String> = ["Fleet number", "Type"].map(String::from).to_vec();
    assert_eq!(columns::guess_kind(&machines), Some(Kind::Machines));
}

#[test]
fn a_quantity_takes_its_own_unit_or_the_headers_and_never_none() {
    // 4 in = 0.1016 m (inch = 0.0254 m exactly, REFERENCES.md "Units"); 210 bar = 21 MPa.
    let bore = columns::quantity("4 in", Dimension::Length, None).expect("cell unit");
    assert!((bore - 0.1016).abs() < 1e-12);
    let relief = columns::quantity("210", Dimension::Pressure, Some("bar")).expect("header unit");
    assert!((relief - 21e6).abs() < 1e-6);
    let own = columns::quantity("3000 psi", Dimension::Pressure, Some("bar")).expect("own unit");
    assert!(
        (own - 3000.0 * 6894.757293168).abs() < 1e-3,
        "the cell's unit wins"
    );
    let bare = columns::quantity("4", Dimension::Length, None).expect_err("bare number");
    assert!(bare.contains("unit"), "{bare}");
    assert!(columns::quantity("four in", Dimension::Length, None).is_err());
}
