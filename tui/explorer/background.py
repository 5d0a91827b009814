"""Slow engine work for the explorer's workers, run in daemon threads.

Textual's thread workers run in the event loop's default executor, whose threads the interpreter
waits for when the explorer quits: quitting while Fe-C was being mapped took 3.9 s to give the
shell back (measured). A daemon thread is not waited for; its answer, when it comes after the
explorer has closed, is dropped.
"""

from __future__ import annotations

import asyncio
import threading
from collections.abc import Callable
from functools import partial
from typing import TypeVar

T = TypeVar("T")


async def in_background(work: Callable[[], T]) -> T:
    """Run `work()` in a daemon thread and return its answer (or raise its error); for
    `run_worker`, which then answers keys while it runs."""
    loop = asyncio.get_running_loop()
    answer: asyncio.Future = loop.create_future()

    def settle(outcome: Callable[[], None]) -> None:
        if not answer.done():
            outcome()

    def run() -> None:
        try:
            outcome = partial(answer.set_result, work())
        except Exception as error:            # handed to the worker, which reports it
            outcome = partial(answer.set_exception, error)
        try:
            loop.call_soon_threadsafe(settle, outcome)
        except RuntimeError:                   # the explorer has closed: nobody waits for it
            pass

    threading.Thread(target=run, daemon=True, name="ladle-explorer-work").start()
    return await answer
