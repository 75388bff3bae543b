//! The record form and its parts: the form itself, its photos, the guided key panel
//! and the key's pictures.

pub mod form;
mod key;
mod live;
mod photos;
mod pictures;
