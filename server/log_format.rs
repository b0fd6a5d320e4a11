//! The human-readable log's field formatter: every field value, the message included, has its
//! control characters escaped (`\n` as `\n`, ESC as `\u{1b}`), so text a user typed (a user
//! name with a line break, a terminal escape code) cannot forge a log line or drive the
//! terminal of whoever reads the log. The JSON format escapes them by itself.

use std::fmt::Write;
use tracing_subscriber::field::MakeExt;
use tracing_subscriber::fmt::format::{FormatFields, Writer};

/// `text` with every control character written as an escape (`\n`, `\t`, `\u{1b}`).
pub fn escape_controls(text: &str) -> String {
    let mut out = String::with_capacity(text.len());
    for c in text.chars() {
        if c.is_control() {
            let _ = write!(out, "{}", c.escape_default());
        } else {
            out.push(c);
        }
    }
    out
}

/// `message` first as written, then `name=value` pairs, each with its control characters
/// escaped; for `tracing_subscriber::fmt().fmt_fields(...)`.
pub fn fields() -> impl for<'w> FormatFields<'w> + Send + Sync + 'static {
    tracing_subscriber::fmt::format::debug_fn(
        |writer: &mut Writer<'_>, field: &tracing::field::Field, value: &dyn std::fmt::Debug| {
            let text = escape_controls(&format!("{value:?}"));
            if field.name() == "message" {
                write!(writer, "{text}")
            } else {
                write!(writer, "{}={text}", field.name())
            }
        },
    )
    .delimited(" ")
}
