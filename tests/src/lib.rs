//! Cross-crate tests and checks of Standfast against published sources.
//!
//! The checks live in `tests/` as one integration-test binary with a module per
//! subject; each check names the source of its expected value beside it.
