//! The test kit, one module per concept, shared by every test file (`mod common;`). Its cell
//! writer (`cell`) is `examples/support/cell.rs`, which the fixture generators share through
//! `#[path]`. Not every test uses every helper.
#![allow(dead_code)]

pub mod archive;
pub mod bin;
pub mod book;
#[path = "../../examples/support/cell.rs"]
pub mod cell;
pub mod csv;
pub mod dirs;
pub mod facts;
pub mod library;
pub mod readback;
pub mod stations;
pub mod tol;
