//! HTTP handlers, grouped by resource. They read the request, call the module that
//! does the work, and turn its answer into a response; nothing else. `connections`
//! accepts and times out the connections they are served on.

pub mod access;
pub mod app_files;
pub mod assess;
pub mod checklist;
pub mod connections;
pub mod dataset;
pub mod export;
pub mod fieldwork;
pub mod guard;
pub mod health;
pub mod mine;
pub mod observations;
pub mod people;
pub mod photos;
pub mod review;
pub mod session;
pub mod site;
pub mod walks;
