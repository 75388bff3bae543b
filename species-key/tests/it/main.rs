//! Integration tests of the species key: one binary, one module per feature.

mod checklist_format;
mod higher_taxa;
mod lengths;
mod questions;
mod ranking;
mod separation;
mod support;
mod translations;
