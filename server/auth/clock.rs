//! Timestamps as stored: RFC 3339 UTC to the second, so that text order is time order.

use time::format_description::well_known::Rfc3339;
use time::{Duration, OffsetDateTime};

/// The time `offset` from now (negative for the past), as stored.
pub fn from_now(offset: Duration) -> String {
    format(OffsetDateTime::now_utc() + offset)
}

/// The current time, as stored.
pub fn now() -> String {
    from_now(Duration::ZERO)
}

fn format(at: OffsetDateTime) -> String {
    at.replace_nanosecond(0)
        .unwrap_or(at)
        .format(&Rfc3339)
        .unwrap_or_default()
}

/// True when the stored time `at` lies more than `age` in the past (or cannot be read).
pub fn older_than(at: &str, age: Duration) -> bool {
    match OffsetDateTime::parse(at, &Rfc3339) {
        Ok(t) => OffsetDateTime::now_utc() - t > age,
        Err(_) => true,
    }
}
