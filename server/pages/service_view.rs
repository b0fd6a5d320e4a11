//! The service status of a machine or a cylinder as pages show it: its status in words, the
//! open restrictions, what it waits for before a manager may return it, and its status
//! history (who, when, why, which record). Figures and rules come from `db::status` and
//! `db::service_return`.

use crate::db::Db;
use crate::db::service_return::{self, Standing};
use crate::db::status::{self, StatusChange};
use crate::pages::shop::words::when;

/// One line of the status history.
#[derive(Clone, Debug)]
pub struct HistoryLine {
    pub at: String,
    pub by: String,
    /// `in_service`, `restricted` or `out_of_service` after the change.
    pub status: String,
    pub status_words: &'static str,
    pub reason: String,
    pub record: String,
    /// Where the record can be read, if it has a page.
    pub record_link: String,
    pub restrictions: Vec<String>,
    pub note: String,
}

/// An open cause and what it waits for.
#[derive(Clone, Debug)]
pub struct CauseLine {
    /// How many earlier open records of the same cylinder (or machine) say the same.
    pub earlier: usize,
    pub reason: String,
    pub record: String,
    pub record_link: String,
    /// `Cleared by a passing drift test #14 signed by R. Okafor`, or what is still needed.
    pub retest: String,
    pub retested: bool,
}

/// The status panel of a machine or a cylinder.
#[derive(Clone, Debug, Default)]
pub struct ServicePanel {
    pub status: String,
    pub status_words: &'static str,
    pub restrictions: Vec<String>,
    pub causes: Vec<CauseLine>,
    /// True when every open cause has a passing retest: a manager may approve the return.
    pub eligible: bool,
    pub history: Vec<HistoryLine>,
}

fn link(kind: &str, id: Option<i64>) -> String {
    match (kind, id) {
        ("drift_test", Some(id)) => format!("/shop/drift-tests/{id}"),
        ("decay_test", Some(id)) => format!("/shop/decay-tests/{id}"),
        ("inspection", Some(id)) => format!("/shop/inspections/{id}"),
        _ => String::new(),
    }
}

fn record_words(kind: &str, id: Option<i64>) -> String {
    let name = match kind {
        "return_to_service" => "return to service",
        other => other,
    };
    match id {
        Some(id) if kind == "return_to_service" => format!("{name} (retest #{id})"),
        Some(id) => format!("{} #{id}", name.replace('_', " ")),
        None => name.replace('_', " "),
    }
}

fn history_line(c: &StatusChange, of_cylinder: bool) -> HistoryLine {
    let shown = if of_cylinder {
        c.cylinder_status
            .clone()
            .unwrap_or(c.machine_status.clone())
    } else {
        c.machine_status.clone()
    };
    let linked = if c.record_kind == "return_to_service" {
        String::new()
    } else {
        link(&c.record_kind, c.record_id)
    };
    HistoryLine {
        at: when(&c.at),
        by: c.actor.clone(),
        status_words: status::words(&shown),
        status: shown,
        reason: c.reason.clone(),
        record: record_words(&c.record_kind, c.record_id),
        record_link: linked,
        restrictions: c.restrictions(),
        note: c.note.clone().unwrap_or_default(),
    }
}

fn panel(standing: Standing, rows: &[StatusChange], of_cylinder: bool) -> ServicePanel {
    // The latest cause of each cylinder (or of the machine itself), with how many earlier
    // records say the same; each needs its own retest all the same (`db::service_return`).
    let mut latest: Vec<(&service_return::Cause, usize)> = Vec::new();
    for c in standing.causes.iter().rev() {
        match latest
            .iter_mut()
            .find(|(l, _)| l.change.cylinder_id == c.change.cylinder_id)
        {
            Some((_, earlier)) => *earlier += 1,
            None => latest.push((c, 0)),
        }
    }
    let causes = latest
        .iter()
        .map(|(c, earlier)| CauseLine {
            earlier: *earlier,
            reason: c.change.reason.clone(),
            record: record_words(&c.change.record_kind, c.change.record_id),
            record_link: link(&c.change.record_kind, c.change.record_id),
            retested: c.retest.is_some(),
            retest: match (&c.retest, c.change.cylinder_id) {
                (Some(r), _) => format!(
                    "passing {} signed by {}: a manager who did not sign it may return the machine",
                    r.words(),
                    r.created_by
                ),
                (None, Some(_)) => "waits for a passing drift or pressure-decay test of this cylinder (a correction of the record does not count)".into(),
                (None, None) => "waits for a new passing inspection (a correction of the record does not count)".into(),
            },
        })
        .collect();
    ServicePanel {
        status_words: status::words(&standing.status),
        eligible: standing.eligible(),
        status: standing.status,
        restrictions: standing.restrictions,
        causes,
        history: rows.iter().map(|r| history_line(r, of_cylinder)).collect(),
    }
}

/// The panel of a machine: all its open causes and its whole history (its cylinders' too).
pub async fn machine_panel(db: &Db, machine_id: i64) -> Result<ServicePanel, sqlx::Error> {
    let mut conn = db.acquire().await?;
    let standing = service_return::machine_standing(&mut conn, machine_id).await?;
    let rows = status::history(&mut conn, status::Of::Machine(machine_id)).await?;
    Ok(panel(standing, &rows, false))
}

/// The panel of one cylinder: the causes and history that name it.
pub async fn cylinder_panel(
    db: &Db,
    machine_id: i64,
    cylinder_id: i64,
) -> Result<ServicePanel, sqlx::Error> {
    let mut conn = db.acquire().await?;
    let standing = service_return::cylinder_standing(&mut conn, machine_id, cylinder_id).await?;
    let rows = status::history(&mut conn, status::Of::Cylinder(cylinder_id)).await?;
    Ok(panel(standing, &rows, true))
}
