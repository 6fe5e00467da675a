"""Background jobs stopped from another thread (app.interrupt): at once while they run,
before they start if not yet started, never after they are done."""

import threading

import pytest

from app.interrupt import Interrupted, Interruptible


def _endless(started: threading.Event) -> None:
    started.set()
    while True:  # pure Python, no place that asks whether it is still wanted
        try:
            sum(range(100))
        except Exception:  # noqa: BLE001 - a job's own handlers must not swallow the stop
            pass


def test_a_running_job_stops_at_once_from_another_thread():
    guard = Interruptible()
    started = threading.Event()
    outcome = []

    def worker():
        try:
            guard.run(lambda: _endless(started))
        except Interrupted:
            outcome.append("stopped")
        outcome.append(sum(range(10)))  # the thread goes on normally afterwards

    thread = threading.Thread(target=worker, daemon=True)
    thread.start()
    assert started.wait(10)
    assert guard.interrupt()
    thread.join(20)
    assert not thread.is_alive()
    assert outcome == ["stopped", 45]
    assert not guard.interrupt()  # once only


def test_a_job_stopped_before_it_starts_never_runs():
    guard = Interruptible()
    ran = []
    assert guard.interrupt()
    with pytest.raises(Interrupted):
        guard.run(lambda: ran.append(1))
    assert ran == []


def test_a_finished_job_is_not_disturbed():
    guard = Interruptible()
    assert guard.run(lambda: 6 * 7) == 42
    assert not guard.interrupt()
    assert sum(range(10000)) == 49995000  # nothing pending is raised in this thread
