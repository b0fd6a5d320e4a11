//! In-process API and page tests: one binary, a fresh migrated SQLite file per test.

mod access; // accounts
mod accounts; // accounts
mod audit; // accounts
mod calc;
mod fuzz;
mod health;
mod helpers;
