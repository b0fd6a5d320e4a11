//! The invented scale fleet's sites and people, and one machine's registry rows: its
//! cylinders and hose assemblies. Every figure here is our own invention for load testing.

use super::batch::Val;
use super::kinds::CylinderPlan;
use super::rng::Rng;
use time::{Date, Duration};

/// Invented place names and yard words for sites (24 x 17 = 408 distinct names).
const PLACES: [&str; 24] = [
    "Alderby",
    "Brackwell",
    "Cinderford Vale",
    "Dunmere",
    "Elsworth",
    "Fallowfield",
    "Garthby",
    "Hollinsend",
    "Ivybank",
    "Jessamy",
    "Kettlewick",
    "Larchmoor",
    "Millbrook",
    "Netherlow",
    "Ormsley",
    "Pennyrigg",
    "Quarrington",
    "Redlynch",
    "Saltcote",
    "Thornleigh",
    "Upwater",
    "Vennford",
    "Wrenhallow",
    "Yarrowby",
];
const YARDS: [&str; 17] = [
    "Yard",
    "Depot",
    "Works",
    "Crossing",
    "Sidings",
    "Wharf",
    "Gate",
    "Lane Yard",
    "North Yard",
    "South Yard",
    "Quarry Depot",
    "Road Depot",
    "Park",
    "Field Yard",
    "Bridge Depot",
    "Mill Yard",
    "Junction",
];
const FIRST: [&str; 20] = [
    "Ada", "Bram", "Cleo", "Dev", "Esme", "Finn", "Greta", "Hal", "Ines", "Jory", "Kit", "Lena",
    "Milo", "Nia", "Otto", "Pia", "Quin", "Rhea", "Sol", "Tove",
];
const LAST: [&str; 20] = [
    "Ashby", "Brennan", "Colley", "Dunn", "Ellery", "Frain", "Gale", "Hurst", "Irwin", "Jessop",
    "Kerr", "Lowe", "Marsh", "Nolan", "Orme", "Pryce", "Quayle", "Rook", "Stroud", "Tait",
];

/// Circuits of hoses not fitted to a cylinder port.
const CIRCUITS: [&str; 4] = [
    "pump to main valve",
    "main valve return",
    "pilot supply",
    "case drain",
];

/// A generated site with the people who sign its records.
pub struct Site {
    pub id: i64,
    pub name: String,
    pub units: &'static str,
    pub people: Vec<String>,
}

/// How many sites a fleet of `n` machines is spread over.
pub fn site_count(n: u32) -> usize {
    ((n / 250) as usize).clamp(1, PLACES.len() * YARDS.len())
}

/// The sites, deterministic from the seed.
pub fn sites(seed: u64, count: usize, first_id: i64) -> Vec<Site> {
    (0..count)
        .map(|i| {
            let mut rng = Rng::for_item(seed, 10, i as u64);
            let name = format!(
                "{} {}",
                PLACES[i % PLACES.len()],
                YARDS[i / PLACES.len() % YARDS.len()]
            );
            let units = if rng.chance(0.2) { "us" } else { "metric" };
            let people = (0..8)
                .map(|_| format!("{} {}", rng.pick(&FIRST), rng.pick(&LAST)))
                .collect();
            Site {
                id: first_id + i as i64,
                name,
                units,
                people,
            }
        })
        .collect()
}

/// `YYYY-MM-DDThh:mm:00Z`.
pub fn stamp(day: Date, hour: i64, minute: i64) -> String {
    format!("{day}T{hour:02}:{minute:02}:00Z")
}

pub fn days(n: i64) -> Duration {
    Duration::days(n)
}

/// Rounds `x` to a multiple of `step`.
pub fn round_to(x: f64, step: f64) -> f64 {
    (x / step).round() * step
}

