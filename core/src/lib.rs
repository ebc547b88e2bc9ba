//! Fluxledger core: control-volume balances for things moving fluid pushes on.
//!
//! Every calculator in the handbook is a view onto one balance over the ports of a
//! control volume: the Reynolds transport theorem applied to mass, linear momentum,
//! angular momentum and energy (see [`engine`]). A key design decision of this
//! crate is that it knows nothing of JSON, JavaScript, files or the browser: it takes
//! typed text or typed quantities and returns plain data (numbers, tables, drawing
//! primitives, warnings) that an adapter may serialise. Everything inside is SI.
//!
//! - [`units`]: the strict quantity parser and result formatter.
//! - [`decimal`]: decimal number text read into `f64` (the parser's reader).
//! - [`fluid`]: water properties from 0 to 100 °C and custom fluids.
//! - [`friction`]: the Darcy friction factor (laminar, Colebrook).
//! - [`pipe_sizes`]: pipe size presets (outside and inside diameters).
//! - [`vector`]: three-component vectors and unit directions.
//! - [`velocity_profile`]: momentum-flux and kinetic-energy correction factors.
//! - [`engine`]: ports, control volumes, frames, and the balances with their ledger.
//! - [`glossary`]: the one vocabulary of query keys and the alias table of old keys.
//! - [`catalog`]: the description of each calculator and the shape of a solution.
//! - [`calculators`]: the handbook's calculators, registered in one list.
//! - [`numeric`]: root finding and peak search.
//! - [`restraint`]: the restraint model shared by the thrust-restraint pages.
//! - [`quadrature`]: tanh-sinh integration for end-singular integrands.
//! - [`error`]: typed errors that name the field, the problem and the valid range.
//! - [`verification`]: runs a sourced reference case and judges it (tests and the
//!   live verification page share it).

pub mod calculators;
pub mod catalog;
pub mod decimal;
pub mod engine;
pub mod error;
pub mod fluid;
pub mod friction;
pub mod glossary;
pub mod numeric;
pub mod pipe_sizes;
pub mod quadrature;
pub mod restraint;
#[cfg(test)]
mod test_random;
pub mod units;
pub mod vector;
pub mod velocity_profile;
pub mod verification;

pub use calculators::{solve, Outcome};
pub use catalog::Request;
pub use error::{FieldError, FieldErrorKind, FieldErrors, SolveError};
pub use units::{QuantityKind, UnitSystem};
