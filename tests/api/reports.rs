//! The manager's reports (`/api/v1/reports/*`, `/reports/*`) over small fleets built through
//! the API, each with known due items. Every `as_of` is fixed, so no check depends on today's
//! date; the day counts beside each check are calendar arithmetic worked by hand ([C]).

mod due;
pub mod fleet;
mod lists;
mod pages;
mod resources;
