//! Shared helpers of the cross-crate tests.
