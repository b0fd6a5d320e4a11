//! In-process API and page tests: one binary, a fresh migrated SQLite file per test.

pub mod access; // accounts
pub mod accounts; // accounts
pub mod accounts_cli; // accounts
mod all_problems; // issue 14: every problem at once
mod audit; // accounts
mod calc;
mod calc_errors;
mod calc_page;
mod fuzz;
mod hardening;
mod health;
mod helpers;
mod readings_and_strength; // issue 12: vacuum readings, tube, new fields
mod worst_load; // issue 12: load range, relief setting, unrated ends
// registry
mod cylinders;
mod demo;
mod hose_ratings;
mod hoses;
mod import_read;
mod import_registry;
mod machine_lists;
mod machines;
mod registry_fixtures;
mod registry_forms;
mod registry_pages;
mod sites;
mod valves;
// shop
mod drift_tests;
mod inspections;
mod safety_sources;
mod service_status;
mod shop_first;
mod shop_history;
mod shop_pages; // issue 14
// reports
mod reports;
