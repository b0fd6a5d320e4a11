//! CSV exports never hand a spreadsheet a formula: a cell that begins with `=`, `+`, `-`, `@`,
//! a tab or a carriage return and is not a number gets a leading apostrophe (the usual defence
//! against spreadsheet formula injection, common practice).

use crate::helpers::TestApp;
use crate::reports::fleet;
use serde_json::json;

const PLANTED: [&str; 5] = [
    "=HYPERLINK(\"http://example.invalid\",\"x\")",
    "+1+1",
    "@SUM(A1)",
    "-2+3",
    "\tcmd",
];

fn is_formula(cell: &str) -> bool {
    let risky = cell.starts_with(['=', '+', '-', '@', '\t', '\r']);
    risky && cell.parse::<f64>().is_err()
}

#[tokio::test]
async fn no_csv_export_carries_a_cell_a_spreadsheet_would_run_as_a_formula() {
    let app = TestApp::new().await;
    let site = fleet::site(&app, PLANTED[0]).await;
    let m = fleet::machine(
        &app,
        json!({"unit_number": PLANTED[1], "kind": PLANTED[2], "site_id": site,
               "description": PLANTED[3]}),
    )
    .await;
    let cylinder = fleet::cylinder(&app, m, json!({"function": PLANTED[4]})).await;
    fleet::hose(
        &app,
        m,
        json!({"cylinder_id": cylinder, "port": "cap", "spec": PLANTED[0],
               "working_pressure": "100 bar", "installed_on": "2010-01-01"}),
    )
    .await;
    let body = json!({
        "kind": "periodic", "performed_on": "2026-01-05", "inspector": PLANTED[2],
        "result": "fail", "deficiencies": PLANTED[0],
    });
    let (status, reply) = app
        .post_json(&format!("/api/v1/machines/{m}/inspections"), &body)
        .await;
    assert_eq!(status.as_u16(), 201, "{reply}");
    fleet::set_hose_age_limit(&app, 6).await;

    let mut neutralised = 0;
    for path in [
        "due?format=csv&as_of=2026-06-01&within_days=3650",
        "out-of-service?format=csv",
        "hazards?format=csv&as_of=2026-06-01",
        "hose-age?format=csv&as_of=2026-06-01",
    ] {
        let report = path.split('?').next().unwrap_or("");
        let path = format!("/api/v1/reports/{path}");
        let (_, rows) = fleet::csv_rows(&app, &path).await;
        for cell in rows.iter().flatten() {
            assert!(
                !is_formula(cell),
                "{report}: cell {cell:?} would run as a formula"
            );
            if cell.starts_with('\'') && PLANTED.iter().any(|p| cell[1..].starts_with(p)) {
                neutralised += 1;
            }
        }
    }
    // the planted texts are still there, only made inert (the test is not vacuous)
    assert!(neutralised >= 5, "planted cells found: {neutralised}");
}

#[tokio::test]
async fn negative_numbers_stay_numbers_in_csv() {
    assert_eq!(loadhold::api::csv_safe::cell("-0.4"), "-0.4");
    assert_eq!(loadhold::api::csv_safe::cell("+12"), "+12");
    assert_eq!(loadhold::api::csv_safe::cell("-8 hose"), "'-8 hose");
    assert_eq!(loadhold::api::csv_safe::cell("-inf"), "'-inf");
    assert_eq!(loadhold::api::csv_safe::cell("HV-20"), "HV-20");
}
