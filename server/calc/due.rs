//! When the next record of a kind is due: by calendar days, by hour-meter hours, whichever
//! comes first; and hose replacement by replace-by date or age. Pure calendar arithmetic on
//! `time::Date` (proleptic Gregorian), hours as plain numbers on the machine's hour meter.
//!
//! Rules (ours, stated so they can be checked by hand):
//! - the interval counts from the last record of the kind; hours count from that record's meter
//!   reading, or from 0 h when it has none (it errs toward due early);
//! - a scheduled kind never yet recorded is due on the registration date itself (an item of
//!   unknown condition gets its first record at once; see [`first_due`]);
//! - due on day `D` means the work may still be done on `D`; it is overdue from `D + 1`.
//!   Due at `H` hours likewise: overdue once the meter reads more than `H`;
//! - "whichever comes first": overdue if either basis is past; the `basis` is the one that is
//!   (or will be) reached first, the hours one estimated from the meter's use since the last
//!   record, at a constant rate;
//! - due soon: not overdue, and due on or before `as_of + within_days`, or (when a window in
//!   hours is given) due at or below the current reading plus that many hours.

use serde::Serialize;
use std::cmp::Ordering;
use time::{Date, Duration, Month};

/// Which measure makes an item due first.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize)]
#[serde(rename_all = "snake_case")]
pub enum Basis {
    Date,
    Hours,
}

impl Basis {
    pub fn as_str(self) -> &'static str {
        match self {
            Basis::Date => "date",
            Basis::Hours => "hours",
        }
    }
}

/// A record's interval: every `days` calendar days and/or every `hours` meter hours.
#[derive(Clone, Copy, Debug, Default, PartialEq)]
pub struct Interval {
    pub days: Option<i64>,
    pub hours: Option<f64>,
}

impl Interval {
    /// True when neither measure is set (the record kind is not scheduled).
    pub fn is_unset(&self) -> bool {
        self.days.is_none() && self.hours.is_none()
    }
}

/// What an interval counts from: the last record's date and meter reading (h), or the
/// registration date with no reading.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Baseline {
    pub on: Date,
    pub hour_meter: Option<f64>,
}

/// The machine's current hour-meter reading (h) and the day it was read.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Reading {
    pub hours: f64,
    pub on: Date,
}

/// How far ahead "due soon" looks: calendar days, and optionally meter hours.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Window {
    pub days: i64,
    pub hours: Option<f64>,
}

/// The next due point of one record kind, as of a date.
#[derive(Clone, Copy, Debug, PartialEq, Serialize)]
pub struct Due {
    /// Last day the record may be made in time; `None` without a day interval.
    pub due_on: Option<Date>,
    /// Meter reading (h) by which the record is due; `None` without an hour interval.
    pub due_at_hours: Option<f64>,
    /// The measure reached first.
    pub basis: Basis,
    pub overdue: bool,
    /// Not overdue, but due within the window.
    pub due_soon: bool,
    /// `as_of - due_on` in days (negative: days left); `None` without `due_on`.
    pub days_overdue: Option<i64>,
    /// Current reading minus `due_at_hours` (negative: hours left); `None` when either is unknown.
    pub hours_overdue: Option<f64>,
    /// Days past due on `basis` (negative: days left), for sorting. Exact for the date basis,
    /// an estimate from the meter's use rate for the hours basis; `None` when it cannot be told.
    pub lateness_days: Option<f64>,
}

impl Due {
    /// True when the item belongs on a due list (overdue or due soon).
    pub fn is_listed(&self) -> bool {
        self.overdue || self.due_soon
    }
}

/// The calendar date at the start of `text`: `YYYY-MM-DD`, alone or opening an RFC 3339
/// timestamp (its first ten characters). `None` when it is not a valid date.
pub fn parse_day(text: &str) -> Option<Date> {
    let head = text.trim().get(..10)?;
    let bytes = head.as_bytes();
    let shape_ok = bytes.iter().enumerate().all(|(i, b)| match i {
        4 | 7 => *b == b'-',
        _ => b.is_ascii_digit(),
    });
    if !shape_ok {
        return None;
    }
    let year: i32 = head[..4].parse().ok()?;
    let month: u8 = head[5..7].parse().ok()?;
    let day: u8 = head[8..10].parse().ok()?;
    Date::from_calendar_date(year, Month::try_from(month).ok()?, day).ok()
}

