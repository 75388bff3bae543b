//! The vocabulary the phone and the server both speak: what an observer submits,
//! what the server answers, and the checked values inside them.
//!
//! The species key (`species-key`) is part of this vocabulary: the length kinds map onto
//! its own. Pure Rust: no HTTP, no SQL, no DOM. Everything here runs unchanged natively and in
//! the browser, so the app and the server validate a record with the same code.

pub mod codes;
pub mod exif;
pub mod fieldwork;
pub mod limits;
pub mod problem;
pub mod record;
pub mod review;
pub mod values;
pub mod walk;

pub use fieldwork::*;
pub use problem::ErrorBody;
pub use record::*;
pub use review::*;
pub use values::*;
pub use walk::*;
