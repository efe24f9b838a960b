"""storage."""
