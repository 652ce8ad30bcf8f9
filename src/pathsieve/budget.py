"""A time budget per report, so one pathological report cannot stall a run.

A night-long run must not hang on one report (a regex gone quadratic, a
megabyte of one token).  :class:`TimeBudget` bounds the time spent on each
report: when a report overruns, :class:`BudgetExceeded` is raised inside the
labelling code and the caller turns the report into an error row.

The budget counts **CPU time**, not wall-clock time: on a shared machine a
report must not fail because other processes took the cores (a wall-clock
budget would make the output depend on the machine's load).  How the clock
interrupts the work depends on the thread:

* on the main thread (the ``pathsieve label`` process and its worker
  processes) a ``SIGVTALRM`` interval timer (``signal.setitimer`` with
  ``ITIMER_VIRTUAL``, the process's CPU time) fires; Python runs the handler
  between bytecodes and inside the regex engine, so even a backtracking ``re``
  match is stopped.  The previous handler and any such timer already running
  are restored afterwards.
* on any other thread (dask runs tasks in a worker's thread pool) signals
  cannot be used; a watchdog thread reads the labelling thread's CPU clock and
  raises the exception asynchronously in it.  That is checked between
  bytecodes only, so a single long call into C (one huge regex match) overruns
  until it returns.

The allowance grows with the text: ``seconds`` for a report of up to
:data:`BUDGET_CHARS` characters, proportionally more for a longer one, so a
legitimately huge report is not mistaken for a hang.

>>> budget = TimeBudget(30)
>>> with budget:
...     with budget.watch(len("DIAGNOSIS: adenoma.")):
...         pass
>>> budget.allowance(5_000_000)
150.0
"""

from __future__ import annotations

import ctypes
import signal
import threading
import time
from collections.abc import Iterator
from contextlib import contextmanager
from types import FrameType, TracebackType
from typing import Any

__all__ = ["BUDGET_CHARS", "DEFAULT_BUDGET", "BudgetExceeded", "TimeBudget"]

#: Default CPU seconds per report (per :data:`BUDGET_CHARS` characters of a longer one).
DEFAULT_BUDGET = 60.0
#: Reports longer than this many characters get a proportionally larger allowance.
BUDGET_CHARS = 1_000_000


class BudgetExceeded(BaseException):
    """A report ran past its time budget.

    A ``BaseException`` (like ``KeyboardInterrupt``): a broad ``except
    Exception`` inside the pipeline must not swallow it.
    """


class TimeBudget:
    """Bound the CPU time of each :meth:`watch` block; use as a context manager.

    ``seconds`` of ``None`` or ``0`` means no budget (the blocks run unbounded).
    """

    def __init__(self, seconds: float | None) -> None:
        if seconds is not None and seconds < 0:
            raise ValueError(f"time budget must be positive, not {seconds}")
        self.seconds = float(seconds) if seconds else 0.0
        self._armed = False
        self._signals = False
        self._old_handler: Any = None
        self._old_timer: tuple[float, float] = (0.0, 0.0)
        self._watchdog: _Watchdog | None = None

    def allowance(self, chars: int) -> float:
        """Seconds allowed for a text of ``chars`` characters."""
        return self.seconds * max(1.0, chars / BUDGET_CHARS)

    # ------------------------------------------------------------ installing the clock

    def __enter__(self) -> TimeBudget:
        if not self.seconds:
            return self
        on_main = threading.current_thread() is threading.main_thread()
        if on_main and hasattr(signal, "setitimer"):
            self._signals = True
            self._old_handler = signal.signal(signal.SIGVTALRM, self._on_alarm)
            # a timer someone else armed is paused here and re-armed on exit
            self._old_timer = signal.setitimer(signal.ITIMER_VIRTUAL, 0)
        else:
            self._watchdog = _Watchdog(threading.get_ident())
        return self

    def __exit__(
        self, exc_type: object, exc: BaseException | None, tb: TracebackType | None
    ) -> None:
        if self._signals:
            self._armed = False
            signal.setitimer(signal.ITIMER_VIRTUAL, 0)
            signal.signal(signal.SIGVTALRM, self._old_handler)
            delay, interval = self._old_timer
            if delay > 0:
                signal.setitimer(signal.ITIMER_VIRTUAL, delay, interval)
            self._signals = False
        if self._watchdog is not None:
            self._watchdog.stop()
            self._watchdog = None

    def _on_alarm(self, signum: int, frame: FrameType | None) -> None:
        # a signal that arrives after the block ended (already disarmed) is ignored
        if self._armed:
            self._armed = False
            raise BudgetExceeded

    # ------------------------------------------------------------ one report

    @contextmanager
    def watch(self, chars: int = 0) -> Iterator[None]:
        """Raise :class:`BudgetExceeded` inside this block if it overruns."""
        if not self.seconds:
            yield
            return
        limit = self.allowance(chars)
        if self._signals:
            self._armed = True
            signal.setitimer(signal.ITIMER_VIRTUAL, limit)
            try:
                yield
            finally:
                self._armed = False  # first: a late alarm now does nothing
                signal.setitimer(signal.ITIMER_VIRTUAL, 0)
        elif self._watchdog is not None:
            self._watchdog.arm(limit)
            try:
                yield
            finally:
                fired = self._watchdog.disarm()
            if fired:
                # the clock ran out just as the block ended: the report still overran
                raise BudgetExceeded
        else:  # not entered: no clock to watch with
            yield


class _Watchdog:
    """A thread that raises :class:`BudgetExceeded` in another thread once that
    thread has used its allowance of CPU time (wall-clock time where the platform
    has no per-thread CPU clock)."""

    def __init__(self, target: int) -> None:
        self._target = target
        try:
            clock = time.pthread_getcpuclockid(target)
            self._now: Any = lambda: time.clock_gettime(clock)
        except (AttributeError, OSError):  # pragma: no cover - not on Linux/BSD
            self._now = time.monotonic
        self._cond = threading.Condition()
        self._deadline: float | None = None
        self._fired = False
        self._stopped = False
        self._thread = threading.Thread(target=self._run, name="pathsieve-budget", daemon=True)
        self._thread.start()

    def arm(self, seconds: float) -> None:
        with self._cond:
            self._fired = False
            self._deadline = self._now() + seconds
            self._cond.notify()

    def disarm(self) -> bool:
        """Stop the clock; whether it fired (a pending exception is withdrawn)."""
        with self._cond:
            self._deadline = None
            fired = self._fired
            self._fired = False
        if fired:
            # the exception may not have been raised yet: withdraw it, the caller raises
            ctypes.pythonapi.PyThreadState_SetAsyncExc(ctypes.c_ulong(self._target), None)
        return fired

    def stop(self) -> None:
        with self._cond:
            self._stopped = True
            self._deadline = None
            self._cond.notify()
        self._thread.join()

    def _run(self) -> None:
        with self._cond:
            while not self._stopped:
                if self._deadline is None:
                    self._cond.wait()
                    continue
                left = self._deadline - self._now()
                if left > 0:
                    # CPU time passes no faster than wall time: sleep until it may be up
                    self._cond.wait(max(left, 0.001))
                    continue
                self._deadline = None
                self._fired = True
                ctypes.pythonapi.PyThreadState_SetAsyncExc(
                    ctypes.c_ulong(self._target), ctypes.py_object(BudgetExceeded)
                )
