"""A per-report time budget: an overrunning report becomes an error row, the run goes on.

The clock counts CPU time: a SIGVTALRM interval timer on the main thread (the
CLI process and its worker processes) and a watchdog thread reading the
thread's CPU clock elsewhere (dask runs tasks in threads).  Slow reports are made slow on purpose (a busy loop in a wrapped
reader), far beyond a small budget, so the tests do not depend on machine speed.
"""

from __future__ import annotations

import re
import signal
import threading
import time
from collections.abc import Iterator
from pathlib import Path
from typing import Any

import pandas as pd
import pytest

from pathsieve import Labeler
from pathsieve.budget import BUDGET_CHARS, BudgetExceeded, TimeBudget
from pathsieve.runner import LabelOptions, label_file

SLOW = "SLOW-REPORT-MARKER"


def _busy(seconds: float) -> None:
    # pure Python, so both the signal and the watchdog can interrupt it
    end = time.monotonic() + seconds
    while time.monotonic() < end:
        pass


@pytest.fixture(scope="module")
def labeler() -> Iterator[Labeler]:
    """A labeller whose reader spins for 30 s on any report holding the marker."""
    lab = Labeler("colorectal")
    fast_all, fast_labels = lab._read, lab._read_for_labels

    def slow(read: Any) -> Any:
        def wrapped(text: str) -> Any:
            if SLOW in text:
                _busy(30)
            return read(text)

        return wrapped

    lab._read = slow(fast_all)
    lab._read_for_labels = slow(fast_labels)
    yield lab


RECORDS = [
    ("t1", "DIAGNOSIS: Sigmoid colon, biopsy: tubular adenoma.", ""),
    ("t2", f"DIAGNOSIS: {SLOW} adenocarcinoma.", ""),
    ("t3", "DIAGNOSIS: Rectum, biopsy: adenocarcinoma.", ""),
    ("t4", "", "in.csv: row 4: column 'text' is empty"),
]


@pytest.mark.parametrize("evidence", [False, True])
def test_overrunning_report_becomes_an_error_row(labeler: Labeler, evidence: bool) -> None:
    started = time.monotonic()
    rows, ev = labeler.label_records(RECORDS, evidence=evidence, time_budget=0.3)
    # the 30 s report was cut short: the whole call is far below 30 s
    assert time.monotonic() - started < 20
    assert [r["case_id"] for r in rows] == ["t1", "t2", "t3", "t4"]
    assert [r["status"] for r in rows] == ["ok", "error", "ok", "error"]
    assert rows[1]["error"] == "case t2: exceeded the time budget of 0.3 s"
    assert rows[2]["adenocarcinoma"] == 1.0  # the report after the slow one is labelled
    assert not any(e["case_id"] == "t2" for e in ev)


def test_no_budget_means_no_clock(labeler: Labeler) -> None:
    before = signal.getsignal(signal.SIGVTALRM)
    rows, _ = labeler.label_records(RECORDS[:1], time_budget=None)
    assert rows[0]["status"] == "ok"
    assert signal.getsignal(signal.SIGVTALRM) is before


def test_budget_restores_the_callers_handler_and_timers(labeler: Labeler) -> None:
    fired: list[int] = []

    def mine(signum: int, frame: object) -> None:
        fired.append(signum)

    old_v = signal.signal(signal.SIGVTALRM, mine)
    old_r = signal.signal(signal.SIGALRM, mine)
    try:
        signal.setitimer(signal.ITIMER_VIRTUAL, 120)
        signal.setitimer(signal.ITIMER_REAL, 120)
        labeler.label_records(RECORDS[:3], time_budget=0.3)
        assert signal.getsignal(signal.SIGVTALRM) is mine
        remaining, _ = signal.getitimer(signal.ITIMER_VIRTUAL)
        assert 60 < remaining <= 121  # the caller's CPU timer was paused, not lost
        remaining, _ = signal.getitimer(signal.ITIMER_REAL)
        assert 60 < remaining <= 121  # and a wall-clock timer is left alone
        assert fired == []
    finally:
        signal.setitimer(signal.ITIMER_VIRTUAL, 0)
        signal.setitimer(signal.ITIMER_REAL, 0)
        signal.signal(signal.SIGVTALRM, old_v)
        signal.signal(signal.SIGALRM, old_r)


def test_budget_counts_cpu_time_not_waiting(labeler: Labeler) -> None:
    """A report is not failed for time the machine spent elsewhere (here: asleep)."""
    with TimeBudget(0.2) as budget, budget.watch():
        time.sleep(0.5)  # wall time passes, CPU time does not


def test_budget_in_a_thread_uses_the_watchdog(labeler: Labeler) -> None:
    # dask runs tasks in worker threads, where signals cannot be used
    out: list[Any] = []
    worker = threading.Thread(
        target=lambda: out.append(labeler.label_records(RECORDS, time_budget=0.3))
    )
    worker.start()
    worker.join(25)
    assert not worker.is_alive()
    rows, _ = out[0]
    assert [r["status"] for r in rows] == ["ok", "error", "ok", "error"]
    assert "exceeded the time budget" in rows[1]["error"]


@pytest.mark.parametrize("on_thread", [False, True])
def test_late_alarm_never_escapes(on_thread: bool) -> None:
    """Blocks ending right at the deadline either finish or raise inside the block."""
    outcomes: list[str] = []

    def run() -> None:
        with TimeBudget(0.02) as budget:
            for _ in range(40):
                try:
                    with budget.watch():
                        _busy(0.02)
                    outcomes.append("ok")
                except BudgetExceeded:
                    outcomes.append("over")
            _busy(0.05)  # a stray alarm would surface here, outside any block
        outcomes.append("done")

    if on_thread:
        t = threading.Thread(target=run)
        t.start()
        t.join(20)
    else:
        run()
    assert outcomes[-1] == "done" and len(outcomes) == 41


def test_catastrophic_regex_is_interrupted_on_the_main_thread() -> None:
    # the regex engine checks for signals, so even a backtracking match is stopped
    started = time.monotonic()
    with TimeBudget(0.2) as budget, pytest.raises(BudgetExceeded), budget.watch():
        re.match(r"(a+)+$", "a" * 40 + "b")
    assert time.monotonic() - started < 10


def test_allowance_grows_with_long_reports() -> None:
    budget = TimeBudget(30)
    assert budget.allowance(10) == 30
    assert budget.allowance(BUDGET_CHARS) == 30
    assert budget.allowance(5 * BUDGET_CHARS) == 150
    with pytest.raises(ValueError):
        TimeBudget(-1)


def test_budget_holds_in_worker_processes(labeler: Labeler, tmp_path: Path) -> None:
    """Forked workers (which inherit the wrapped labeller) apply the budget too."""
    texts = [f"DIAGNOSIS: case {i}: tubular adenoma." for i in range(12)]
    texts[7] = f"DIAGNOSIS: {SLOW}"
    src = tmp_path / "in.csv"
    pd.DataFrame({"case_id": [f"w{i}" for i in range(12)], "text": texts}).to_csv(src, index=False)
    out = tmp_path / "out.csv"
    summary = label_file(
        src,
        out,
        LabelOptions("colorectal", time_budget=0.5),
        workers=2,
        chunk_rows=3,
        labeler=labeler,
    )
    df = pd.read_csv(out, dtype=str, keep_default_na=False)
    assert df["case_id"].tolist() == [f"w{i}" for i in range(12)]
    assert df.loc[7, "error"] == "case w7: exceeded the time budget of 0.5 s"
    assert (df.drop(index=7)["status"] == "ok").all()
    assert summary.errors == 1
