//! The server's integration tests: the real router on a real port, a real SQLite file
//! in a temporary folder, real HTTP, real JPEGs. One test binary, one module per area.

mod cli;
mod derivatives;
mod exif;
mod flags;
mod helpers;
mod hostile;
mod routes;
mod similar;
mod submissions;
