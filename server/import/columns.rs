//! The columns of an import file: each header names a field (by any of its aliases, in any
//! order) and may carry the unit of its column ("Bore (in)", "Relief [bar]"). A quantity cell
//! carries its own unit ("4 in") or takes the header's; a bare number with neither is refused,
//! as everywhere in the API.

use crate::calc::quantity::{self, Dimension};

/// The kinds of record a file can hold.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Kind {
    Sites,
    Machines,
    Cylinders,
    Hoses,
}

impl Kind {
    pub fn parse(text: &str) -> Option<Kind> {
        match normal(text).as_str() {
            "site" | "sites" => Some(Kind::Sites),
            "machine" | "machines" => Some(Kind::Machines),
            "cylinder" | "cylinders" => Some(Kind::Cylinders),
            "hose" | "hoses" | "hose assemblies" => Some(Kind::Hoses),
            _ => None,
        }
    }

    pub fn name(self) -> &'static str {
        match self {
            Kind::Sites => "sites",
            Kind::Machines => "machines",
            Kind::Cylinders => "cylinders",
            Kind::Hoses => "hoses",
        }
    }
}

/// What a column holds.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Value {
    Text,
    Quantity(Dimension),
}

/// A field of a kind: its API name, the header spellings taken for it, what it holds.
pub struct Field {
    pub name: &'static str,
    pub aliases: &'static [&'static str],
    pub value: Value,
}

