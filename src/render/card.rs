//! The bench card (filled in by the card issue).
