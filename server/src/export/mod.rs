//! Exports of stored records, with no HTTP in them: the command line and the HTTP
//! handlers call the same functions.

pub mod csv;
