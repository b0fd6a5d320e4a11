//! Importing sites and machines from CSV (`server/import/registry.rs`): a dry run names every
//! bad cell and stores nothing; the import is idempotent; a changed row updates with an audit
//! row; Windows-1252 text; a file of 10,000 rows. Pressures: bar = 1e5 Pa, psi =
//! 6894.757293168 Pa (REFERENCES.md "Units").

use crate::helpers::TestApp;
use crate::registry_fixtures::audit;
use loadhold::import::columns::Kind;
use loadhold::import::registry::{self, Options};
use loadhold::import::report::Report;
use loadhold::import::table;

async fn import(app: &TestApp, bytes: &[u8], kind: Kind, options: Options) -> Report {
    let t = table::read(bytes).expect("readable CSV");
    registry::import(
        &app.db,
        "test import",
        "fleet.csv",
        &t,
        kind,
        options,
        &Default::default(),
    )
    .await
    .expect("import runs")
}

const DRY: Options = Options {
    dry_run: true,
    skip_bad_rows: false,
};
const STORE: Options = Options {
    dry_run: false,
    skip_bad_rows: false,
};

async fn count(app: &TestApp, table: &str) -> i64 {
    let sql = match table {
        "machines" => "SELECT COUNT(*) FROM machines",
        _ => "SELECT COUNT(*) FROM audit_log",
    };
    sqlx::query_scalar(sql)
        .fetch_one(&app.db)
        .await
        .expect("count")
}

#[tokio::test]
async fn a_dry_run_names_every_bad_cell_and_stores_nothing() {
    let app = TestApp::new().await;
    let sites = import(
        &app,
        b"Site name,Units\nQuarry Lane,us\n",
        Kind::Sites,
        STORE,
    )
    .await;
    assert!(sites.stored && sites.problems.is_empty(), "{sites}");
    let csv = "Unit No.;Type;Site;Relief [bar];Hours;Colour\n\
               EX-1;excavator;Quarry Lane;210;1200 h;red\n\
               EX-2;excavator;Nowhere Yard;210 bar;;\n\
               EX-1;loader;Quarry Lane;200;;\n\
               EX-3;;Quarry Lane;two hundred;;\n\
               EX-4;dozer;Quarry Lane;210;1200;\n";
    let report = import(&app, csv.as_bytes(), Kind::Machines, DRY).await;
    let said: Vec<(u64, &str)> = report
        .problems
        .iter()
        .map(|p| (p.line, p.column.as_str()))
        .collect();
    assert_eq!(
        said,
        [
            (1, "Colour"),
            (3, "Site"),
            (4, "Unit No."),
            (5, "kind"),
            (5, "Relief [bar]"),
            (6, "Hours"),
        ],
        "{report}"
    );
    let words = report.to_string();
    for expected in [
        "not a field",
        "no site \"Nowhere Yard\"",
        "given twice in this file (first on line 2)",
        "kind is missing",
        "a unit is required",
    ] {
        assert!(words.contains(expected), "{expected}: {words}");
    }
    assert_eq!(report.created, ["EX-1"], "the good row would be created");
    assert_eq!(count(&app, "machines").await, 0, "a dry run stores nothing");
    let refused = import(&app, csv.as_bytes(), Kind::Machines, STORE).await;
    assert!(!refused.stored);
    assert_eq!(count(&app, "machines").await, 0, "all or nothing per file");
    let skipped = import(
        &app,
        csv.as_bytes(),
        Kind::Machines,
        Options {
            dry_run: false,
            skip_bad_rows: true,
        },
    )
    .await;
    assert!(skipped.stored);
    assert_eq!(
        count(&app, "machines").await,
        1,
        "--skip-bad-rows keeps the good row"
    );
}

#[tokio::test]
async fn a_reimport_changes_nothing_and_a_changed_row_updates_with_an_audit_row() {
    let app = TestApp::new().await;
    let csv = "Unit number,Kind,Relief pressure\nGR-7,grader,3000 psi\nGR-8,grader,210 bar\n";
    let first = import(&app, csv.as_bytes(), Kind::Machines, STORE).await;
    assert_eq!(first.created.len(), 2, "{first}");
    let again = import(&app, csv.as_bytes(), Kind::Machines, STORE).await;
    assert_eq!(
        (again.created.len(), again.updated.len(), again.unchanged),
        (0, 0, 2)
    );
    let audit_rows = count(&app, "audit_log").await;
    let changed = "Unit number,Kind,Relief pressure\nGR-7,grader,3000 psi\nGR-8,grader,250 bar\n";
    let third = import(&app, changed.as_bytes(), Kind::Machines, STORE).await;
    assert_eq!(third.updated, ["GR-8"], "{third}");
    assert_eq!(
        count(&app, "audit_log").await,
        audit_rows + 1,
        "one audit row"
    );
    let id: i64 = sqlx::query_scalar("SELECT id FROM machines WHERE unit_number = 'GR-8'")
        .fetch_one(&app.db)
        .await
        .unwrap();
    let (_, body) = app.get_json(&format!("/api/v1/machines/{id}")).await;
    assert!((body["relief_pressure"]["si"].as_f64().unwrap() - 250e5).abs() < 1e-6);
    let rows = audit(&app, "machine", id).await;
    assert_eq!(
        rows.last().map(|r| r.0.as_str()),
        Some("update"),
        "{rows:?}"
    );
    let (_, gr7) = app.get_json("/api/v1/machines?q=GR-7").await;
    let si = gr7["items"][0]["relief_pressure"]["si"].as_f64().unwrap();
    assert!((si - 3000.0 * 6894.757293168).abs() < 1e-3, "{gr7}");
}

#[tokio::test]
async fn windows_1252_names_and_ten_thousand_rows() {
    let app = TestApp::new().await;
    // "Böschung Süd": ö = 0xF6, ü = 0xFC in Windows-1252.
    let sites = import(&app, b"Site\nB\xF6schung S\xFCd\n", Kind::Sites, STORE).await;
    assert_eq!(sites.encoding, "Windows-1252");
    let name: String = sqlx::query_scalar("SELECT name FROM sites")
        .fetch_one(&app.db)
        .await
        .unwrap();
    assert_eq!(name, "Böschung Süd");
    let mut csv = String::from("Unit number,Kind,Site,Relief [bar]\n");
    for n in 0..10_000 {
        csv.push_str(&format!(
            "T-{n:05},telehandler,Böschung Süd,{}\n",
            180 + n % 50
        ));
    }
    let report = import(&app, csv.as_bytes(), Kind::Machines, STORE).await;
    assert!(report.problems.is_empty(), "{report}");
    assert_eq!(report.created.len(), 10_000);
    assert_eq!(count(&app, "machines").await, 10_000);
}
