//! Unit-number search that ignores case and separators: "th14", "TH 14" and "th-14" all
//! find HV-TH-14. One key function for Rust and its SQL twin, kept together so that the
//! search and any uniqueness rule on unit numbers agree.

/// The search key of a unit number or a query: lower-case letters and digits only.
pub fn key(text: &str) -> String {
    text.chars()
        .filter(|c| c.is_alphanumeric())
        .flat_map(char::to_lowercase)
        .collect()
}

/// The separators [`key`] drops in SQL (`unit_key_sql!`).
pub const SEPARATORS: &[char] = &['-', '_', '/', '.', ' '];

/// A `LIKE` pattern finding the key of `query` anywhere in a unit number's key
/// (`unit_key_sql!`), or `None` when the query is not a unit-number fragment: it holds other
/// symbols (`%` is searched for as typed, by the plain search), or its key is shorter than two
/// characters (one letter ignoring separators would match most of a fleet). The key has
/// letters and digits only, so nothing needs escaping.
pub fn key_pattern(query: &str) -> Option<String> {
    let query = query.trim();
    let fragment = query
        .chars()
        .all(|c| c.is_ascii_alphanumeric() || SEPARATORS.contains(&c));
    let key = key(query);
    (fragment && key.chars().count() >= 2).then(|| format!("%{key}%"))
}

/// The SQL of [`key`] for an ASCII column: lower case without `-`, `_`, `/`, `.` and spaces
/// (the separators unit numbers use).
#[macro_export]
macro_rules! unit_key_sql {
    ($column:literal) => {
        concat!(
            "REPLACE(REPLACE(REPLACE(REPLACE(REPLACE(LOWER(",
            $column,
            "), '-', ''), '_', ''), '/', ''), '.', ''), ' ', '')"
        )
    };
}
