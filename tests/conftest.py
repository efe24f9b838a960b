"""Shared test settings: hypothesis profiles (ci by default; `--hypothesis-profile=large`)."""

from hypothesis import HealthCheck, settings

settings.register_profile(
    "ci", max_examples=60, deadline=None, suppress_health_check=[HealthCheck.too_slow]
)
settings.register_profile(
    "large", max_examples=25_000, deadline=None, suppress_health_check=list(HealthCheck)
)
settings.load_profile("ci")
