//! SVG drawings (filled in later).
