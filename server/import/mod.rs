//! Importing a fleet from the shop's spreadsheets (issue 19). This part reads: the bytes of a
//! CSV file as text (`decode`), its rows (`table`) and the columns a kind of record takes by
//! header name with aliases and units (`columns`). Storing the records is not built yet.

pub mod columns;
pub mod decode;
pub mod table;
