//! ironwind: plans the rewinding of salvaged laminated transformer cores.
//!
//! A pure library: measured core → geometry; job → plan (turns, wire, layout, losses, heating,
//! checks); probe measurements → flux limits; renderers for text, JSON, CSV and the bench card.
//! The command-line interface in `cli` is a thin layer over it.
#![deny(missing_docs)]

pub mod capacity;
pub mod cli;
pub mod data;
pub mod diagnose;
pub mod error;
pub mod flags;
pub mod geometry;
pub mod input;
pub mod job;
pub mod layout;
pub mod leakage;
pub mod losses;
pub mod magnetics;
pub mod magnetising;
pub mod plan;
pub mod probe;
pub mod rate;
pub mod rectifier;
pub mod render;
pub mod shelf;
pub mod store;
pub mod units;
pub mod verdict;
pub mod wire;

pub use error::{Error, Result};
