//! A CSV file's bytes as text: UTF-8 with or without a byte-order mark, else Windows-1252
//! (what spreadsheets on Windows write when asked for "CSV"), and its delimiter.

/// The encoding a file was read in, said in the import report.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Encoding {
    Utf8,
    Windows1252,
}

impl Encoding {
    pub fn name(self) -> &'static str {
        match self {
            Encoding::Utf8 => "UTF-8",
            Encoding::Windows1252 => "Windows-1252",
        }
    }
}

/// Windows-1252 bytes 0x80 to 0x9F (the rest is ISO 8859-1, byte = code point). The five
/// bytes the code page leaves unassigned map to the C1 control of the same number, as the
/// WHATWG Encoding Standard's index-windows-1252 does.
const HIGH: [u16; 32] = [
    0x20AC, 0x0081, 0x201A, 0x0192, 0x201E, 0x2026, 0x2020, 0x2021, 0x02C6, 0x2030, 0x0160, 0x2039,
    0x0152, 0x008D, 0x017D, 0x008F, 0x0090, 0x2018, 0x2019, 0x201C, 0x201D, 0x2022, 0x2013, 0x2014,
    0x02DC, 0x2122, 0x0161, 0x203A, 0x0153, 0x009D, 0x017E, 0x0178,
];

/// Decodes Windows-1252 bytes (every byte has a character, so this cannot fail).
pub fn windows_1252(bytes: &[u8]) -> String {
    bytes
        .iter()
        .map(|&b| match b {
            0x80..=0x9F => {
                char::from_u32(u32::from(HIGH[usize::from(b - 0x80)])).unwrap_or('\u{FFFD}')
            }
            _ => char::from(b),
        })
        .collect()
}

/// The file as text: a UTF-8 byte-order mark is dropped; bytes that are not UTF-8 are read as
/// Windows-1252.
pub fn text(bytes: &[u8]) -> (String, Encoding) {
    let bytes = bytes.strip_prefix(b"\xEF\xBB\xBF").unwrap_or(bytes);
    match std::str::from_utf8(bytes) {
        Ok(text) => (text.to_string(), Encoding::Utf8),
        Err(_) => (windows_1252(bytes), Encoding::Windows1252),
    }
}

/// The delimiter of a CSV text: whichever of comma, semicolon and tab occurs most often in
/// its header line outside quotes; a comma when none does (a one-column file).
pub fn delimiter(text: &str) -> u8 {
    let mut counts = [(b',', 0usize), (b';', 0), (b'\t', 0)];
    let mut quoted = false;
    for c in text.chars() {
        match c {
            '"' => quoted = !quoted,
            '\n' | '\r' if !quoted => break,
            _ if !quoted => {
                for (d, n) in counts.iter_mut() {
                    if c == char::from(*d) {
                        *n += 1;
                    }
                }
            }
            _ => {}
        }
    }
    counts
        .iter()
        .fold(
            (b',', 0),
            |best, &(d, n)| if n > best.1 { (d, n) } else { best },
        )
        .0
}
