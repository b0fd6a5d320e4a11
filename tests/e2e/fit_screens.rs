//! Issue 14, "fit every screen": no page of a listed set (shop, reports, registry,
//! calculator) scrolls sideways at a 768 px tablet (portrait and, at 1024 px, landscape) and a 390 px phone:
//! `document.documentElement.scrollWidth <= innerWidth`. A screenshot of each page at each
//! width is kept in the test's artifact folder.

use crate::browser::Browser;
use crate::fixture::Demo;

/// The pages a technician and a manager use, with a demo machine and cylinder filled in.
fn pages(machine: i64, cylinder: i64) -> Vec<(&'static str, String)> {
    vec![
        ("shop", "/shop".into()),
        ("shop-search", "/shop?q=1".into()),
        ("shop-machine", format!("/shop/machines/{machine}")),
        ("shop-inspection", format!("/shop/machines/{machine}/inspection")),
        ("shop-cylinder", format!("/shop/cylinders/{cylinder}")),
        ("shop-drift-form", format!("/shop/cylinders/{cylinder}/drift-test")),
        ("shop-decay-form", format!("/shop/cylinders/{cylinder}/decay-test")),
        ("label", format!("/cylinders/{cylinder}/label")),
        ("reports", "/reports".into()),
        ("reports-due", "/reports/due".into()),
        ("reports-out-of-service", "/reports/out-of-service".into()),
        ("reports-hazards", "/reports/hazards".into()),
        ("reports-hose-age", "/reports/hose-age".into()),
        ("fleet", "/machines".into()),
        ("machine", format!("/machines/{machine}")),
        ("cylinder", format!("/cylinders/{cylinder}")),
        ("calc", "/calc".into()),
        (
            "calc-results",
            "/calc?units=us&bore=4+in&rod=2+in&stroke=24+in&load=10000+lbf&load_direction=retract&supply_pressure=3000+psi&flow=15+gpm&duration=10+min&drift=2+mm&oil_temperature_start=50+degC&oil_temperature_end=48+degC".into(),
        ),
        ("calc-refused", "/calc?bore=4&rod=2+in&stroke=ten".into()),
    ]
}

#[tokio::test]
async fn no_listed_page_scrolls_sideways_on_a_tablet_or_a_phone() {
    let demo = Demo::start("fit_screens").await;
    let cylinders = demo
        .admin
        .get("/api/v1/cylinders?limit=1")
        .await
        .expect("cylinders")
        .json();
    let first = &cylinders["items"][0];
    let cylinder = first["id"].as_i64().expect("cylinder id");
    let machine = first["machine_id"].as_i64().expect("machine id");
    let mut too_wide = Vec::new();
    for (width, height) in [(768, 1024), (1024, 768), (390, 844)] {
        let mut b = Browser::open(demo.out.clone(), width, height).await;
        demo.login(&mut b, "mgr.isla").await;
        for (name, path) in pages(machine, cylinder) {
            b.goto(&demo.url(&path)).await;
            b.find("main").await;
            b.shot(&format!("{width}-{name}")).await;
            let (fits, sizes) = b.fits_width().await;
            if !fits {
                too_wide.push(format!(
                    "{path} at {width} px: [scrollWidth, innerWidth] = {sizes}"
                ));
            }
        }
        b.close().await;
    }
    assert!(
        too_wide.is_empty(),
        "pages wider than the viewport:\n{}",
        too_wide.join("\n")
    );
}
