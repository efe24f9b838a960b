"""branches."""
