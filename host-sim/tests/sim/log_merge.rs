//! log_merge
