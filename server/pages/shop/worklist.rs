//! The technician's work list on `/shop`: what is due and overdue (drift tests, inspections,
//! hose replacements) at the user's site (every site when the account has none), nearest first
//! (furthest overdue, then soonest due), each one tap from its form.

use crate::api::draft::today;
use crate::db::Db;
use crate::db::reports::{self, DueKind, DueQuery};
use crate::pages::report_views::{DueLine, due_line};

/// One item of the work list and where its form is.
#[derive(Clone, Debug)]
pub struct WorkItem {
    pub line: DueLine,
    /// The form to open: the drift test of the cylinder, the inspection of the machine, or the
    /// machine's shop page for a hose (its replacement is recorded with an inspection).
    pub href: String,
    pub action: &'static str,
}

/// The work list of the user `user_id` (their site's due items), and the site's name.
pub async fn work_list(
    db: &Db,
    user_id: Option<i64>,
) -> Result<(Vec<WorkItem>, Option<String>), sqlx::Error> {
    let site: Option<(i64, String)> =
        match user_id {
            Some(id) => sqlx::query_as(
                "SELECT s.id, s.name FROM users u JOIN sites s ON s.id = u.site_id WHERE u.id = ?",
            )
            .bind(id)
            .fetch_optional(db)
            .await?,
            None => None,
        };
    let mut query = DueQuery::new(today());
    query.filter.site_id = site.as_ref().map(|s| s.0);
    let items = reports::due_list(db, &query).await?;
    let list = items
        .iter()
        .map(|item| {
            let (href, action) = match (item.kind, item.cylinder_id) {
                (DueKind::DriftTest, Some(c)) => (
                    format!("/shop/cylinders/{c}/drift-test"),
                    "Start the drift test",
                ),
                (DueKind::HoseReplacement, _) => (
                    format!("/shop/machines/{}", item.machine_id),
                    "Open the unit",
                ),
                _ => (
                    format!("/shop/machines/{}/inspection", item.machine_id),
                    "Record the inspection",
                ),
            };
            WorkItem {
                line: due_line(item),
                href,
                action,
            }
        })
        .collect();
    Ok((list, site.map(|s| s.1)))
}
