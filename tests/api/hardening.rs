//! Hardening (issue 15): what an attacker, a tired user and a broken disk would find. One
//! module per concern; each test fails on the code before the fix. Invented test data.

mod csv_cells;
mod database;
mod logins;
mod names;
mod operations;
mod passwords;
mod plausibility;
mod tokens;
