//! Importing sites and machines: each row checked into the fields the API writes, matched to
//! the stored record (a site by name, a machine by unit number), then stored in one
//! transaction through the db write helpers (each change with its audit row).

use super::columns::{self, Column, Kind};
use super::report::{Problem, Report};
use super::table::Table;
use crate::calc::quantity::Dimension;
use crate::db::machines::{self, MachineFields};
use crate::db::sites::{self, SiteFields};
use crate::db::{self, Db, import_lookup};
use std::collections::HashMap;

/// How to import.
#[derive(Clone, Copy, Debug, Default)]
pub struct Options {
    pub dry_run: bool,
    /// Store the good rows and report the rest (default: nothing stored if any row is bad).
    pub skip_bad_rows: bool,
}

/// Site names a dry run of an earlier file given together would create: machines may name them.
pub type Pending = std::collections::HashSet<String>;

enum Row {
    Site(SiteFields),
    Machine(Box<MachineFields>),
}

struct Checked {
    label: String,
    /// The stored record's id when the row matches one, and whether it changes it.
    matched: Option<(i64, bool)>,
    row: Row,
}

/// Checks `table` as `kind` against the stored registry and stores it unless told not to.
pub async fn import(
    db: &Db,
    actor: &str,
    file: &str,
    table: &Table,
    kind: Kind,
    options: Options,
    pending: &Pending,
) -> Result<Report, String> {
    let mut report = Report {
        file: file.to_string(),
        kind: kind.name().to_string(),
        encoding: table.encoding.name().to_string(),
        ..Report::default()
    };
    let (cols, header_problems) = columns::match_header(kind, &table.header);
    for (index, message) in header_problems {
        report
            .problems
            .push(problem(file, 1, &table.header[index], message));
    }
    let sites: HashMap<String, i64> = map(import_lookup::site_ids(db).await)?;
    let units: HashMap<String, i64> = map(import_lookup::machine_ids(db).await)?;
    let mut seen: HashMap<String, u64> = HashMap::new();
    let mut good = Vec::new();
    for (line, cells) in &table.rows {
        let mut cell_problems = Vec::new();
        let get = |field: &str| -> Option<(String, &Column)> {
            let c = cols.iter().find(|c| c.field == field)?;
            let text = cells.get(c.index).cloned().unwrap_or_default();
            (!text.is_empty()).then_some((text, c))
        };
        let quantity = |field: &str, d: Dimension, problems: &mut Vec<Problem>| -> Option<f64> {
            let (text, c) = get(field)?;
            match columns::quantity(&text, d, c.unit.as_deref()) {
                Ok(v) => Some(v),
                Err(e) => {
                    problems.push(problem(file, *line, &table.header[c.index], e));
                    None
                }
            }
        };
        let key_field = if kind == Kind::Sites {
            "name"
        } else {
            "unit_number"
        };
        let Some((key, key_col)) = get(key_field) else {
            let what = if kind == Kind::Sites {
                "a site name"
            } else {
                "a unit number"
            };
            report
                .problems
                .push(problem(file, *line, "", format!("the row has no {what}")));
            continue;
        };
        if let Some(first) = seen.insert(key.clone(), *line) {
            cell_problems.push(problem(
                file,
                *line,
                &table.header[key_col.index],
                format!("\"{key}\" is given twice in this file (first on line {first})"),
            ));
        }
        let row = match kind {
            Kind::Sites => {
                let units = get("units").map(|(t, _)| t.to_lowercase());
                if let Some(u) = units.as_deref().filter(|u| *u != "us" && *u != "metric") {
                    cell_problems.push(problem(
                        file,
                        *line,
                        "units",
                        format!("\"{u}\" is not us or metric"),
                    ));
                }
                Row::Site(SiteFields {
                    name: key.clone(),
                    units: units.unwrap_or_default(),
                    trapped_oil_warming_k: None,
                })
            }
            _ => {
                let mut f = MachineFields {
                    unit_number: key.clone(),
                    ..MachineFields::default()
                };
                match get("kind") {
                    Some((k, _)) => f.kind = k,
                    None => cell_problems.push(problem(
                        file,
                        *line,
                        "kind",
                        "the machine's kind is missing".to_string(),
                    )),
                }
                if let Some((name, c)) = get("site") {
                    match sites.get(&name) {
                        Some(id) => f.site_id = Some(*id),
                        None if options.dry_run && pending.contains(&name) => {}
                        None => cell_problems.push(problem(
                            file,
                            *line,
                            &table.header[c.index],
                            format!("there is no site \"{name}\" (add it, or import a sites file with it)"),
                        )),
                    }
                }
                f.description = get("description").map(|(t, _)| t);
                f.serial = get("serial").map(|(t, _)| t);
                f.relief_pressure_pa =
                    quantity("relief_pressure", Dimension::Pressure, &mut cell_problems);
                f.hour_meter_h =
                    quantity("hour_meter", Dimension::Time, &mut cell_problems).map(|s| s / 3600.0);
                Row::Machine(Box::new(f))
            }
        };
        if !cell_problems.is_empty() {
            report.problems.extend(cell_problems);
            continue;
        }
        let stored = if kind == Kind::Sites {
            sites_get(&sites, &key)
        } else {
            units.get(&key).copied()
        };
        let matched = match (stored, &row) {
            (None, _) => None,
            (Some(id), Row::Site(f)) => {
                let before = sites::find(db, id).await.map_err(|e| e.to_string())?;
                Some((
                    id,
                    before.is_none_or(|b| site_merge(b.fields(), f) != b.fields()),
                ))
            }
            (Some(id), Row::Machine(f)) => {
                let before = machines::find(db, id).await.map_err(|e| e.to_string())?;
                let merged = before.map(|b| merge(b.fields(), f));
                Some((id, merged.is_none_or(|(changed, _)| changed)))
            }
        };
        good.push(Checked {
            label: key,
            matched,
            row,
        });
    }
    for c in &good {
        match c.matched {
            None => report.created.push(c.label.clone()),
            Some((_, true)) => report.updated.push(c.label.clone()),
            Some((_, false)) => report.unchanged += 1,
        }
    }
    let refused = !report.problems.is_empty() && !options.skip_bad_rows;
    if options.dry_run || refused {
        return Ok(report);
    }
    store(db, actor, &good).await?;
    report.stored = true;
    Ok(report)
}