/// The due point of a scheduled kind that has never been recorded: due on the registration
/// date (basis `date`), so it is overdue from the day after. `None` when the kind has no
/// interval (not scheduled).
pub fn first_due(interval: Interval, registered: Date, as_of: Date, window: Window) -> Option<Due> {
    if interval.is_unset() {
        return None;
    }
    let on_registration = Interval {
        days: Some(0),
        hours: None,
    };
    let since = Baseline {
        on: registered,
        hour_meter: None,
    };
    next_due(on_registration, since, None, as_of, window)
}

/// `date + days`, `None` past the calendar's range.
pub fn add_days(date: Date, days: i64) -> Option<Date> {
    date.checked_add(Duration::days(days))
}

/// Whole days from `from` to `to` (negative when `to` is earlier).
pub fn days_between(from: Date, to: Date) -> i64 {
    (to - from).whole_days()
}

/// `date` plus whole calendar years; 29 February falls back to 28 February (the earlier day,
/// so an age limit is never stretched).
pub fn add_years(date: Date, years: i32) -> Option<Date> {
    let year = date.year().checked_add(years)?;
    Date::from_calendar_date(year, date.month(), date.day())
        .or_else(|_| Date::from_calendar_date(year, date.month(), 28))
        .ok()
}

/// The next due point of a record kind with `interval`, counted from `since`, given the current
/// meter reading, as of `as_of` with look-ahead `window`. `None` when the interval is unset.
/// Origin: calendar arithmetic and the rules in this module's documentation.
pub fn next_due(
    interval: Interval,
    since: Baseline,
    reading: Option<Reading>,
    as_of: Date,
    window: Window,
) -> Option<Due> {
    if interval.is_unset() {
        return None;
    }
    let due_on = interval.days.and_then(|d| add_days(since.on, d));
    let base_hours = since.hour_meter.unwrap_or(0.0);
    let due_at_hours = interval.hours.map(|h| base_hours + h);
    let current = reading.map(|r| r.hours);

    let date_late = due_on.map(|d| days_between(d, as_of) as f64);
    let hours_late =
        due_at_hours.and_then(|due| hours_lateness(due, since, base_hours, reading, as_of));
    let date_over = date_late.is_some_and(|l| l > 0.0);
    let hours_over = match (due_at_hours, current) {
        (Some(due), Some(now)) => now > due,
        _ => false,
    };

    let basis = match (due_on, due_at_hours) {
        (None, Some(_)) => Basis::Hours,
        (Some(_), None) | (None, None) => Basis::Date,
        (Some(_), Some(_)) => {
            if hours_over && !date_over {
                Basis::Hours
            } else if date_over && !hours_over {
                Basis::Date
            } else {
                match (hours_late, date_late) {
                    (Some(h), Some(d)) if h > d => Basis::Hours,
                    _ => Basis::Date,
                }
            }
        }
    };
    let overdue = date_over || hours_over;
    let soon_by_date = due_on
        .zip(add_days(as_of, window.days))
        .is_some_and(|(due, horizon)| due <= horizon);
    let soon_by_hours = match (due_at_hours, current, window.hours) {
        (Some(due), Some(now), Some(ahead)) => now + ahead >= due,
        _ => false,
    };
    Some(Due {
        due_on,
        due_at_hours,
        basis,
        overdue,
        due_soon: !overdue && (soon_by_date || soon_by_hours),
        days_overdue: due_on.map(|d| days_between(d, as_of)),
        hours_overdue: due_at_hours.zip(current).map(|(due, now)| now - due),
        lateness_days: match basis {
            Basis::Date => date_late,
            Basis::Hours => hours_late,
        },
    })
}

/// Days past the hour limit as of `as_of` (negative: days left), assuming the meter ran at a
/// constant rate since the baseline: rate `r = (h_now - h_0) / (d_now - d_0)` h/day, limit
/// reached on `d_0 + (H_due - h_0) / r`. With no usable rate but a reading already past the
/// limit, the limit was reached on or before the reading's day, so that day is used.
fn hours_lateness(
    due: f64,
    since: Baseline,
    base_hours: f64,
    reading: Option<Reading>,
    as_of: Date,
) -> Option<f64> {
    let reading = reading?;
    let elapsed = days_between(since.on, reading.on) as f64;
    let used = reading.hours - base_hours;
    let since_to_as_of = days_between(since.on, as_of) as f64;
    if elapsed > 0.0 && used > 0.0 {
        let rate = used / elapsed;
        Some(since_to_as_of - (due - base_hours) / rate)
    } else if reading.hours > due {
        Some(days_between(reading.on, as_of).max(0) as f64)
    } else {
        None
    }
}

