//! Pieces shared by the shop records' request readers (drift tests, decay tests, inspections):
//! when, who, the client token, the record amended, and the condition flags of a test.

use super::draft::Problems;
use super::input::Fields;
use crate::calc::quantity::Dimension;
use crate::db::procedures::Procedure;
use crate::error::AppError;
use serde_json::{Value, json};
use time::format_description::well_known::Rfc3339;
use time::macros::format_description;
use time::{OffsetDateTime, PrimitiveDateTime};

/// Longest accepted client token.
pub const TOKEN_MAX: usize = 100;

/// A change of oil temperature during a test larger than this is flagged, K (our own figure:
/// about what a shop dial thermometer reads clearly; the thermal correction then carries more
/// of the result).
pub const TEMPERATURE_CHANGE_FLAG: f64 = 2.0;

/// A JSON quantity in SI for a request the server builds itself: `{"value": si, "unit": "m"}`.
pub fn si(value: f64, dimension: Dimension) -> Value {
    let unit = match dimension {
        Dimension::Length => "m",
        Dimension::Area => "m2",
        Dimension::Volume => "m3",
        Dimension::Force => "N",
        Dimension::Pressure => "Pa",
        Dimension::Flow => "m3/s",
        Dimension::Speed => "m/s",
        Dimension::Temperature | Dimension::TemperatureChange => "K",
        Dimension::Time => "s",
        Dimension::Expansion => "1/K",
        Dimension::Compliance => "m3/Pa",
    };
    json!({"value": value, "unit": unit})
}

/// `tested_at`: RFC 3339 (any offset, stored as UTC), or `YYYY-MM-DDTHH:MM[:SS]` /
/// `YYYY-MM-DD HH:MM` taken as UTC, or a date `YYYY-MM-DD` (midnight UTC). Absent: now.
/// Refused more than a day ahead of the server's clock.
pub fn timestamp(f: &Fields, name: &str) -> Result<String, AppError> {
    let now = OffsetDateTime::now_utc();
    let Some(text) = f.opt_string(name)? else {
        return Ok(format_utc(now));
    };
    let bad = || {
        AppError::field(
            f.path(name),
            "invalid_timestamp",
            "write the time as 2025-03-14T09:30:00Z (RFC 3339), 2025-03-14T09:30 (UTC) or a date 2025-03-14",
        )
    };
    let text = text.trim();
    let at = if let Ok(t) = OffsetDateTime::parse(text, &Rfc3339) {
        t
    } else {
        let normal = text.replacen(' ', "T", 1);
        let long = format_description!("[year]-[month]-[day]T[hour]:[minute]:[second]");
        let short = format_description!("[year]-[month]-[day]T[hour]:[minute]");
        if let Ok(t) = PrimitiveDateTime::parse(&normal, long) {
            t.assume_utc()
        } else if let Ok(t) = PrimitiveDateTime::parse(&normal, short) {
            t.assume_utc()
        } else if let Some(d) = super::input::parse_date(text) {
            d.midnight().assume_utc()
        } else {
            return Err(bad());
        }
    };
    if at > now + time::Duration::days(1) {
        return Err(AppError::field(
            f.path(name),
            "in_future",
            "this time is in the future",
        ));
    }
    Ok(format_utc(at))
}

/// RFC 3339 UTC to the second, as timestamps are stored.
pub fn format_utc(t: OffsetDateTime) -> String {
    let t = t.to_offset(time::UtcOffset::UTC);
    t.replace_nanosecond(0)
        .unwrap_or(t)
        .format(&Rfc3339)
        .unwrap_or_default()
}

/// `client_token`: up to 100 letters, digits, `-`, `_`, `.` or `:`.
pub fn client_token(f: &Fields) -> Result<Option<String>, AppError> {
    let Some(token) = f.opt_string("client_token")? else {
        return Ok(None);
    };
    let ok = token.len() <= TOKEN_MAX
        && token
            .chars()
            .all(|c| c.is_ascii_alphanumeric() || matches!(c, '-' | '_' | '.' | ':'));
    if ok {
        Ok(Some(token))
    } else {
        Err(AppError::field(
            "client_token",
            "invalid",
            format!("up to {TOKEN_MAX} letters, digits, '-', '_', '.' or ':'"),
        ))
    }
}

/// The signer of a record (`technician` or `inspector`): given, else the logged-in user's
/// name; required when neither.
pub fn signer(f: &Fields, name: &str, user: Option<&str>) -> Result<String, AppError> {
    match super::draft::text(f, name, 120)? {
        Some(text) => Ok(text),
        None => user
            .map(str::to_string)
            .ok_or_else(|| AppError::field(name, "required", "sign the record with your name")),
    }
}

/// The fields every shop record has besides its readings.
#[derive(Clone, Debug, Default)]
pub struct Common {
    pub at: Option<String>,
    pub signer: Option<String>,
    pub token: Option<String>,
    pub amends: Option<i64>,
    pub notes: Option<String>,
}

/// Reads the common fields (`when`, the signer, `client_token`, `amends`, `notes`), recording
/// each problem in `problems`.
pub fn common(
    f: &Fields,
    when: &str,
    signer_field: &str,
    user: Option<&str>,
    problems: &mut Problems,
) -> Common {
    Common {
        at: problems.take(timestamp(f, when)),
        signer: problems.take(signer(f, signer_field, user)),
        token: problems.take(client_token(f)).flatten(),
        amends: problems.take(super::draft::id(f, "amends")).flatten(),
        notes: problems
            .take(super::draft::text(f, "notes", 2000))
            .flatten(),
    }
}

/// The condition flags of a test: the oil temperature below or above the procedure's window
/// (at start or end), or changed by more than [`TEMPERATURE_CHANGE_FLAG`] during the test.
pub fn temperature_flags(procedure: Option<&Procedure>, start_k: f64, end_k: f64) -> Vec<String> {
    let mut flags = Vec::new();
    if let Some(p) = procedure {
        if p.oil_temperature_min_k
            .is_some_and(|min| start_k.min(end_k) < min)
        {
            flags.push("oil_temperature_below_window".to_string());
        }
        if p.oil_temperature_max_k
            .is_some_and(|max| start_k.max(end_k) > max)
        {
            flags.push("oil_temperature_above_window".to_string());
        }
    }
    if (end_k - start_k).abs() > TEMPERATURE_CHANGE_FLAG {
        flags.push("oil_temperature_changed".to_string());
    }
    flags
}

/// A flag in words, for pages.
pub fn flag_words(flag: &str) -> &'static str {
    match flag {
        "oil_temperature_below_window" => {
            "Oil was colder than the procedure's window: the result may not compare with earlier tests."
        }
        "oil_temperature_above_window" => {
            "Oil was hotter than the procedure's window: the result may not compare with earlier tests."
        }
        "oil_temperature_changed" => {
            "Oil temperature changed during the test: part of the movement is thermal, and the correction for it carries the result."
        }
        _ => "Condition flag recorded with the test.",
    }
}
