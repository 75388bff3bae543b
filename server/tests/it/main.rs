//! The server's integration tests: the real router on a real port, a real SQLite file
//! in a temporary folder, real HTTP, real JPEGs. One test binary, one module per area.

mod access;
mod assess_cli;
mod attacker;
mod backup;
mod cli;
mod consent;
mod decode_gate;
mod deploy;
mod derivatives;
mod disk_full;
mod duplicates;
mod exif;
mod exports;
mod faults;
mod fieldwork;
mod flags;
mod hardening;
mod helpers;
mod hostile;
mod key_priors;
mod limits;
mod people;
mod photo_flags;
mod pictures;
mod process;
mod publishing;
mod python;
mod regressions;
mod review;
mod routes;
mod similar;
mod slow_clients;
mod submissions;
mod walks;
