//! The safety loop in a real browser on a 768 x 1024 tablet: a technician lands on the shop's
//! work list, sees the unit's worst hazard before its forms, records a drift test that fails
//! its limit, and the machine is at once on the manager's out-of-service list; the manager
//! cannot return it before a passing retest, and after the technician's passing retest the
//! manager's approval returns it. The readings are test data; the limit is the demo
//! procedure's.

use crate::browser::Browser;
use crate::fixture::Demo;
use serde_json::Value;

/// A demo machine in service with no open cause and one cylinder whose load pushes the rod in
/// and whose figures alone are fit for service (the one tested). Every demo unit has a worst
/// hazard to state (at least a check within the low margin of a rating, such as the blocked
/// rod end at the relief setting with no load).
async fn pick(demo: &Demo) -> (Value, i64) {
    let machines = demo
        .admin
        .get("/api/v1/machines?limit=200")
        .await
        .expect("machines")
        .json();
    for m in machines["items"].as_array().expect("items") {
        let id = m["id"].as_i64().expect("id");
        let standing = demo
            .admin
            .get(&format!("/api/v1/machines/{id}/status-history"))
            .await
            .expect("standing")
            .json();
        if standing["status"] != "in_service" {
            continue;
        }
        let cylinders = demo
            .admin
            .get(&format!("/api/v1/machines/{id}/cylinders"))
            .await
            .expect("cylinders")
            .json();
        let list = cylinders["items"].as_array().expect("cylinders");
        for c in list.iter().filter(|c| c["load_direction"] == "retract") {
            let cid = c["id"].as_i64().expect("cylinder id");
            let safety = demo
                .admin
                .get(&format!("/api/v1/cylinders/{cid}/safety"))
                .await
                .expect("safety")
                .json();
            if safety["decision"] == "fit_for_service" {
                return (m.clone(), cid);
            }
        }
    }
    panic!("the demo fleet has no unit for the safety loop");
}

async fn drift_test(b: &mut Browser, demo: &Demo, cylinder: i64, drift_mm: &str, shot: &str) {
    b.goto(&demo.url(&format!("/shop/cylinders/{cylinder}/drift-test")))
        .await;
    b.find("form.shop-form").await;
    b.quantity("duration", "10", "min").await;
    b.quantity("drift", drift_mm, "mm").await;
    b.quantity("oil_temperature_start", "45", "degC").await;
    b.quantity("oil_temperature_end", "45", "degC").await;
    b.quantity("cap_pressure_start", "85", "bar").await;
    b.quantity("cap_pressure_end", "85", "bar").await;
    b.quantity("rod_pressure_start", "4", "bar").await;
    b.quantity("rod_pressure_end", "4", "bar").await;
    if !b.find_all("#f-limit_distance").await.is_empty() {
        b.quantity("limit_distance", "5", "mm").await;
        b.quantity("limit_per", "10", "min").await;
    }
    b.click("form.shop-form button[type='submit']").await;
    b.wait_for_path("/shop/drift-tests/").await;
    b.shot(shot).await;
}

async fn decision(b: &Browser) -> String {
    b.find("p.verdict.decision")
        .await
        .text()
        .await
        .unwrap_or_default()
}

#[tokio::test]
async fn a_failing_drift_test_removes_the_machine_and_only_a_retest_and_approval_return_it() {
    let demo = Demo::start("safety_loop").await;
    let (machine, cylinder) = pick(&demo).await;
    let mid = machine["id"].as_i64().expect("machine id");
    let unit = machine["unit_number"].as_str().expect("unit").to_string();
    // One browser at a time on this machine: the people take turns at it, each logging in.
    let mut b = Browser::open(demo.out.clone(), 768, 1024).await;

    // Logged in, the technician lands on the shop's work list.
    demo.login(&mut b, "tech.rowan").await;
    assert_eq!(b.path().await, "/shop", "a technician lands on the shop");
    b.find("#work-title").await;
    b.shot("work-list").await;

    // The unit's page states its worst hazard before any form.
    b.goto(&demo.url(&format!("/shop/machines/{mid}"))).await;
    let source = b.client.source().await.expect("source");
    let hazard = source
        .find("Worst hazard")
        .expect("the worst hazard is stated");
    let form = source
        .find(&format!("/shop/machines/{mid}/inspection"))
        .expect("the inspection form's button");
    assert!(hazard < form, "the hazard comes before the form");
    b.shot("hazard-before-form").await;
    let (fits, sizes) = b.fits_width().await;
    assert!(fits, "the unit page scrolls sideways at 768 px: {sizes}");

    // 30 mm in 10 minutes fails the procedure's limit: remove from service, at once.
    drift_test(&mut b, &demo, cylinder, "30", "failed-test").await;
    let said = decision(&b).await;
    assert!(said.contains("Remove from service"), "{said}");

    demo.login(&mut b, "mgr.isla").await;
    b.goto(&demo.url("/reports/out-of-service")).await;
    assert!(
        b.page_text().await.contains(&unit),
        "{unit} is on the out-of-service list"
    );
    b.shot("out-of-service-list").await;

    // No retest yet: the approval is refused, naming why.
    b.goto(&demo.url(&format!("/machines/{mid}"))).await;
    b.fill("#note", "looked at it").await;
    b.shot("machine-out-of-service").await;
    b.click("form.return-form button[type='submit']").await;
    b.find("h1").await;
    let refused = b.page_text().await;
    assert!(refused.contains("no passing retest"), "{refused}");
    b.shot("return-refused").await;

    // The technician's passing retest; then the manager approves and the unit is back.
    demo.login(&mut b, "tech.rowan").await;
    drift_test(&mut b, &demo, cylinder, "0.2", "passing-retest").await;
    let said = decision(&b).await;
    assert!(said.contains("Fit for service"), "{said}");
    demo.login(&mut b, "mgr.isla").await;
    b.goto(&demo.url(&format!("/machines/{mid}"))).await;
    b.fill("#note", "holding valve cleaned, retested by R. Tesh")
        .await;
    b.click("form.return-form button[type='submit']").await;
    b.wait_for_path(&format!("/machines/{mid}")).await;
    b.find("section.service").await;
    let page = b.page_text().await;
    assert!(
        page.contains("holding valve cleaned"),
        "the note is in the history"
    );
    b.shot("returned-to-service").await;
    let m = demo
        .admin
        .get(&format!("/api/v1/machines/{mid}"))
        .await
        .expect("machine")
        .json();
    assert_eq!(m["status"], "in_service", "{m}");
    b.goto(&demo.url("/reports/out-of-service")).await;
    assert!(
        !b.page_text().await.contains(&unit),
        "{unit} has left the out-of-service list"
    );
    b.close().await;
}
