//! The engineering core: pure functions on SI values (m, m², m³, N, Pa, m³/s, m/s, K, s).
//! No I/O and nothing from the HTTP or storage layers. Pressures are gauge pressures.
//!
//! `analysis` runs every cylinder figure from one input; `drift` and `decay` analyse tests;
//! the other modules hold the formulas, each with its origin in its doc comment.

pub mod quantity;

pub mod air;
pub mod analysis;
pub mod buckling;
pub mod bypass;
pub mod cautions;
pub mod circuit;
pub mod cylinder;
pub mod cylinder_input;
pub mod decay;
pub mod decision;
pub mod decision_findings;
pub mod diagnosis;
pub mod drift;
pub mod due;
pub mod error;
pub mod fluid;
pub mod hazard_words;
pub mod heating;
pub mod hose_table;
pub mod installed;
pub mod limits;
pub mod other_end;
pub mod ratings;
pub mod settle;
pub mod spelling;
pub mod strength;
pub mod trend;
pub mod valve_words;
pub mod valves;
pub mod walls;
pub mod words;
pub mod worst_load;

/// Version of the calculations, stored with every analysed record so that a result can be
/// traced to the formulas that made it. Bump on any change that alters a figure.
pub const CALC_VERSION: &str = "calc-1.1.0";
