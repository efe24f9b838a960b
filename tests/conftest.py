"""Shared test settings: hypothesis profiles (ci by default; `--hypothesis-profile=large`)."""

from hypothesis import HealthCheck, settings

settings.register_profile(  # the same examples on every run: a run passes or fails by the code
    "ci", max_examples=60, deadline=None, suppress_health_check=[HealthCheck.too_slow],
    derandomize=True,
)
settings.register_profile(
    "large", max_examples=25_000, deadline=None, suppress_health_check=list(HealthCheck)
)
settings.register_profile(
    "medium", max_examples=2_500, deadline=None, suppress_health_check=list(HealthCheck)
)
settings.load_profile("ci")


def pytest_terminal_summary(terminalreporter):
    """After a run that fuzzed the solver, say how many cases and the worst residual."""
    import sys

    module = sys.modules.get("test_solve_properties") or sys.modules.get(
        "tests.core.test_solve_properties"
    )
    stats = getattr(module, "STATS", None)
    if stats and stats["cases"]:
        terminalreporter.write_line(
            f"solver fuzz: {stats['cases']} cases, {stats['no_solution']} ended in the clear "
            f"no-solution error, worst relative residual {stats['worst_residual']:.2e}; "
            f"{stats['ill_conditioned']} ill-conditioned total-flow cases within their "
            f"widened tolerance (worst {stats['worst_ill_conditioned']:.2e})"
        )

    calibration = sys.modules.get("test_reconcile_calibration")
    rates = getattr(calibration, "RATES", None)
    if rates:
        terminalreporter.write_line("reconciliation by simulation: " + "; ".join(
            f"{name} {rate:.1%}" for name, rate in rates.items()))
