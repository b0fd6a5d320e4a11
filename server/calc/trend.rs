//! The wear trend of a cylinder: a least-squares straight line through its recent drift tests
//! (leak drift after the thermal correction, scaled to the limit's period, against time) and
//! an estimate of when that line reaches the limit.
//!
//! Times are seconds since the Unix epoch; values are metres. The line is kept about the mean
//! time of the samples so that the fit does not lose digits to the size of epoch seconds.

use serde::Serialize;

/// How many of the latest tests the projection uses when the caller has no better figure (our
/// own choice: about two years of quarterly tests; enough to steady the slope, recent enough
/// to follow a seal that has begun to wear faster).
pub const RECENT_TESTS: usize = 8;

/// A crossing further than this past the latest test is reported as [`Crossing::Distant`],
/// s (50 years of 365.25 days): a straight line says nothing useful that far out.
pub const HORIZON: f64 = 50.0 * 365.25 * 86_400.0;

/// One test on the trend: its time, s since the Unix epoch, and its value, m.
#[derive(Clone, Copy, Debug, PartialEq, Serialize)]
pub struct Sample {
    pub at: f64,
    pub value: f64,
}

/// A straight line `value = mean_value + slope (t - mean_at)`.
#[derive(Clone, Copy, Debug, PartialEq, Serialize)]
pub struct Line {
    /// Mean time of the samples, s since the epoch.
    pub mean_at: f64,
    /// Mean value of the samples, m.
    pub mean_value: f64,
    /// m/s.
    pub slope: f64,
}

impl Line {
    /// The line's value at time `t`, m.
    pub fn value_at(&self, t: f64) -> f64 {
        self.mean_value + self.slope * (t - self.mean_at)
    }

    /// The time at which the line has value `v`, s; `None` for a flat line.
    pub fn time_of(&self, v: f64) -> Option<f64> {
        if self.slope == 0.0 || !self.slope.is_finite() {
            return None;
        }
        Some(self.mean_at + (v - self.mean_value) / self.slope)
    }
}

/// The ordinary least-squares line through `samples` (minimising the squared value residuals):
/// `slope = sum((t - t_mean)(y - y_mean)) / sum((t - t_mean)^2)`, through the means (the normal
/// equations of a straight-line fit, any statistics text). `None` with fewer than two samples,
/// when all share one time, or when any number is not finite.
pub fn least_squares(samples: &[Sample]) -> Option<Line> {
    if samples.len() < 2
        || samples
            .iter()
            .any(|s| !s.at.is_finite() || !s.value.is_finite())
    {
        return None;
    }
    let n = samples.len() as f64;
    let mean_at = samples.iter().map(|s| s.at).sum::<f64>() / n;
    let mean_value = samples.iter().map(|s| s.value).sum::<f64>() / n;
    let (mut sxy, mut sxx) = (0.0, 0.0);
    for s in samples {
        let dt = s.at - mean_at;
        sxy += dt * (s.value - mean_value);
        sxx += dt * dt;
    }
    if sxx <= 0.0 {
        return None;
    }
    Some(Line {
        mean_at,
        mean_value,
        slope: sxy / sxx,
    })
}

/// When the trend reaches the limit.
#[derive(Clone, Copy, Debug, PartialEq, Serialize)]
#[serde(tag = "kind", rename_all = "snake_case")]
pub enum Crossing {
    /// Fewer than two tests at different times: no trend.
    TooFew,
    /// The line is flat or falling: it does not approach the limit.
    NotRising,
    /// The line is already at or above the limit at the latest test (time of that test, s).
    Reached { at: f64 },
    /// An estimate of the time the line reaches the limit, s since the epoch.
    Estimated { at: f64 },
    /// Rising, but the crossing is beyond [`HORIZON`] after the latest test.
    Distant,
}

/// The trend over the recent tests and its crossing of the limit.
#[derive(Clone, Copy, Debug, PartialEq, Serialize)]
pub struct Projection {
    pub line: Option<Line>,
    /// How many tests the line was fitted to.
    pub used: usize,
    /// The limit the crossing is judged against, m.
    pub limit: f64,
    pub crossing: Crossing,
}

/// Fits [`least_squares`] to the latest `recent` samples (by time; `recent` below 2 counts as
/// 2) and finds where the line meets `limit` (m): the time `t` with `line(t) = limit`, reported
/// as an estimate when it lies after the latest test, `Reached` when the line is already at the
/// limit there. Extrapolating a straight line is an estimate only; wear often speeds up.
pub fn project(samples: &[Sample], limit: f64, recent: usize) -> Projection {
    let mut sorted: Vec<Sample> = samples.to_vec();
    sorted.sort_by(|a, b| a.at.total_cmp(&b.at));
    let keep = recent.max(2).min(sorted.len());
    let window = &sorted[sorted.len() - keep..];
    let line = least_squares(window);
    let crossing = match (line, window.last()) {
        (Some(line), Some(last)) => {
            if line.value_at(last.at) >= limit {
                Crossing::Reached { at: last.at }
            } else if line.slope <= 0.0 {
                Crossing::NotRising
            } else {
                match line.time_of(limit) {
                    Some(at) if at - last.at <= HORIZON => Crossing::Estimated { at },
                    _ => Crossing::Distant,
                }
            }
        }
        _ => Crossing::TooFew,
    };
    Projection {
        line,
        used: window.len(),
        limit,
        crossing,
    }
}