/// The stored machine with the file's columns over it: (changed, merged). Only the columns
/// the file fills change the record; the status and intervals stay as stored.
fn merge(before: MachineFields, file: &MachineFields) -> (bool, MachineFields) {
    let mut m = before.clone();
    m.kind = file.kind.clone();
    m.site_id = file.site_id.or(m.site_id);
    m.description = file.description.clone().or(m.description);
    m.serial = file.serial.clone().or(m.serial);
    m.relief_pressure_pa = file.relief_pressure_pa.or(m.relief_pressure_pa);
    m.hour_meter_h = file.hour_meter_h.or(m.hour_meter_h);
    (m != before, m)
}

/// The stored site with the file's units over it (an empty units cell keeps the stored ones).
fn site_merge(before: SiteFields, file: &SiteFields) -> SiteFields {
    let mut s = before;
    if !file.units.is_empty() {
        s.units = file.units.clone();
    }
    s
}

async fn store(db: &Db, actor: &str, rows: &[Checked]) -> Result<(), String> {
    let at = db::now_rfc3339();
    let (_write, mut tx) = db::begin_write(db).await.map_err(|e| e.to_string())?;
    for c in rows {
        let done = match (&c.row, c.matched) {
            (_, Some((_, false))) => Ok(()),
            (Row::Site(f), None) => {
                let new = site_merge(
                    SiteFields {
                        name: f.name.clone(),
                        units: "metric".into(),
                        trapped_oil_warming_k: None,
                    },
                    f,
                );
                sites::insert(&mut tx, actor, &at, &new).await.map(drop)
            }
            (Row::Site(f), Some((id, true))) => {
                let before = sites::get(&mut tx, id).await.map_err(|e| e.to_string())?;
                let merged = before.map_or(f.clone(), |b| site_merge(b.fields(), f));
                sites::update(&mut tx, actor, id, &merged, None)
                    .await
                    .map(drop)
            }
            (Row::Machine(f), None) => machines::insert(&mut tx, actor, &at, f).await.map(drop),
            (Row::Machine(f), Some((id, true))) => {
                let before = machines::get(&mut tx, id)
                    .await
                    .map_err(|e| e.to_string())?;
                let merged = before.map_or((**f).clone(), |b| merge(b.fields(), f).1);
                machines::update(&mut tx, actor, id, &merged, None)
                    .await
                    .map(drop)
            }
        };
        done.map_err(|e| format!("{}: {e}; nothing was stored", c.label))?;
    }
    tx.commit().await.map_err(|e| e.to_string())
}

fn sites_get(sites: &HashMap<String, i64>, name: &str) -> Option<i64> {
    sites.get(name).copied()
}

fn map(rows: Result<Vec<(String, i64)>, sqlx::Error>) -> Result<HashMap<String, i64>, String> {
    rows.map(|r| r.into_iter().collect())
        .map_err(|e| format!("cannot read the registry: {e}"))
}

fn problem(file: &str, line: u64, column: &str, message: String) -> Problem {
    Problem {
        file: file.to_string(),
        line,
        column: column.to_string(),
        message,
    }
}
