//! The demo fleet and the scale generator (filled in by the registry work).

use crate::db::Db;

/// Loads the invented demo fleet from `seed-demo/` into `db`; returns a summary to print.
pub async fn load_demo(_db: &Db) -> Result<String, String> {
    Err("the demo fleet is not loaded yet in this build".into())
}

/// Generates `n` machines of synthetic fleet for benchmarks; returns a summary to print.
pub async fn generate(_db: &Db, _n: u32) -> Result<String, String> {
    Err("the scale generator is not in this build yet".into())
}
