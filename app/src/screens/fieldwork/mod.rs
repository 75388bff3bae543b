//! The desk's screens for the people who go out: live animals awaiting help and the
//! response log ([`urgent`], [`response`]), samples and the carcass report on a record
//! ([`samples`], [`carcass`]), finding an animal from a sample's id ([`lookup`]), and
//! the notes that put a refusal beside the field it names ([`notes`]). Each file keeps
//! its words in one `words` module at its top.

mod carcass;
pub mod lookup;
mod notes;
pub mod on_record;
mod response;
mod samples;
pub mod urgent;
