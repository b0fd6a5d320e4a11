//! What each phase sends: the routes, bodies and the spread of ids over the generated fleet.

use crate::load::{MakeReq, Req};
use hyper::body::Bytes;
use std::sync::Arc;

/// A cylinder held at mid-stroke, as a tablet or integration would ask the calculation API
/// (a made-up cylinder: 100 mm bore, 56 mm rod, 800 mm stroke, 60 kN).
pub const CALC_BODY: &str = r#"{"bore":"100 mm","rod":"56 mm","stroke":"800 mm","load":"60 kN","load_direction":"retract","supply_pressure":"250 bar","ratings":{"cap_line":"280 bar","rod_line":"280 bar","cylinder":"300 bar"},"units":"metric"}"#;

/// The id of the fleet's parts the bench spreads requests over.
#[derive(Clone, Debug)]
pub struct Fleet {
    pub machines: u32,
    pub cylinders: i64,
    pub sites: Vec<i64>,
}

/// A well-spread pseudo-random number for request `seq` of connection `worker` in `phase`
/// (splitmix64), so every run asks for the same records.
pub fn spread(phase: u64, worker: usize, seq: u64) -> u64 {
    let mut z = phase
        .wrapping_mul(0x9E37_79B9_7F4A_7C15)
        .wrapping_add((worker as u64) << 40)
        .wrapping_add(seq);
    z = (z ^ (z >> 30)).wrapping_mul(0xBF58_476D_1CE4_E5B9);
    z = (z ^ (z >> 27)).wrapping_mul(0x94D0_49BB_1331_11EB);
    z ^ (z >> 31)
}

fn pick(phase: u64, worker: usize, seq: u64, count: i64) -> i64 {
    (spread(phase, worker, seq) % count.max(1) as u64) as i64 + 1
}

pub fn static_route() -> MakeReq {
    Arc::new(|_, _| Req::get("/static/icon.svg"))
}

pub fn healthz() -> MakeReq {
    Arc::new(|_, _| Req::get("/healthz"))
}

pub fn calc() -> MakeReq {
    let body = Bytes::from_static(CALC_BODY.as_bytes());
    Arc::new(move |_, _| Req::post_json("/api/v1/calc/cylinder", body.clone()))
}

pub fn due(token: Arc<str>) -> MakeReq {
    Arc::new(move |_, _| Req::get("/api/v1/reports/due").bearer(&token))
}

/// The due list of one site (the manager's usual slice), a different site each request.
pub fn due_site(fleet: &Fleet, token: Arc<str>) -> MakeReq {
    let sites = fleet.sites.clone();
    Arc::new(move |w, s| {
        Req::get(format!(
            "/api/v1/reports/due?site={}",
            site_of(&sites, 5, w, s)
        ))
        .bearer(&token)
    })
}

/// The site that request `seq` of connection `worker` in `phase` asks for.
pub fn site_of(sites: &[i64], phase: u64, worker: usize, seq: u64) -> i64 {
    match sites.len() {
        0 => 1,
        n => sites[(spread(phase, worker, seq) % n as u64) as usize],
    }
}

pub fn cylinder_page(fleet: &Fleet, token: Arc<str>) -> MakeReq {
    let count = fleet.cylinders;
    Arc::new(move |w, s| Req::get(format!("/cylinders/{}", pick(1, w, s, count))).bearer(&token))
}

pub fn fleet_page(token: Arc<str>) -> MakeReq {
    Arc::new(move |_, _| Req::get("/machines").bearer(&token))
}

pub fn fleet_page_site(fleet: &Fleet, token: Arc<str>) -> MakeReq {
    let sites = fleet.sites.clone();
    Arc::new(move |w, s| {
        Req::get(format!("/machines?site={}", site_of(&sites, 2, w, s))).bearer(&token)
    })
}

/// A search by the digits of a unit number, as the tablet's "find the unit" box sends it.
pub fn fleet_search(fleet: &Fleet, token: Arc<str>) -> MakeReq {
    let machines = i64::from(fleet.machines);
    Arc::new(move |w, s| {
        let unit = pick(3, w, s, machines);
        Req::get(format!("/machines?q={unit:06}")).bearer(&token)
    })
}

/// A drift test of a random cylinder with the readings a technician types (positions inside
/// the shortest stroke in the fleet, 100 mm) and a client token of its own, so each is stored.
pub fn drift_write(fleet: &Fleet, token: Arc<str>, run: u64) -> MakeReq {
    let count = fleet.cylinders;
    Arc::new(move |w, s| {
        let id = pick(4, w, s, count);
        let body = format!(
            r#"{{"duration":"600 s","start_position":"50 mm","end_position":"{:.1} mm","oil_temperature_start":"50 degC","oil_temperature_end":"49 degC","technician":"Bench Runner","client_token":"bench-{run}-{w}-{s}"}}"#,
            50.0 - (s % 8) as f64 * 0.5
        );
        Req::post_json(format!("/api/v1/cylinders/{id}/drift-tests"), body).bearer(&token)
    })
}
