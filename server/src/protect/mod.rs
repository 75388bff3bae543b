//! What leaves the server for whom: the public form of a record's place. Sensitive
//! species are generalised or withheld ([`generalise`], Chapman 2020) wherever records
//! reach people who are not reviewers: exports, figures and the guided key's counts.

pub mod generalise;
