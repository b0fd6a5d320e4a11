//! Returning a machine to service: the two-person rule. Each open cause (a record that
//! restricted or removed the machine or one of its cylinders since its last return) needs a
//! passing retest stored after it: a drift or pressure-decay test of the same cylinder, or an
//! inspection of the machine, whose decision is `fit_for_service`, in force, and not a
//! correction of the record that caused it (amending a failing record never returns a
//! machine). A manager then approves, and may not be the account that signed any of those
//! retests.

use super::status::{self, IN_SERVICE, StatusChange, Who};
use super::write::WriteError;
use sqlx::SqliteConnection;

/// A passing retest found for a cause.
#[derive(Clone, Debug, PartialEq, sqlx::FromRow)]
pub struct Retest {
    pub kind: String,
    pub id: i64,
    pub created_by: String,
    pub signed_by_user_id: Option<i64>,
    pub created_at: String,
}

impl Retest {
    /// `drift test #12`.
    pub fn words(&self) -> String {
        format!("{} #{}", self.kind.replace('_', " "), self.id)
    }
}

/// An open cause and the retest that clears it, if there is one yet.
#[derive(Clone, Debug, PartialEq)]
pub struct Cause {
    pub change: StatusChange,
    pub retest: Option<Retest>,
}

/// Why a return is refused.
#[derive(Debug)]
pub enum Refusal {
    /// Nothing holds the machine back (409).
    NothingToReturn(String),
    /// A cause has no passing retest yet (409).
    NotEligible(String),
    /// The approver signed a retest (403).
    OwnRetest(String),
    Write(WriteError),
}

impl From<sqlx::Error> for Refusal {
    fn from(e: sqlx::Error) -> Self {
        Refusal::Write(WriteError::Db(e))
    }
}

impl From<WriteError> for Refusal {
    fn from(e: WriteError) -> Self {
        Refusal::Write(e)
    }
}

/// The table of a record kind (only the three record kinds are ever passed).
fn table(kind: &str) -> &'static str {
    match kind {
        "drift_test" => "drift_tests",
        "decay_test" => "decay_tests",
        _ => "inspections",
    }
}

/// True when `id`'s chain of corrections (itself and every record it amends, back to the
/// first) contains `cause`.
async fn corrects(
    conn: &mut SqliteConnection,
    kind: &str,
    id: i64,
    cause: i64,
) -> Result<bool, sqlx::Error> {
    let sql = match table(kind) {
        "drift_tests" => "SELECT amends_id FROM drift_tests WHERE id = ?",
        "decay_tests" => "SELECT amends_id FROM decay_tests WHERE id = ?",
        _ => "SELECT amends_id FROM inspections WHERE id = ?",
    };
    let mut at = Some(id);
    let mut steps = 0;
    while let Some(current) = at {
        if current == cause {
            return Ok(true);
        }
        steps += 1;
        if steps > 1000 {
            break;
        }
        at = sqlx::query_scalar::<_, Option<i64>>(sql)
            .bind(current)
            .fetch_optional(&mut *conn)
            .await?
            .flatten();
    }
    Ok(false)
}

/// The passing records, in force, that could clear `change`, newest first.
async fn candidates(
    conn: &mut SqliteConnection,
    change: &StatusChange,
) -> Result<Vec<Retest>, sqlx::Error> {
    let same_after = change.record_id.unwrap_or(0);
    match (change.record_kind.as_str(), change.cylinder_id) {
        ("drift_test" | "decay_test", Some(cylinder)) => {
            let (drift_after, decay_after) = if change.record_kind == "drift_test" {
                (same_after, 0)
            } else {
                (0, same_after)
            };
            sqlx::query_as::<_, Retest>(
                "SELECT * FROM (
                    SELECT 'drift_test' AS kind, t.id, t.created_by, t.signed_by_user_id,
                        t.created_at
                    FROM drift_tests t
                    WHERE t.cylinder_id = ? AND t.decision = 'fit_for_service' AND t.id > ?
                      AND t.created_at >= ?
                      AND NOT EXISTS (SELECT 1 FROM drift_tests a WHERE a.amends_id = t.id)
                    UNION ALL
                    SELECT 'decay_test' AS kind, d.id, d.created_by, d.signed_by_user_id,
                        d.created_at
                    FROM decay_tests d
                    WHERE d.cylinder_id = ? AND d.decision = 'fit_for_service' AND d.id > ?
                      AND d.created_at >= ?
                      AND NOT EXISTS (SELECT 1 FROM decay_tests a WHERE a.amends_id = d.id)
                 ) ORDER BY created_at DESC, id DESC LIMIT 50",
            )
            .bind(cylinder)
            .bind(drift_after)
            .bind(&change.at)
            .bind(cylinder)
            .bind(decay_after)
            .bind(&change.at)
            .fetch_all(conn)
            .await
        }
        _ => {
            sqlx::query_as::<_, Retest>(
                "SELECT 'inspection' AS kind, i.id, i.created_by, i.signed_by_user_id,
                    i.created_at
                 FROM inspections i
                 WHERE i.machine_id = ? AND i.decision = 'fit_for_service' AND i.id > ?
                   AND i.created_at >= ?
                   AND NOT EXISTS (SELECT 1 FROM inspections a WHERE a.amends_id = i.id)
                 ORDER BY i.id DESC LIMIT 50",
            )
            .bind(change.machine_id)
            .bind(same_after)
            .bind(&change.at)
            .fetch_all(conn)
            .await
        }
    }
}

