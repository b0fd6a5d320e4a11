//! In-process API and page tests: one binary, a fresh migrated SQLite file per test.

mod health;
mod helpers;
