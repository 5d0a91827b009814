"""The explorer's slow work runs in daemon threads (tui/explorer/background.py): the answer or the
error comes back to the event loop, and quitting does not wait for a thread still computing."""

import asyncio
import threading

import pytest

from ladle.tui.explorer.background import in_background


def test_the_answer_and_the_error_come_back_from_a_daemon_thread():
    seen = []

    def work():
        seen.append(threading.current_thread().daemon)
        return 42

    assert asyncio.run(in_background(work)) == 42 and seen == [True]

    def fails():
        raise ValueError("no answer")

    with pytest.raises(ValueError, match="no answer"):
        asyncio.run(in_background(fails))


def test_an_answer_after_the_loop_has_closed_is_dropped(monkeypatch):
    release = threading.Event()
    raised = []
    monkeypatch.setattr(threading, "excepthook", raised.append)

    def slow():
        release.wait(5.0)
        return 1

    async def give_up():
        task = asyncio.ensure_future(in_background(slow))
        await asyncio.sleep(0.01)
        task.cancel()

    asyncio.run(give_up())          # the loop closes while the thread still computes
    (worker,) = [t for t in threading.enumerate() if t.name == "ladle-explorer-work"]
    release.set()
    worker.join(5.0)
    assert not worker.is_alive() and raised == []     # it ended without an error
