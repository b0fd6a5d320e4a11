//! Importing a fleet from the shop's spreadsheets (issue 19). This part reads: the bytes of a
//! CSV file as text (`decode`), its rows (`table`) and the columns a kind of record takes by
//! header name with aliases and units (`columns`). `registry` checks and stores sites and machines (cylinders and hoses are not built yet);
//! `report` says what was found and done; `run` reads files given together, sites first.

pub mod columns;
pub mod decode;
pub mod registry;
pub mod report;
pub mod table;

use crate::db::Db;
use columns::Kind;
use registry::Options;
use report::Report;
use std::path::PathBuf;

/// The audit actor of imports from the command line.
pub const CLI_ACTOR: &str = "import (command line)";

/// `loadhold import`: reads each file, takes its kind from `--kind` or its headers, and
/// imports sites files before machines files. Prints each report; an error when any file
/// had problems (and so, without `--skip-bad-rows`, stored nothing).
pub async fn run_cli(
    db: &Db,
    files: &[PathBuf],
    kind: Option<&str>,
    options: Options,
) -> Result<(), String> {
    let given = match kind {
        Some(k) => Some(Kind::parse(k).ok_or_else(|| {
            format!("--kind \"{k}\" is not one of: sites, machines (cylinders and hoses are not importable yet)")
        })?),
        None => None,
    };
    let mut read = Vec::new();
    for path in files {
        let bytes =
            std::fs::read(path).map_err(|e| format!("cannot read {}: {e}", path.display()))?;
        let name = path.display().to_string();
        let t = table::read(&bytes).map_err(|e| format!("{name}: {e}"))?;
        let kind = given
            .or_else(|| columns::guess_kind(&t.header))
            .ok_or_else(|| format!("{name}: the headers name no kind of record; give --kind"))?;
        if matches!(kind, Kind::Cylinders | Kind::Hoses) {
            return Err(format!(
                "{name}: importing {} is not built yet",
                kind.name()
            ));
        }
        read.push((name, t, kind));
    }
    read.sort_by_key(|(_, _, k)| *k as u8);
    let mut bad = false;
    let mut pending = registry::Pending::new();
    for (name, t, kind) in &read {
        let report: Report =
            registry::import(db, CLI_ACTOR, name, t, *kind, options, &pending).await?;
        if *kind == Kind::Sites {
            pending.extend(report.created.iter().cloned());
        }
        print!("{report}");
        bad |= !report.problems.is_empty();
    }
    if bad {
        Err("some rows have problems (listed above)".into())
    } else {
        Ok(())
    }
}
