//! One test binary, one module per subject. Every expected value names its source.

mod frame;
