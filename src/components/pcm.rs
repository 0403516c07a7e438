//! Component pcm.
