//! Plausibility of shop readings in the domain: an hour meter runs forward and at most 24 h a
//! calendar day, a record is not dated before its machine could have been in the fleet, limits
//! and durations are above zero. Each refusal names the field and the bound it broke. These are
//! our rules (common practice for reading hour meters), kept in one place.

use super::draft::{date_text, latest_past};
use super::input::{Fields, parse_date};
use crate::calc::quantity::Dimension;
use crate::db::machines::Machine;
use crate::error::AppError;
use time::Date;

/// The largest hour-meter reading accepted: 500,000 h is 57 years of running round the
/// clock, beyond any machine's life (a bound against typing errors, ours).
pub const MAX_HOURS: f64 = 500_000.0;
/// An hour meter counts at most this many hours per calendar day.
pub const HOURS_PER_DAY: f64 = 24.0;
/// Records may be dated this many years before the year the machine was registered: a
/// registry started for an existing fleet takes the paper history of its machines (ours).
pub const HISTORY_YEARS: i32 = 30;

/// A plain hour-meter number from 0 to [`MAX_HOURS`].
pub fn hours(f: &Fields, name: &str) -> Result<Option<f64>, AppError> {
    match f.opt_number_min(name, 0.0)? {
        Some(h) if h > MAX_HOURS => Err(AppError::field(
            f.path(name),
            "out_of_range",
            format!("an hour-meter reading is at most {MAX_HOURS} h; check the number"),
        )),
        other => Ok(other),
    }
}

/// The first day a record of `machine` may carry: 1 January, [`HISTORY_YEARS`] before the
/// year it was registered.
pub fn earliest_day(machine: &Machine) -> Date {
    let registered = machine
        .created_at
        .get(..10)
        .and_then(parse_date)
        .unwrap_or_else(latest_past);
    Date::from_calendar_date(registered.year() - HISTORY_YEARS, time::Month::January, 1)
        .unwrap_or(registered)
}

/// Refuses a record date (the first ten characters of `text`, `YYYY-MM-DD`) before
/// [`earliest_day`] or after tomorrow.
pub fn record_date(machine: &Machine, field: &str, text: &str) -> Result<(), AppError> {
    let Some(day) = text.get(..10).and_then(parse_date) else {
        return Ok(());
    };
    let (earliest, latest) = (earliest_day(machine), latest_past());
    if day < earliest {
        return Err(AppError::field(
            field,
            "out_of_range",
            format!(
                "this date is before {} ({HISTORY_YEARS} years before the machine {} was \
                 registered); check the year",
                date_text(earliest),
                machine.unit_number
            ),
        ));
    }
    if day > latest {
        return Err(AppError::field(
            field,
            "in_future",
            format!("this date is after {}, tomorrow", date_text(latest)),
        ));
    }
    Ok(())
}

/// Refuses a reading `hours` taken on `day` that is below the machine's last reading (unless
/// the meter was replaced) or more than 24 h per calendar day above it. A reading dated before
/// the last one does not move the machine's meter and is only held to [`MAX_HOURS`].
pub fn hour_meter(
    machine: &Machine,
    day: &str,
    hours: f64,
    replaced: bool,
) -> Result<(), AppError> {
    let Some(last) = machine.hour_meter_h else {
        return Ok(());
    };
    let last_day = machine.hour_meter_read_on.as_deref().and_then(parse_date);
    let this_day = parse_date(day);
    if let (Some(last_day), Some(this_day)) = (last_day, this_day)
        && this_day < last_day
    {
        return Ok(());
    }
    let since = machine
        .hour_meter_read_on
        .as_deref()
        .unwrap_or("its registration");
    if hours < last && !replaced {
        return Err(AppError::field(
            "hour_meter",
            "below_last_reading",
            format!(
                "{hours} h is below the machine's last reading of {last} h (on {since}); \
                 an hour meter only runs forward. If the meter was replaced, send \
                 \"hour_meter_replaced\": true"
            ),
        ));
    }
    if let (Some(last_day), Some(this_day), false) = (last_day, this_day, replaced) {
        // the day of the last reading counts too: a reading in its morning and one the next
        // evening may lie up to two days' running apart
        let days = (this_day - last_day).whole_days() + 1;
        let most = last + HOURS_PER_DAY * days as f64;
        if hours > most {
            return Err(AppError::field(
                "hour_meter",
                "implausible_jump",
                format!(
                    "{hours} h is more than 24 h per calendar day above the last reading of \
                     {last} h on {since}: at most {most} h on {day}"
                ),
            ));
        }
    }
    Ok(())
}

/// Refuses a quantity that is given but not above zero (a limit, a duration).
pub fn above_zero(f: &Fields, name: &str, dimension: Dimension) -> Result<(), AppError> {
    super::draft::positive(f, name, dimension).map(|_| ())
}

/// Refuses a `limit` object whose amount (`amount`: `distance` or `pressure`) or period is not
/// above zero: a limit of 0 mm would fail every test, a period of 0 s cannot be scaled.
pub fn limit(f: &Fields, amount: &str, dimension: Dimension) -> Result<(), AppError> {
    let Ok(Some(limit)) = f.object("limit", "limit") else {
        return Ok(());
    };
    above_zero(&limit, amount, dimension)?;
    above_zero(&limit, "per", Dimension::Time)
}
