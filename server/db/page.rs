//! Keyset pagination and text search shared by the registry's list queries.

/// Upper bound on one page of a list.
pub const MAX_LIMIT: i64 = 200;
/// Page size when none is asked for.
pub const DEFAULT_LIMIT: i64 = 50;

/// Which slice of a list: rows with an id above `after_id`, at most `limit` of them.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub struct Window {
    pub after_id: i64,
    pub limit: i64,
}

impl Default for Window {
    fn default() -> Self {
        Window {
            after_id: 0,
            limit: DEFAULT_LIMIT,
        }
    }
}

impl Window {
    /// The LIMIT to bind: one more row than asked, to learn whether another page follows.
    pub fn fetch(&self) -> i64 {
        self.limit.clamp(1, MAX_LIMIT) + 1
    }
}

/// One page of a list and the cursor of the next (the last id shown), if more rows follow.
#[derive(Clone, Debug, PartialEq)]
pub struct Page<T> {
    pub items: Vec<T>,
    pub next_cursor: Option<i64>,
}

impl<T> Page<T> {
    /// Cuts the extra row fetched by [`Window::fetch`] and sets the cursor from `id`.
    pub fn from_rows(mut rows: Vec<T>, window: Window, id: impl Fn(&T) -> i64) -> Page<T> {
        let limit = window.limit.clamp(1, MAX_LIMIT) as usize;
        let more = rows.len() > limit;
        rows.truncate(limit);
        let next_cursor = if more { rows.last().map(id) } else { None };
        Page {
            items: rows,
            next_cursor,
        }
    }
}

/// A `LIKE` pattern that finds `text` anywhere, case-folded, with `%`, `_` and `\` escaped
/// (used with `LOWER(col) LIKE ? ESCAPE '\'`).
pub fn contains_pattern(text: &str) -> String {
    let mut pattern = String::from("%");
    for c in text.trim().to_lowercase().chars() {
        if matches!(c, '%' | '_' | '\\') {
            pattern.push('\\');
        }
        pattern.push(c);
    }
    pattern.push('%');
    pattern
}
