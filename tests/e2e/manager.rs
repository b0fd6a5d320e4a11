//! A manager pulls the due list for one site, checks it on screen, and downloads its CSV.

use crate::browser::Browser;
use crate::fixture::Demo;
use std::collections::BTreeSet;
use std::time::{Duration, Instant};

/// The site of the demo fleet with the most due items in the next 60 days, and its name.
async fn busiest_site(demo: &Demo) -> (i64, String) {
    let sites = demo.admin.get("/api/v1/sites").await.expect("sites").json();
    let mut best: Option<(usize, i64, String)> = None;
    for s in sites["items"].as_array().expect("sites") {
        let id = s["id"].as_i64().expect("site id");
        let due = demo
            .admin
            .get(&format!("/api/v1/reports/due?site={id}&within_days=60"))
            .await
            .expect("due")
            .json();
        let n = due["items"].as_array().map_or(0, Vec::len);
        if best.as_ref().is_none_or(|(m, _, _)| n > *m) {
            best = Some((n, id, s["name"].as_str().unwrap_or_default().to_string()));
        }
    }
    let (n, id, name) = best.expect("the demo has sites");
    assert!(n > 0, "the demo fleet has nothing due at any site");
    (id, name)
}

#[tokio::test]
async fn a_manager_filters_the_due_list_by_site_and_downloads_its_csv() {
    let demo = Demo::start("manager_due_list").await;
    let (site_id, site_name) = busiest_site(&demo).await;
    let mut b = Browser::open(demo.out.clone(), 1280, 900).await;
    demo.login(&mut b, "mgr.isla").await;

    b.goto(&demo.url("/reports/due")).await;
    b.find("form.report-filters").await;
    b.shot("due-list-unfiltered").await;
    b.select("#site", &site_id.to_string()).await;
    b.fill("#within_days", "60").await;
    b.shot("due-list-filter-set").await;
    b.click("form.report-filters button[type='submit']").await;
    b.wait_for_path("/reports/due").await;
    let deadline = Instant::now() + Duration::from_secs(10);
    while !b
        .client
        .current_url()
        .await
        .expect("url")
        .as_str()
        .contains("site=")
    {
        assert!(
            Instant::now() < deadline,
            "the filter form did not load a filtered list"
        );
        tokio::time::sleep(Duration::from_millis(50)).await;
    }
    b.find("table.report").await;
    b.shot("due-list-filtered").await;

    // On screen: every row belongs to the chosen site; the units are those the API lists.
    let mut units_on_page = Vec::new();
    for row in b.find_all("table.report tbody tr").await {
        let cells = row
            .find_all(fantoccini::Locator::Css("td"))
            .await
            .expect("cells");
        let site = cells[2].text().await.unwrap_or_default();
        assert_eq!(
            site.trim(),
            site_name,
            "a row of another site in the filtered list"
        );
        units_on_page.push(cells[1].text().await.unwrap_or_default().trim().to_string());
    }
    let api = demo
        .admin
        .get(&format!(
            "/api/v1/reports/due?site={site_id}&within_days=60"
        ))
        .await
        .expect("due JSON")
        .json();
    let api_units: Vec<String> = api["items"]
        .as_array()
        .expect("items")
        .iter()
        .map(|i| i["unit_number"].as_str().unwrap_or_default().to_string())
        .collect();
    assert_eq!(
        units_on_page, api_units,
        "page rows vs the API's due list, in order"
    );
    let everywhere = demo
        .admin
        .get("/api/v1/reports/due?within_days=60")
        .await
        .expect("due JSON")
        .json();
    assert!(
        everywhere["items"].as_array().map_or(0, Vec::len) > api_units.len(),
        "the demo's other sites have due items too, so the filter has something to remove"
    );

    // Download the CSV as the manager would, and read what Chromium saved.
    let href = b
        .find("a[href*='format=csv']")
        .await
        .attr("href")
        .await
        .expect("href")
        .expect("CSV link");
    assert!(
        href.contains(&format!("site={site_id}")),
        "the CSV link keeps the filter: {href}"
    );
    b.click("a[href*='format=csv']").await;
    let csv_path = wait_for_download(&b.downloads).await;
    b.shot("after-download").await;
    let text = std::fs::read_to_string(&csv_path).expect("read the download");
    std::fs::copy(&csv_path, demo.out.join("due-list.csv")).expect("keep the CSV");
    assert!(text.contains("\r\n"), "RFC 4180 line ends are CRLF");
    let mut lines = text.split("\r\n").filter(|l| !l.is_empty());
    let header: Vec<&str> = lines.next().expect("header row").split(',').collect();
    for column in [
        "kind",
        "machine_id",
        "unit_number",
        "cylinder_id",
        "hose_id",
        "due_on",
        "due_at_hours",
        "overdue",
        "basis",
    ] {
        assert!(
            header.contains(&column),
            "CSV header lacks {column}: {header:?}"
        );
    }
    let unit_col = header
        .iter()
        .position(|h| *h == "unit_number")
        .expect("unit column");
    let csv_units: Vec<String> = lines
        .map(|l| {
            l.split(',')
                .nth(unit_col)
                .unwrap_or_default()
                .trim_matches('"')
                .to_string()
        })
        .collect();
    assert_eq!(
        csv_units, api_units,
        "CSV rows vs the API's due list, in order"
    );
    let distinct: BTreeSet<&String> = csv_units.iter().collect();
    assert!(!distinct.is_empty());
    b.close().await;
}

/// The finished download in `dir` (Chromium writes `*.crdownload` until it is complete).
async fn wait_for_download(dir: &std::path::Path) -> std::path::PathBuf {
    let deadline = Instant::now() + Duration::from_secs(20);
    loop {
        let found = std::fs::read_dir(dir)
            .expect("download dir")
            .flatten()
            .map(|e| e.path())
            .find(|p| p.extension().is_some_and(|x| x == "csv"));
        if let Some(path) = found {
            return path;
        }
        assert!(
            Instant::now() < deadline,
            "no CSV arrived in {}",
            dir.display()
        );
        tokio::time::sleep(Duration::from_millis(100)).await;
    }
}
