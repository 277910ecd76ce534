#![deny(missing_docs)]
//! lossledger: audits piping from spreadsheet schedules — friction and fitting losses line by line,
//! velocity and loss findings, and an annotated workbook in which every number traces to its cell.
//!
//! Data flows one way: [`ingest`] (calamine) → [`table`] (polars) → [`audit`] → [`report`]
//! (rust_xlsxwriter, JSON, console). [`physics`] holds the pure correlations the audit uses.

pub mod audit;
pub mod cli;
pub mod compare;
pub mod demo;
pub mod error;
pub mod ingest;
pub mod physics;
pub mod pipeline;
pub mod report;
pub mod review;
pub mod sentence;
pub mod table;
pub mod template;
pub mod units;
pub mod worker;
