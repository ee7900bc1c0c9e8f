//! Integration tests: each module drives the real `ironwind` binary through one command.

mod card_cmd;
mod common;
mod contract;
mod core_cmd;
mod corpus;
mod demo;
mod diagnose;
mod first_hour;
mod golden;
mod hostile;
mod input_errors;
mod look;
mod plan_cmd;
mod probe_cmd;
mod rate_cmd;
mod readme;
mod shelf_cmd;
mod windings;
mod wire_cmd;
