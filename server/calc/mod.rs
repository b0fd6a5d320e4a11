//! The engineering core: pure calculations in SI, no I/O and no web types.

pub mod quantity;
