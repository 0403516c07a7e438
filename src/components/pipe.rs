//! Component pipe.
