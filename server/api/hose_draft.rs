//! Reading a hose assembly from a JSON object over a base record; where it is fitted and its
//! dates are checked on the merged record.

use super::draft::{Problems, date, id, latest_past, positive, text, touched};
use super::input::Fields;
use crate::calc::quantity::Dimension;
use crate::db::hoses::HoseFields;
use crate::error::AppError;
use serde_json::{Map, Value};

/// Fields a hose body may carry (`units` picks the display units of the answer).
pub const FIELDS: &[&str] = &[
    "machine_id",
    "cylinder_id",
    "port",
    "circuit",
    "spec",
    "size",
    "inside_diameter",
    "length",
    "working_pressure",
    "made_in",
    "installed_on",
    "replace_by",
    "archived",
    "units",
];

pub const PORTS: &[&str] = &["cap", "rod"];

/// A hose being read: the machine may still be missing (it can come from the cylinder).
#[derive(Clone, Debug, Default, PartialEq)]
pub struct Draft {
    pub machine_id: Option<i64>,
    pub cylinder_id: Option<i64>,
    pub port: Option<String>,
    pub circuit: Option<String>,
    pub spec: Option<String>,
    pub size: Option<String>,
    pub inside_diameter_m: Option<f64>,
    pub length_m: Option<f64>,
    pub working_pressure_pa: Option<f64>,
    pub made_in: Option<String>,
    pub installed_on: Option<String>,
    pub replace_by: Option<String>,
}

impl From<HoseFields> for Draft {
    fn from(h: HoseFields) -> Self {
        Draft {
            machine_id: Some(h.machine_id),
            cylinder_id: h.cylinder_id,
            port: h.port,
            circuit: h.circuit,
            spec: h.spec,
            size: h.size,
            inside_diameter_m: h.inside_diameter_m,
            length_m: h.length_m,
            working_pressure_pa: h.working_pressure_pa,
            made_in: h.made_in,
            installed_on: h.installed_on,
            replace_by: h.replace_by,
        }
    }
}

/// Reads a manufacture quarter written `YYYY-Qn` (`2024-Q2`); returns the year and quarter.
pub fn parse_quarter(text: &str) -> Option<(i32, u8)> {
    let (year, quarter) = text.trim().split_once('-')?;
    let year: i32 = year.parse().ok().filter(|y| (1950..=2200).contains(y))?;
    let quarter = quarter.strip_prefix(['Q', 'q'])?;
    let quarter: u8 = quarter.parse().ok().filter(|q| (1..=4).contains(q))?;
    (year.to_string().len() == 4).then_some((year, quarter))
}

/// Reads a hose over `base` (the stored hose, or a draft with only the machine for a new one).
/// Returns the merged draft and the `archived` flag, or every problem. The caller fills a
/// missing `machine_id` from the cylinder, then calls [`finish`].
pub fn read(map: &Map<String, Value>, base: Draft) -> Result<(Draft, Option<bool>), Vec<AppError>> {
    let f = Fields::new(map);
    let mut p = Problems::default();
    let mut h = base;
    p.take(f.deny_unknown(FIELDS));
    for (name, slot) in [
        ("machine_id", &mut h.machine_id),
        ("cylinder_id", &mut h.cylinder_id),
    ] {
        if touched(map, name)
            && let Some(v) = p.take(id(&f, name))
        {
            *slot = v;
        }
    }
    if touched(map, "port")
        && let Some(v) = p.take(f.opt_choice("port", PORTS))
    {
        h.port = v.map(str::to_string);
    }
    for (name, max, slot) in [
        ("circuit", 120, &mut h.circuit),
        ("spec", 80, &mut h.spec),
        ("size", 20, &mut h.size),
    ] {
        if touched(map, name)
            && let Some(v) = p.take(text(&f, name, max))
        {
            *slot = v;
        }
    }
    for (name, dimension, slot) in [
        (
            "inside_diameter",
            Dimension::Length,
            &mut h.inside_diameter_m,
        ),
        ("length", Dimension::Length, &mut h.length_m),
        (
            "working_pressure",
            Dimension::Pressure,
            &mut h.working_pressure_pa,
        ),
    ] {
        if touched(map, name)
            && let Some(v) = p.take(positive(&f, name, dimension))
        {
            *slot = v;
        }
    }
    if touched(map, "made_in")
        && let Some(v) = p.take(text(&f, "made_in", 10))
    {
        match v {
            None => h.made_in = None,
            Some(text) => match parse_quarter(&text) {
                Some((year, quarter)) => h.made_in = Some(format!("{year}-Q{quarter}")),
                None => p.push(AppError::field(
                    "made_in",
                    "invalid_quarter",
                    "write the manufacture quarter as on the layline, e.g. 2024-Q2",
                )),
            },
        }
    }
    if touched(map, "installed_on")
        && let Some(v) = p.take(date(&f, "installed_on", Some(latest_past())))
    {
        h.installed_on = v;
    }
    if touched(map, "replace_by")
        && let Some(v) = p.take(date(&f, "replace_by", None))
    {
        h.replace_by = v;
    }
    let archived = p.take(f.opt_bool("archived")).flatten();
    p.finish((h, archived))
}

/// Checks the merged hose: a machine; a cylinder with its port, or a circuit's name; dates in
/// order (made, installed, replace by).
pub fn finish(h: Draft) -> Result<HoseFields, Vec<AppError>> {
    let mut p = Problems::default();
    match (h.cylinder_id, &h.port, &h.circuit) {
        (Some(_), None, _) => p.push(AppError::field(
            "port",
            "required",
            "say which cylinder port the hose feeds: cap or rod",
        )),
        (None, Some(_), _) => p.push(AppError::field(
            "cylinder_id",
            "required",
            "a port belongs to a cylinder: give cylinder_id, or leave port empty and name the circuit",
        )),
        (None, None, None) => p.push(AppError::field(
            "circuit",
            "required",
            "give cylinder_id and port, or name the circuit the hose is on",
        )),
        _ => {}
    }
    if let (Some(made), Some(installed)) = (&h.made_in, &h.installed_on)
        && let Some((year, quarter)) = parse_quarter(made)
    {
        let quarter_start = format!("{year}-{:02}-01", (quarter - 1) * 3 + 1);
        if installed.as_str() < quarter_start.as_str() {
            p.push(AppError::field(
                "installed_on",
                "before_manufacture",
                format!("the hose was made in {made}; it cannot be installed before that"),
            ));
        }
    }
    if let (Some(installed), Some(replace)) = (&h.installed_on, &h.replace_by)
        && replace < installed
    {
        p.push(AppError::field(
            "replace_by",
            "before_install",
            "the replace-by date must not be before the install date",
        ));
    }
    let Some(machine_id) = h.machine_id else {
        p.push(AppError::field(
            "machine_id",
            "required",
            "the machine the hose is on (machine_id), or a cylinder_id",
        ));
        return Err(p.0);
    };
    p.finish(HoseFields {
        machine_id,
        cylinder_id: h.cylinder_id,
        port: h.port,
        circuit: h.circuit,
        spec: h.spec,
        size: h.size,
        inside_diameter_m: h.inside_diameter_m,
        length_m: h.length_m,
        working_pressure_pa: h.working_pressure_pa,
        made_in: h.made_in,
        installed_on: h.installed_on,
        replace_by: h.replace_by,
    })
}
