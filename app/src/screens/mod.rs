//! The screens, as Leptos views. Screens read and change the phone's state only through
//! `crate::data`; each file below holds one screen or one part of one. Each bundle
//! compiles its own: the phone's page ([`phone`]) and its recording screens, or with the
//! `desk` feature the desk's page ([`desk`]) and its screens; [`safety`] is in both.

mod language;
mod safety;

#[cfg(not(feature = "desk"))]
mod about_you;
#[cfg(not(feature = "desk"))]
mod mine;
#[cfg(not(feature = "desk"))]
mod on_this_phone;
#[cfg(not(feature = "desk"))]
pub mod phone;
#[cfg(not(feature = "desk"))]
mod record;
#[cfg(not(feature = "desk"))]
mod walk;

#[cfg(feature = "desk")]
pub mod desk;
#[cfg(feature = "desk")]
mod downloads;
#[cfg(feature = "desk")]
mod fieldwork;
#[cfg(feature = "desk")]
mod figures;
#[cfg(feature = "desk")]
mod people;
#[cfg(feature = "desk")]
mod review;
#[cfg(feature = "desk")]
mod sign_in;
