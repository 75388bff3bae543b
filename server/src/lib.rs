//! wrackline's server and command line, as a library so that the binary, the tests
//! and the benchmarks all run the same code.
//!
//! Layers, top to bottom; a module uses only modules on its own line's right or on lines
//! below it (`xtask`'s tidy test checks this on every `crate::` path):
//!
//! - the edges: [`cli`] and [`commands`] (the `wrackline` command), [`router`],
//!   [`handlers`] and [`error`] (the only code that knows HTTP), [`demo`];
//! - [`arrival`]: what happens when a record arrives, stage after stage, [`import`], records
//!   kept elsewhere brought in through it, and [`state`], what every handler may reach;
//! - the stages in the order a record travels, with no HTTP in them: [`export`] and
//!   [`assess`] → [`protect`] → [`review`] → [`duplicates`] and [`notify`] (the
//!   responders) → [`intake`], beside them [`people`] (sign-ins);
//! - [`store`]: the only code that runs SQL;
//! - [`taxa`]: names to checklist taxa, the lookup every stage shares; [`settings`],
//!   the operator's settings.

pub mod arrival;
pub mod assess;
pub mod cli;
pub mod commands;
pub mod demo;
pub mod duplicates;
pub mod error;
pub mod export;
pub mod handlers;
pub mod import;
pub mod intake;
pub mod notify;
pub mod people;
pub mod protect;
pub mod review;
pub mod router;
pub mod settings;
pub mod state;
pub mod store;
pub mod taxa;

pub use router::{app, serve};
pub use state::AppState;
