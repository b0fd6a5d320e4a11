//! In-process API and page tests: one binary, a fresh migrated SQLite file per test.

mod access; // accounts
mod accounts; // accounts
mod accounts_cli; // accounts
mod audit; // accounts
mod calc;
mod calc_errors;
mod calc_page;
mod fuzz;
mod health;
mod helpers;
// registry
mod cylinders;
mod demo;
mod hoses;
mod machine_lists;
mod machines;
mod registry_fixtures;
mod registry_forms;
mod registry_pages;
mod sites;
// shop
mod drift_tests;
mod inspections;
mod safety_sources;
mod service_status;
mod shop_history;
mod shop_pages;
// reports
mod reports;
