//! juncture
