//! The catalogue CSV format: one section per row, one property per column,
//! each numeric column naming its unit in brackets (`Ix [cm4]`,
//! `mass [kg/m]`, `d [in]`), so any supplier's list can be adapted by
//! renaming its headers.
//!
//! A row gives a shape and its dimensions (the section module computes the
//! properties), or the properties directly, or both — then A, Ix, Iy, S and
//! Zx are cross-checked and a difference above 2 % is an error. Given
//! values are used where both exist (tables are authoritative for their own
//! rounding; J and Cw from a table include fillets).
//!
//! This module parses headers and rows; it does not open files (see
//! `read`), and it does not check sections against loads.
//!
//! One file per concern: the header (`schema.rs`), number cells
//! (`number.rs`), the row and its cells (`row.rs`), the shape and its
//! properties (`shape.rs`), the row's material (`material.rs`).
//! Naming and holding inputs (streams read once) is in `input.rs`; a
//! workbook's sheet is read as the same delimited text (`workbook.rs`).

pub mod generate;
pub mod input;
mod material;
pub(crate) mod number;
mod prices;
pub mod read;
pub mod records;
mod row;
mod schema;
mod shape;
pub mod workbook;

pub use number::number;
pub use prices::Prices;
pub(crate) use row::parse_row_into;
pub use row::{CellError, Materials, Row, RowMaterial, cost_per_mm, parse_row};
pub use schema::{Col, Factor, KNOWN, PriceBasis, Prop, Schema, split_header};
