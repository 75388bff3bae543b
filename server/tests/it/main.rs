//! The server's integration tests: the real router on a real port, a real SQLite file
//! in a temporary folder, real HTTP, real JPEGs. One test binary, one module per area.

mod access;
mod cli;
mod exif;
mod flags;
mod helpers;
mod review;
mod routes;
mod submissions;
mod walks;
