//! The rows of a CSV text (RFC 4180: quoted fields, doubled quotes, line breaks inside quotes),
//! with the header and each row's line number for the report.

use super::decode::{self, Encoding};

/// A file read into its header and rows.
#[derive(Clone, Debug, PartialEq)]
pub struct Table {
    pub encoding: Encoding,
    pub delimiter: u8,
    pub header: Vec<String>,
    /// (line number in the file, 1 for the header; cells).
    pub rows: Vec<(u64, Vec<String>)>,
}

/// Reads a CSV file's bytes. A file that is not readable as CSV (an unclosed quote at the end
/// is read as running to the end, as RFC 4180 readers do) or has no header is refused in words.
pub fn read(bytes: &[u8]) -> Result<Table, String> {
    let (text, encoding) = decode::text(bytes);
    let delimiter = decode::delimiter(&text);
    let mut reader = csv::ReaderBuilder::new()
        .delimiter(delimiter)
        .has_headers(false)
        .flexible(true)
        .from_reader(text.as_bytes());
    let mut records = reader.records();
    let header: Vec<String> = match records.next() {
        Some(Ok(r)) => r.iter().map(|c| c.trim().to_string()).collect(),
        Some(Err(e)) => return Err(format!("the header line is not readable as CSV: {e}")),
        None => return Err("the file is empty: it needs a header line".into()),
    };
    if header.iter().all(String::is_empty) {
        return Err("the first line is blank: it must name the columns".into());
    }
    let mut rows = Vec::new();
    // Line numbers from byte offsets: the number of line breaks before the record, plus one.
    let (mut counted_to, mut line) = (0usize, 1u64);
    for record in records {
        let record = record.map_err(|e| format!("not readable as CSV: {e}"))?;
        let at = record.position().map_or(counted_to, |p| p.byte() as usize);
        let mut at = at.clamp(counted_to, text.len());
        // The reader places a record after a blank line at that blank line: step over it.
        while matches!(text.as_bytes().get(at), Some(b'\r' | b'\n')) {
            at += 1;
        }
        line += text.as_bytes()[counted_to..at]
            .iter()
            .filter(|&&b| b == b'\n')
            .count() as u64;
        counted_to = at;
        let cells: Vec<String> = record.iter().map(|c| c.trim().to_string()).collect();
        if cells.iter().all(String::is_empty) {
            continue;
        }
        rows.push((line, cells));
    }
    Ok(Table {
        encoding,
        delimiter,
        header,
        rows,
    })
}
