//! HTTP handlers, grouped by resource. They read the request, call the module that
//! does the work, and turn its answer into a response; nothing else.

pub mod assess;
pub mod export;
pub mod health;
pub mod observations;
pub mod photos;
