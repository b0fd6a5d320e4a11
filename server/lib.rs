//! Loadhold: a registry of a fleet's hydraulic cylinders and hoses, and the engineering core
//! that says what pressure each failure can produce and why a cylinder drifted.
//!
//! Data flows one way: HTTP handler (`api`, `pages`) -> parse to domain types -> `calc` and
//! `db` -> view struct -> template or JSON. Nothing in `calc` or `db` knows about HTTP.

pub mod api;
pub mod app;
pub mod auth;
pub mod calc;
pub mod db;
pub mod error;
pub mod import;
pub mod log_format;
pub mod pages;
pub mod seed;
pub mod serve;
