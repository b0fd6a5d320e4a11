//! The history chart as plain SVG geometry: tests as points over time, the limit as a line,
//! the least-squares trend dashed. Numbers only (no user text), placed by a template.

use crate::calc::quantity::{self, Dimension, UnitSystem};
use crate::calc::trend::{Crossing, Projection};

pub const WIDTH: f64 = 720.0;
pub const HEIGHT: f64 = 320.0;
const LEFT: f64 = 64.0;
const RIGHT: f64 = 16.0;
const TOP: f64 = 16.0;
const BOTTOM: f64 = 40.0;
const DAY: f64 = 86_400.0;

/// One test on the chart, in SVG coordinates, with its tooltip.
#[derive(Clone, Debug)]
pub struct Dot {
    pub x: String,
    pub y: String,
    pub title: String,
    /// `pass`, `fail` or `no_limit`: a circle, a square or a triangle is drawn, never colour
    /// alone.
    pub verdict: String,
    /// For the square and the triangle: the corner and the path.
    pub x0: String,
    pub y0: String,
    pub path: String,
}

/// An axis tick: position and label.
#[derive(Clone, Debug)]
pub struct Tick {
    pub at: String,
    pub label: String,
}

/// A line from `(x1, y1)` to `(x2, y2)`.
#[derive(Clone, Debug)]
pub struct Segment {
    pub x1: String,
    pub y1: String,
    pub x2: String,
    pub y2: String,
}

/// Everything the chart template draws.
#[derive(Clone, Debug)]
pub struct Chart {
    pub width: String,
    pub height: String,
    pub left: String,
    pub right: String,
    pub top: String,
    pub bottom: String,
    pub polyline: String,
    pub dots: Vec<Dot>,
    pub limit: Option<Segment>,
    pub limit_label: String,
    pub trend: Option<Segment>,
    pub y_ticks: Vec<Tick>,
    pub x_ticks: Vec<Tick>,
    pub y_title: String,
}

/// One test to draw: time (s since the epoch), value (m), verdict, tooltip.
#[derive(Clone, Debug)]
pub struct Sample {
    pub at: f64,
    pub value: f64,
    pub verdict: String,
    pub title: String,
}

fn n(v: f64) -> String {
    format!("{v:.1}")
}

/// A step of 1, 2 or 5 times a power of ten near `raw`.
fn nice_step(raw: f64) -> f64 {
    if !(raw.is_finite() && raw > 0.0) {
        return 1.0;
    }
    let power = 10f64.powf(raw.log10().floor());
    let m = raw / power;
    let base = if m <= 1.0 {
        1.0
    } else if m <= 2.0 {
        2.0
    } else if m <= 5.0 {
        5.0
    } else {
        10.0
    };
    base * power
}

fn date_label(at: f64) -> String {
    time::OffsetDateTime::from_unix_timestamp(at as i64)
        .ok()
        .and_then(|t| {
            t.format(time::macros::format_description!("[year]-[month]"))
                .ok()
        })
        .unwrap_or_default()
}

/// Lays out the chart; `None` without any sample. Values are shown in `units`' length unit.
pub fn build(
    samples: &[Sample],
    limit: Option<f64>,
    projection: Option<&Projection>,
    units: UnitSystem,
) -> Option<Chart> {
    let first = samples.iter().map(|s| s.at).reduce(f64::min)?;
    let last = samples.iter().map(|s| s.at).reduce(f64::max)?;
    let span = (last - first).max(30.0 * DAY);
    let mut x_max = last + 0.1 * span;
    if let Some(Projection {
        crossing: Crossing::Estimated { at },
        ..
    }) = projection
        && *at <= last + span
    {
        x_max = x_max.max(*at + 0.05 * span);
    }
    let x_min = first - 0.05 * span;
    let to_display = |si: f64| quantity::show(si, Dimension::Length, units).value;
    let values: Vec<f64> = samples.iter().map(|s| to_display(s.value)).collect();
    let lim = limit.map(to_display);
    let hi = values.iter().copied().chain(lim).fold(0.0_f64, f64::max);
    let lo = values.iter().copied().fold(0.0_f64, f64::min);
    let step = nice_step(((hi - lo) * 1.15).max(1e-9) / 5.0);
    let y_lo = (lo / step).floor() * step;
    let y_hi = ((hi * 1.1) / step).ceil().max(1.0) * step;
    let px = |t: f64| LEFT + (t - x_min) / (x_max - x_min) * (WIDTH - LEFT - RIGHT);
    let py = |v: f64| {
        let y = HEIGHT - BOTTOM - (v - y_lo) / (y_hi - y_lo) * (HEIGHT - TOP - BOTTOM);
        y.clamp(TOP, HEIGHT - BOTTOM)
    };
    let mut dots = Vec::new();
    let mut polyline = Vec::new();
    let mut order: Vec<usize> = (0..samples.len()).collect();
    order.sort_by(|a, b| samples[*a].at.total_cmp(&samples[*b].at));
    for i in order {
        let s = &samples[i];
        let (x, y) = (px(s.at), py(values[i]));
        polyline.push(format!("{},{}", n(x), n(y)));
        dots.push(Dot {
            x: n(x),
            y: n(y),
            title: s.title.clone(),
            verdict: s.verdict.clone(),
            x0: n(x - 5.0),
            y0: n(y - 5.0),
            path: format!(
                "M{} {}L{} {}L{} {}Z",
                n(x),
                n(y - 6.0),
                n(x + 6.0),
                n(y + 5.0),
                n(x - 6.0),
                n(y + 5.0)
            ),
        });
    }
    let unit = quantity::display_unit(Dimension::Length, units);
    let mut y_ticks = Vec::new();
    let mut v = y_lo;
    while v <= y_hi + step * 0.01 && y_ticks.len() < 12 {
        y_ticks.push(Tick {
            at: n(py(v)),
            label: quantity::significant(v, 3),
        });
        v += step;
    }
    let x_ticks = (0..5)
        .map(|k| {
            let t = x_min + (x_max - x_min) * (0.05 + 0.225 * f64::from(k));
            Tick {
                at: n(px(t)),
                label: date_label(t),
            }
        })
        .collect();
    let limit_seg = lim.map(|l| Segment {
        x1: n(LEFT),
        y1: n(py(l)),
        x2: n(WIDTH - RIGHT),
        y2: n(py(l)),
    });
    let mut times: Vec<f64> = samples.iter().map(|s| s.at).collect();
    times.sort_by(f64::total_cmp);
    let trend = projection
        .and_then(|p| p.line.map(|line| (line, p.used)))
        .map(|(line, used)| {
            let start = times[times.len().saturating_sub(used.max(1))];
            Segment {
                x1: n(px(start)),
                y1: n(py(to_display(line.value_at(start)))),
                x2: n(px(x_max)),
                y2: n(py(to_display(line.value_at(x_max)))),
            }
        });
    Some(Chart {
        width: n(WIDTH),
        height: n(HEIGHT),
        left: n(LEFT),
        right: n(WIDTH - RIGHT),
        top: n(TOP),
        bottom: n(HEIGHT - BOTTOM),
        polyline: polyline.join(" "),
        dots,
        limit: limit_seg,
        limit_label: lim
            .map(|l| format!("limit {} {unit}", quantity::significant(l, 3)))
            .unwrap_or_default(),
        trend,
        y_ticks,
        x_ticks,
        y_title: format!("leak drift, {unit}"),
    })
}