/// The open causes of a machine, each with the latest passing retest that clears it.
pub async fn causes(
    conn: &mut SqliteConnection,
    machine_id: i64,
) -> Result<Vec<Cause>, sqlx::Error> {
    let mut out = Vec::new();
    for change in status::open_causes(conn, machine_id).await? {
        let mut retest = None;
        for candidate in candidates(conn, &change).await? {
            let is_correction = change.record_kind == candidate.kind
                && match change.record_id {
                    Some(cause) => corrects(conn, &candidate.kind, candidate.id, cause).await?,
                    None => false,
                };
            if !is_correction {
                retest = Some(candidate);
                break;
            }
        }
        out.push(Cause { change, retest });
    }
    Ok(out)
}

fn same_account(retest: &Retest, who: Who<'_>) -> bool {
    match (retest.signed_by_user_id, who.user_id) {
        (Some(a), Some(b)) => a == b,
        (None, None) => retest.created_by == who.name,
        _ => false,
    }
}

/// Returns the machine and every cylinder its causes named to service, inside the caller's
/// transaction, when each open cause has a passing retest that `who` did not sign. `note`
/// is kept with the change.
pub async fn approve(
    conn: &mut SqliteConnection,
    who: Who<'_>,
    machine_id: i64,
    note: &str,
) -> Result<Vec<StatusChange>, Refusal> {
    let open = causes(conn, machine_id).await?;
    if open.is_empty() {
        let now = status::machine_status(conn, machine_id).await?;
        return Err(Refusal::NothingToReturn(if now == IN_SERVICE {
            "the machine is in service with no open restriction".into()
        } else {
            "no shop record took this machine out of service; change its status in the registry"
                .into()
        }));
    }
    let mut retests: Vec<Retest> = Vec::new();
    for cause in &open {
        let what = format!(
            "{} #{}",
            cause.change.record_kind.replace('_', " "),
            cause.change.record_id.unwrap_or(0)
        );
        let Some(retest) = &cause.retest else {
            let target = match cause.change.cylinder_id {
                Some(c) => format!("cylinder {c} needs a passing drift or pressure-decay test"),
                None => "the machine needs a passing inspection".into(),
            };
            return Err(Refusal::NotEligible(format!(
                "{what} ({}) has no passing retest since: {target} stored after it (a correction of {what} does not count)",
                cause.change.reason
            )));
        };
        if same_account(retest, who) {
            return Err(Refusal::OwnRetest(format!(
                "approve a return to service after signing its retest ({}) yourself: another manager must approve",
                retest.words()
            )));
        }
        if !retests.contains(retest) {
            retests.push(retest.clone());
        }
    }
    let mut cylinders: Vec<i64> = open.iter().filter_map(|c| c.change.cylinder_id).collect();
    cylinders.sort_unstable();
    cylinders.dedup();
    let names: Vec<String> = retests.iter().map(Retest::words).collect();
    let reason = format!(
        "returned to service by {} after {} passed",
        who.name,
        names.join(", ")
    );
    let latest = retests.iter().map(|r| r.id).max();
    Ok(status::write_return(conn, who, machine_id, &cylinders, &reason, latest, note).await?)
}

/// Where a machine (or one cylinder of it) stands: its status, the restrictions its open
/// causes set, and those causes with their retests.
#[derive(Clone, Debug, PartialEq)]
pub struct Standing {
    pub status: String,
    pub restrictions: Vec<String>,
    pub causes: Vec<Cause>,
}

impl Standing {
    /// True when every open cause has a passing retest (a manager may then approve).
    pub fn eligible(&self) -> bool {
        !self.causes.is_empty() && self.causes.iter().all(|c| c.retest.is_some())
    }
}

fn restrictions_of<'a>(causes: impl Iterator<Item = &'a Cause>) -> Vec<String> {
    let mut out: Vec<String> = Vec::new();
    for r in causes.flat_map(|c| c.change.restrictions()) {
        if !out.contains(&r) {
            out.push(r);
        }
    }
    out
}

/// The machine's standing (all its open causes).
pub async fn machine_standing(
    conn: &mut SqliteConnection,
    machine_id: i64,
) -> Result<Standing, sqlx::Error> {
    let causes = causes(conn, machine_id).await?;
    Ok(Standing {
        status: status::machine_status(conn, machine_id).await?,
        restrictions: restrictions_of(causes.iter()),
        causes,
    })
}

/// One cylinder's standing (the open causes of its machine that name it).
pub async fn cylinder_standing(
    conn: &mut SqliteConnection,
    machine_id: i64,
    cylinder_id: i64,
) -> Result<Standing, sqlx::Error> {
    let causes: Vec<Cause> = causes(conn, machine_id)
        .await?
        .into_iter()
        .filter(|c| c.change.cylinder_id == Some(cylinder_id))
        .collect();
    Ok(Standing {
        status: status::cylinder_status(conn, cylinder_id).await?,
        restrictions: restrictions_of(causes.iter()),
        causes,
    })
}
