//! The server's integration tests: the real router on a real port, a real SQLite file
//! in a temporary folder, real HTTP, real JPEGs. One test binary, one module per area.

mod access;
mod assess_cli;
mod cli;
mod decode_gate;
mod derivatives;
mod duplicates;
mod exif;
mod exports;
mod fieldwork;
mod flags;
mod helpers;
mod hostile;
mod key_priors;
mod people;
mod photo_flags;
mod pictures;
mod python;
mod regressions;
mod review;
mod routes;
mod similar;
mod submissions;
mod walks;
