"""Waiting on the app's workers in tests (shared by the fixtures and the key fuzzer)."""

from __future__ import annotations


async def workers_done(app) -> None:
    """Wait for the app's workers to end. A worker a newer edit cancelled ends too: its answer
    is dropped, as the app means it to be (Textual's wait raises for it)."""
    from textual.worker import WorkerCancelled

    for _ in range(100):
        try:
            await app.workers.wait_for_complete()
            return
        except WorkerCancelled:
            continue
