//! What an import found and did, in plain words: every problem by file, line and column,
//! and the records created, updated and left unchanged.

use std::fmt;

/// One problem with a cell, a row or a header.
#[derive(Clone, Debug, PartialEq)]
pub struct Problem {
    pub file: String,
    /// The line in the file (1 is the header).
    pub line: u64,
    /// The column's header as written, or empty for the whole row.
    pub column: String,
    pub message: String,
}

/// The outcome of one file.
#[derive(Clone, Debug, Default, PartialEq)]
pub struct Report {
    pub file: String,
    pub kind: String,
    pub encoding: String,
    pub problems: Vec<Problem>,
    /// Rows that would be (or were) created, updated, or match the stored record already.
    pub created: Vec<String>,
    pub updated: Vec<String>,
    pub unchanged: usize,
    /// True once the good rows were stored.
    pub stored: bool,
}

impl fmt::Display for Report {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        writeln!(f, "{} ({}, {}):", self.file, self.kind, self.encoding)?;
        for p in &self.problems {
            let column = if p.column.is_empty() {
                String::new()
            } else {
                format!(", column \"{}\"", p.column)
            };
            writeln!(f, "  line {}{}: {}", p.line, column, p.message)?;
        }
        let verb = if self.stored { "" } else { "would be " };
        writeln!(
            f,
            "  {} {verb}created, {} {verb}updated, {} unchanged, {} problem(s){}",
            self.created.len(),
            self.updated.len(),
            self.unchanged,
            self.problems.len(),
            if self.stored { "" } else { "; nothing stored" }
        )
    }
}
