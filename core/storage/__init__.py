"""The files people keep: where they live (paths), settings, the user's presets, safe TOML reading
and writing, and saves that are never half-written (atomic)."""