/// A due point that is a plain date (a hose's replace-by day), as of `as_of`, looking
/// `window_days` ahead. Same rules as [`next_due`] with a day interval only.
pub fn by_date(due_on: Date, as_of: Date, window_days: i64) -> Due {
    let late = days_between(due_on, as_of);
    let overdue = late > 0;
    Due {
        due_on: Some(due_on),
        due_at_hours: None,
        basis: Basis::Date,
        overdue,
        due_soon: !overdue && add_days(as_of, window_days).is_some_and(|h| due_on <= h),
        days_overdue: Some(late),
        hours_overdue: None,
        lateness_days: Some(late as f64),
    }
}

/// Reads a hose's manufacture date as the layline gives it: `YYYY-Qn` (first day of the
/// quarter), `YYYY-MM` (first of the month), `YYYY-MM-DD`, or `YYYY` (1 January). Taking the
/// first day makes the hose as old as it can be. `None` for anything else.
pub fn parse_made_in(text: &str) -> Option<Date> {
    let text = text.trim();
    let mut parts = text.splitn(3, '-');
    let year: i32 = parts.next()?.parse().ok()?;
    if !(1900..=9999).contains(&year) {
        return None;
    }
    let (month, day) = match (parts.next(), parts.next()) {
        (None, _) => (1, 1),
        (Some(q), None) if q.len() == 2 && q[..1].eq_ignore_ascii_case("q") => {
            let quarter: u8 = q[1..].parse().ok()?;
            if !(1..=4).contains(&quarter) {
                return None;
            }
            (quarter * 3 - 2, 1)
        }
        (Some(m), None) => (m.parse().ok()?, 1),
        (Some(m), Some(d)) => (m.parse().ok()?, d.parse().ok()?),
    };
    Date::from_calendar_date(year, Month::try_from(month).ok()?, day).ok()
}

/// Why a hose is due for replacement.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize)]
#[serde(rename_all = "snake_case")]
pub enum HoseReason {
    /// The replace-by date entered for the assembly.
    ReplaceBy,
    /// The shop's age limit, counted from manufacture (or from installation when the
    /// manufacture date is not known).
    AgeLimit,
}

impl HoseReason {
    pub fn as_str(self) -> &'static str {
        match self {
            HoseReason::ReplaceBy => "replace_by",
            HoseReason::AgeLimit => "age_limit",
        }
    }
}

/// The day a hose assembly is due for replacement: the earlier of its replace-by date and
/// `born + age_limit_years` (calendar years, [`add_years`]); on a tie the replace-by date is
/// named. `born` is the manufacture date, else the install date. `None` when neither applies.
pub fn hose_due(
    replace_by: Option<Date>,
    born: Option<Date>,
    age_limit_years: Option<i32>,
) -> Option<(Date, HoseReason)> {
    let by_age = born
        .zip(age_limit_years)
        .and_then(|(b, y)| add_years(b, y))
        .map(|d| (d, HoseReason::AgeLimit));
    let by_date = replace_by.map(|d| (d, HoseReason::ReplaceBy));
    match (by_date, by_age) {
        (Some(a), Some(b)) => Some(if b.0 < a.0 { b } else { a }),
        (a, b) => a.or(b),
    }
}

/// Age in whole days from `born` to `as_of` (0 when `born` is later).
pub fn age_days(born: Date, as_of: Date) -> i64 {
    days_between(born, as_of).max(0)
}

/// Order for due lists: overdue before due soon before the rest; then furthest past due first
/// (`lateness_days`, unknown last); then most hours past due.
pub fn most_overdue_first(a: &Due, b: &Due) -> Ordering {
    let rank = |d: &Due| {
        if d.overdue {
            0
        } else if d.due_soon {
            1
        } else {
            2
        }
    };
    rank(a)
        .cmp(&rank(b))
        .then_with(|| desc_opt(a.lateness_days, b.lateness_days))
        .then_with(|| desc_opt(a.hours_overdue, b.hours_overdue))
}

/// Larger first; `None` after every number.
fn desc_opt(a: Option<f64>, b: Option<f64>) -> Ordering {
    match (a, b) {
        (Some(x), Some(y)) => y.partial_cmp(&x).unwrap_or(Ordering::Equal),
        (Some(_), None) => Ordering::Less,
        (None, Some(_)) => Ordering::Greater,
        (None, None) => Ordering::Equal,
    }
}