/// A rated hose on a cylinder port: its label, the port and its working pressure, Pa.
pub type RatedHose = (String, &'static str, f64);

/// A generated cylinder, as the history needs it.
pub struct CylinderSim {
    pub id: i64,
    pub bore: f64,
    pub rod: f64,
    pub stroke: f64,
    pub direction: &'static str,
    pub max_load: f64,
    pub rated: Option<f64>,
    pub tube_od: Option<f64>,
    pub tube_yield: Option<f64>,
    pub end_condition: Option<&'static str>,
    pub interval_days: Option<i64>,
    /// Rated hoses on its ports: (label, port, working pressure Pa).
    pub hoses: Vec<RatedHose>,
}

/// One cylinder of `plan` on machine `machine_id`: its row and what the history needs.
pub fn cylinder(
    rng: &mut Rng,
    id: i64,
    machine_id: i64,
    plan: &CylinderPlan,
    relief: f64,
    created: &str,
) -> (CylinderSim, Vec<Val>) {
    let bore_mm = round_to(rng.range(plan.bore_mm.0, plan.bore_mm.1), 5.0);
    let rod_mm = round_to(bore_mm * rng.range(0.5, 0.7), 5.0).min(bore_mm - 15.0);
    let stroke = round_to(rng.range(plan.stroke_m.0, plan.stroke_m.1), 0.01);
    let (bore, rod) = (bore_mm / 1000.0, rod_mm / 1000.0);
    let cap_area = std::f64::consts::PI / 4.0 * bore * bore;
    let annulus = cap_area - std::f64::consts::PI / 4.0 * rod * rod;
    let held_area = if plan.direction == "retract" {
        cap_area
    } else {
        annulus
    };
    let max_load = round_to(rng.range(0.25, 0.6) * relief * held_area, 100.0);
    let rated = (!rng.chance(0.1)).then(|| round_to(relief * rng.range(1.1, 1.5), 10e5));
    let tube_od = rng
        .chance(0.6)
        .then(|| round_to(bore * rng.range(1.12, 1.25), 0.001));
    let tube_yield = tube_od.and_then(|_| rng.chance(0.7).then(|| *rng.pick(&[355e6, 460e6])));
    let end_condition = match rng.below(20) {
        0 => None,
        1 | 2 => Some("fixed_pinned"),
        _ => Some("pinned_pinned"),
    };
    let interval_days = match rng.below(20) {
        0 => None,
        1..=6 => Some(180),
        _ => Some(365),
    };
    let serial = rng
        .chance(0.6)
        .then(|| format!("C{:08X}", rng.next_u64() as u32));
    let row = vec![
        id.into(),
        machine_id.into(),
        plan.function.into(),
        bore.into(),
        rod.into(),
        stroke.into(),
        plan.direction.into(),
        max_load.into(),
        rated.into(),
        tube_od.into(),
        tube_yield.into(),
        end_condition.into(),
        serial.into(),
        interval_days.into(),
        created.into(),
        created.into(),
    ];
    let sim = CylinderSim {
        id,
        bore,
        rod,
        stroke,
        direction: plan.direction,
        max_load,
        rated,
        tube_od,
        tube_yield,
        end_condition,
        interval_days,
        hoses: Vec::new(),
    };
    (sim, row)
}

/// SAE 100R2AT maximum working pressure by dash size, Pa (from memory of the SAE J517 table:
/// -4 5000 psi, -6 4000, -8 3500, -10 2750, -12 2250, -16 2000). 100R13 is 5000 psi and
/// 100R15 6000 psi in every size (from memory).
fn hose_rating(spec: &str, dash: u32) -> f64 {
    let psi = match spec {
        "SAE 100R15" => 6000.0,
        "SAE 100R13" => 5000.0,
        _ => match dash {
            4 => 5000.0,
            6 => 4000.0,
            8 => 3500.0,
            10 => 2750.0,
            12 => 2250.0,
            _ => 2000.0,
        },
    };
    psi * 6894.757
}

/// Where a hose goes: a cylinder's port or a circuit.
pub enum HosePlace<'a> {
    Port(&'a CylinderSim, &'static str),
    Circuit(&'static str),
}

/// A hose assembly fitted when the machine was registered, and perhaps replaced since (the old
/// assembly archived on the day). Returns the rows and, for a rated port hose, its rating.
#[allow(clippy::too_many_arguments)]
pub fn hose_rows(
    rng: &mut Rng,
    next_id: &mut i64,
    machine_id: i64,
    place: HosePlace<'_>,
    relief: f64,
    registered: Date,
    today: Date,
) -> (Vec<Vec<Val>>, Option<RatedHose>) {
    let bore = match place {
        HosePlace::Port(c, _) => c.bore,
        HosePlace::Circuit(_) => 0.1,
    };
    let dash: u32 = match bore {
        b if b <= 0.063 => 6,
        b if b <= 0.1 => 8,
        b if b <= 0.14 => 12,
        _ => 16,
    };
    let spec = if rng.chance(0.04) {
        "SAE 100R2AT"
    } else if relief >= 300e5 {
        "SAE 100R15"
    } else if relief >= 230e5 {
        "SAE 100R13"
    } else {
        "SAE 100R2AT"
    };
    let rating = hose_rating(spec, dash);
    let length = round_to(rng.range(0.5, 4.0), 0.05);
    let (cylinder_id, port, circuit) = match place {
        HosePlace::Port(c, port) => (Some(c.id), Some(port), None),
        HosePlace::Circuit(name) => (None, None, Some(name)),
    };
    let mut rows = Vec::new();
    let mut installed = registered;
    let last_id = loop {
        let id = *next_id;
        *next_id += 1;
        let made = installed - days(rng.int(30, 200));
        let replace_by = if rng.chance(0.5) {
            Some(installed + days(6 * 365))
        } else if rng.chance(0.08) {
            Some(installed + days(rng.int(2 * 365, 5 * 365)))
        } else {
            None
        };
        // Most assemblies are changed shortly before their replace-by date; one in ten fails
        // (or is damaged) early and is changed on the day.
        let span = (today - installed).whole_days();
        let archived = match replace_by {
            Some(by) if by <= today && rng.chance(0.85) => {
                Some((by - days(rng.int(0, 60))).max(installed + days(1)))
            }
            _ if span > 60 && rows.len() < 3 && rng.chance(0.1) => {
                Some(installed + days(rng.int(30, span - 1)))
            }
            _ => None,
        }
        .filter(|day| *day < today);
        let created = stamp(installed, 9, 0);
        rows.push(vec![
            id.into(),
            machine_id.into(),
            cylinder_id.into(),
            port.into(),
            circuit.into(),
            spec.into(),
            format!("-{dash:02}").into(),
            (f64::from(dash) / 16.0 * 0.0254).into(),
            length.into(),
            rating.into(),
            format!("{}-{:02}", made.year(), u8::from(made.month())).into(),
            installed.to_string().into(),
            replace_by.map(|d| d.to_string()).into(),
            created.clone().into(),
            archived.map_or(created, |d| stamp(d, 16, 0)).into(),
            archived.map(|d| stamp(d, 16, 0)).into(),
        ]);
        match archived {
            Some(day) => installed = day,
            None => break id,
        }
    };
    let rated = port.map(|p| (format!("H{last_id} ({p} port)"), p, rating));
    (rows, rated)
}

/// The `i`-th circuit name for hoses not on a cylinder port.
pub fn circuit_name(i: usize) -> &'static str {
    CIRCUITS[i % CIRCUITS.len()]
}
