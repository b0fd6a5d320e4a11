//! A cylinder's wear over time: the least-squares trend of `calc::trend` against worked
//! figures, and the demo's two years of shop history (invented) with each of its stories.

use crate::helpers::TestApp;
use loadhold::calc::trend::{self, Crossing, Sample};

#[test]
fn the_least_squares_trend_and_its_crossing_match_the_normal_equations() {
    // [C] computed by hand from the normal equations of a straight-line fit: days 0..4,
    // values 1.0, 1.9, 3.1, 3.9, 5.1 mm: mean day 2, mean value 3.0 mm,
    // sum(dx dy) = 10.2, sum(dx^2) = 10, slope 1.02 mm/day, intercept 0.96 mm; an 8 mm
    // limit is reached on day (8 - 0.96) / 1.02 = 6.902.
    let day = 86_400.0;
    let t0 = 1_700_000_000.0;
    let values = [1.0, 1.9, 3.1, 3.9, 5.1];
    let samples: Vec<Sample> = values
        .iter()
        .enumerate()
        .map(|(i, v)| Sample {
            at: t0 + i as f64 * day,
            value: v * 1e-3,
        })
        .collect();
    let line = trend::least_squares(&samples).expect("a line");
    assert!(
        (line.slope * day - 1.02e-3).abs() < 1e-12,
        "{}",
        line.slope * day
    );
    assert!((line.value_at(t0) - 0.96e-3).abs() < 1e-12);
    let p = trend::project(&samples, 8e-3, trend::RECENT_TESTS);
    match p.crossing {
        Crossing::Estimated { at } => {
            let days = (at - t0) / day;
            assert!((days - 7.04 / 1.02).abs() < 1e-6, "{days}");
        }
        other => panic!("expected an estimate, got {other:?}"),
    }
    // Falling values never cross; one test is too few; a limit already passed is reached.
    let falling: Vec<Sample> = samples
        .iter()
        .map(|s| Sample {
            at: s.at,
            value: 6e-3 - s.value,
        })
        .collect();
    assert_eq!(
        trend::project(&falling, 8e-3, 8).crossing,
        Crossing::NotRising
    );
    assert_eq!(
        trend::project(&samples[..1], 8e-3, 8).crossing,
        Crossing::TooFew
    );
    assert!(matches!(
        trend::project(&samples, 4e-3, 8).crossing,
        Crossing::Reached { .. }
    ));
    // Only the latest `recent` tests count: a worn seal's recent rise is not averaged away.
    let recent = trend::project(&samples, 8e-3, 2);
    assert_eq!(recent.used, 2);
    let slope = recent.line.expect("line").slope * day;
    assert!(
        (slope - 1.2e-3).abs() < 1e-12,
        "last two: 3.9 -> 5.1 mm in a day"
    );
}

#[tokio::test]
async fn the_demo_history_holds_each_of_its_stories() {
    let app = TestApp::new().await;
    let summary = loadhold::seed::load_demo(&app.db)
        .await
        .expect("demo loads");
    assert!(summary.contains("drift tests"), "{summary}");
    let diagnosis_of_last = |unit: &'static str, function: &'static str| {
        let db = app.db.clone();
        async move {
            sqlx::query_as::<_, (String, String)>(
                "SELECT t.diagnosis, t.verdict FROM drift_tests t
                 JOIN cylinders c ON c.id = t.cylinder_id JOIN machines m ON m.id = c.machine_id
                 WHERE m.unit_number = ? AND c.function = ? ORDER BY t.tested_at DESC LIMIT 1",
            )
            .bind(unit)
            .bind(function)
            .fetch_one(&db)
            .await
            .expect("a test")
        }
    };
    assert_eq!(
        diagnosis_of_last("HV-TH-02", "Boom lift").await.0,
        "piston_seal_bypass"
    );
    assert_eq!(
        diagnosis_of_last("HV-EX-03", "Boom").await.0,
        "thermal_contraction"
    );
    assert_eq!(
        diagnosis_of_last("HV-BL-12", "Upper boom lift").await,
        ("holding_circuit_leak".to_string(), "fail".to_string())
    );
    // The wearing lift arm: its trend crosses the limit, as an estimate, within a year.
    let cylinder: i64 = sqlx::query_scalar(
        "SELECT c.id FROM cylinders c JOIN machines m ON m.id = c.machine_id
         WHERE m.unit_number = 'HV-WL-07' AND c.function = 'Lift arm, left'",
    )
    .fetch_one(&app.db)
    .await
    .expect("cylinder");
    let tests = loadhold::db::drift_tests::of_cylinder(&app.db, cylinder)
        .await
        .expect("tests");
    let p = loadhold::pages::shop::history::projection_of(&tests).expect("a projection");
    let soon = match p.crossing {
        Crossing::Estimated { at } => {
            at - tests
                .last()
                .and_then(|t| loadhold::pages::shop::history::epoch(&t.tested_at))
                .unwrap_or(0.0)
        }
        other => panic!("expected an estimate, got {other:?}"),
    };
    assert!(soon > 0.0 && soon < 365.0 * 86_400.0, "{soon}");
    // The skid steer failed its morning check and is out of service, naming that record.
    let (status, cause): (String, Option<i64>) = sqlx::query_as(
        "SELECT status, out_of_service_inspection_id FROM machines WHERE unit_number = 'HV-SS-16'",
    )
    .fetch_one(&app.db)
    .await
    .expect("machine");
    assert_eq!(status, "out_of_service");
    let result: String = sqlx::query_scalar("SELECT result FROM inspections WHERE id = ?")
        .bind(cause)
        .fetch_one(&app.db)
        .await
        .expect("cause");
    assert_eq!(result, "fail");
    // Overdue by date: the tipper trailer's last periodic inspection is over a year old.
    let last: String = sqlx::query_scalar(
        "SELECT MAX(i.performed_on) FROM inspections i JOIN machines m ON m.id = i.machine_id
         WHERE m.unit_number = 'HV-TT-09' AND i.kind = 'periodic'",
    )
    .fetch_one(&app.db)
    .await
    .expect("last");
    let year_ago =
        loadhold::api::draft::date_text(loadhold::api::draft::today() - time::Duration::days(365));
    assert!(last < year_ago, "{last} before {year_ago}");
    // Overdue by hours: the quarry loader ran more than its 1000 h since, within the year.
    let (read, now, on): (f64, f64, String) = sqlx::query_as(
        "SELECT i.hour_meter_h, m.hour_meter_h, i.performed_on FROM inspections i
         JOIN machines m ON m.id = i.machine_id
         WHERE m.unit_number = 'HV-WL-07' AND i.kind = 'periodic'
         ORDER BY i.performed_on DESC LIMIT 1",
    )
    .fetch_one(&app.db)
    .await
    .expect("hours");
    assert!(
        now - read > 1000.0 && on > year_ago,
        "{read} -> {now} since {on}"
    );
    // A correction keeps both records.
    let amended: i64 =
        sqlx::query_scalar("SELECT COUNT(*) FROM inspections WHERE amends_id IS NOT NULL")
            .fetch_one(&app.db)
            .await
            .expect("count");
    assert!(amended >= 1);
}