const fn text(name: &'static str, aliases: &'static [&'static str]) -> Field {
    Field {
        name,
        aliases,
        value: Value::Text,
    }
}

const fn qty(name: &'static str, d: Dimension, aliases: &'static [&'static str]) -> Field {
    Field {
        name,
        aliases,
        value: Value::Quantity(d),
    }
}

use Dimension::{Force, Length, Pressure, Time};

pub const SITE: &[Field] = &[
    text("name", &["name", "site", "site name", "yard", "depot"]),
    text("units", &["units", "unit system"]),
];

pub const MACHINE: &[Field] = &[
    text(
        "unit_number",
        &["unit number", "unit no", "unit", "fleet number", "fleet no"],
    ),
    text("site", &["site", "site name", "yard", "depot"]),
    text("kind", &["kind", "machine kind", "machine type", "type"]),
    text("description", &["description", "model"]),
    text("serial", &["serial", "serial number", "serial no"]),
    qty(
        "relief_pressure",
        Pressure,
        &["relief pressure", "relief", "relief setting"],
    ),
    qty("hour_meter", Time, &["hour meter", "hours", "meter"]),
];

pub const CYLINDER: &[Field] = &[
    text("machine", &["unit number", "unit no", "unit", "machine"]),
    text("function", &["function", "position", "cylinder"]),
    text("serial", &["serial", "serial number", "serial no"]),
    qty("bore", Length, &["bore", "bore diameter"]),
    qty("rod", Length, &["rod", "rod diameter"]),
    qty("stroke", Length, &["stroke"]),
    text("load_direction", &["load direction", "load"]),
    qty(
        "max_load",
        Force,
        &["highest load", "max load", "maximum load"],
    ),
    qty(
        "min_load",
        Force,
        &["lowest load", "min load", "minimum load"],
    ),
    qty("rated_pressure", Pressure, &["rated pressure", "rating"]),
    qty(
        "tube_outside_diameter",
        Length,
        &["tube outside diameter", "tube od", "barrel od"],
    ),
];

pub const HOSE: &[Field] = &[
    text("machine", &["unit number", "unit no", "unit", "machine"]),
    text("spec", &["hose spec", "spec", "hose type", "type"]),
    text("size", &["size", "dash size", "hose size"]),
    text("place", &["place", "circuit", "location"]),
    text("port", &["port"]),
    qty("length", Length, &["length", "hose length"]),
    qty(
        "working_pressure",
        Pressure,
        &["working pressure", "max working pressure", "mwp"],
    ),
    text("installed_on", &["installed on", "installed", "fitted on"]),
    text("replace_by", &["replace by", "replace"]),
];

pub fn fields(kind: Kind) -> &'static [Field] {
    match kind {
        Kind::Sites => SITE,
        Kind::Machines => MACHINE,
        Kind::Cylinders => CYLINDER,
        Kind::Hoses => HOSE,
    }
}

/// Lower case, every run of other characters than letters and digits one space, trimmed:
/// "Unit_No." and "unit no" read alike.
pub fn normal(text: &str) -> String {
    text.split(|c: char| !c.is_alphanumeric())
        .filter(|w| !w.is_empty())
        .map(str::to_lowercase)
        .collect::<Vec<_>>()
        .join(" ")
}

/// A header split into its name and the unit in brackets after it, if any:
/// "Bore (in)" -> ("bore", Some("in")), "Relief [bar]" -> ("relief", Some("bar")).
pub fn split_header(header: &str) -> (String, Option<String>) {
    let h = header.trim();
    for (open, close) in [('(', ')'), ('[', ']')] {
        if let Some(body) = h.strip_suffix(close)
            && let Some(at) = body.rfind(open)
        {
            let unit = body[at + 1..].trim();
            if !unit.is_empty() {
                return (normal(&body[..at]), Some(unit.to_string()));
            }
        }
    }
    (normal(h), None)
}

/// The kind a header line names, by the columns only one kind has: bore (cylinders), hose spec
/// or size (hoses), unit number (machines), else a name (sites).
pub fn guess_kind(header: &[String]) -> Option<Kind> {
    let names: Vec<String> = header.iter().map(|h| split_header(h).0).collect();
    let has = |field: &Field| field.aliases.iter().any(|a| names.iter().any(|n| n == a));
    if has(&CYLINDER[3]) {
        Some(Kind::Cylinders)
    } else if has(&HOSE[1]) && has(&HOSE[2]) {
        Some(Kind::Hoses)
    } else if has(&MACHINE[0]) {
        Some(Kind::Machines)
    } else if has(&SITE[0]) {
        Some(Kind::Sites)
    } else {
        None
    }
}

/// A column of the file matched to a field.
#[derive(Clone, Debug, PartialEq)]
pub struct Column {
    pub index: usize,
    pub field: &'static str,
    pub value: Value,
    pub unit: Option<String>,
}

/// Matches a header line to the fields of `kind`. Returns the columns and, in words, every
/// header it cannot place (unknown, given twice, or with a unit that is not one of its
/// dimension's units).
pub fn match_header(kind: Kind, header: &[String]) -> (Vec<Column>, Vec<(usize, String)>) {
    let mut columns: Vec<Column> = Vec::new();
    let mut problems = Vec::new();
    for (index, h) in header.iter().enumerate() {
        let (name, unit) = split_header(h);
        let Some(field) = fields(kind)
            .iter()
            .find(|f| f.aliases.contains(&name.as_str()))
        else {
            problems.push((
                index,
                format!("the column \"{h}\" is not a field of {}", kind.name()),
            ));
            continue;
        };
        if columns.iter().any(|c| c.field == field.name) {
            problems.push((
                index,
                format!("the column \"{h}\" gives {} a second time", field.name),
            ));
            continue;
        }
        if let (Value::Quantity(d), Some(u)) = (field.value, &unit)
            && let Err(e) = quantity::to_si(1.0, u, d)
        {
            problems.push((index, format!("the unit in the header \"{h}\": {e}")));
            continue;
        }
        columns.push(Column {
            index,
            field: field.name,
            value: field.value,
            unit,
        });
    }
    (columns, problems)
}

/// A quantity cell in SI: its own unit, else the column's; a bare number with no unit
/// anywhere is refused in the API's words.
pub fn quantity(
    cell: &str,
    dimension: Dimension,
    header_unit: Option<&str>,
) -> Result<f64, String> {
    let cell = cell.trim();
    let bare = cell.parse::<f64>().ok();
    match (bare, header_unit) {
        (Some(v), Some(unit)) => quantity::to_si(v, unit, dimension).map_err(|e| e.to_string()),
        _ => quantity::parse_str(cell, dimension).map_err(|e| e.to_string()),
    }
}
