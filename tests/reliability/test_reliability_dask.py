"""On dask, a worker killed mid-run is retried and the output is unchanged;
the per-report time budget holds in dask's worker threads too.

A real ``distributed.LocalCluster`` (two worker processes, loopback only).
``client.run`` patches the per-chunk function inside each worker process: the
first chunk labelled anywhere SIGKILLs its own worker (once, by a marker file
created atomically) after labelling and before writing.  The nanny starts a
fresh worker, the scheduler reschedules the lost partition, and the
partitioned Parquet must equal the one-process table.
"""

from __future__ import annotations

import os
import signal
import time
from collections.abc import Callable
from pathlib import Path
from typing import Any

import pandas as pd
import pytest

from pathsieve.cluster import label_dask
from pathsieve.runner import LabelOptions, label_file

distributed = pytest.importorskip("distributed")

SLOW = "SLOW-ON-DASK-MARKER"


def _arm_kill(marker: str) -> str:
    """In a worker: the first chunk labelled anywhere kills its own worker process."""
    import pathsieve.cluster as cl

    real = cl.label_chunk

    def killer(*args: Any, **kwargs: Any) -> Any:
        done = real(*args, **kwargs)
        try:
            fd = os.open(marker, os.O_CREAT | os.O_EXCL | os.O_WRONLY)
        except FileExistsError:
            return done
        os.close(fd)
        os.kill(os.getpid(), signal.SIGKILL)  # no clean-up, no goodbye to the scheduler
        return done  # pragma: no cover - not reached

    cl.label_chunk = killer
    return "armed"


def _arm_slow() -> str:
    """In a worker: a report holding the marker spins (pure Python) for 60 s."""
    import pathsieve.cluster as cl

    lab = cl.worker_pipeline("colorectal")
    for attr in ("_read", "_read_for_labels"):
        real = getattr(lab, attr)

        def slow(text: str, real: Any = real) -> Any:
            if SLOW in text:
                end = time.monotonic() + 60
                while time.monotonic() < end:
                    pass
            return real(text)

        setattr(lab, attr, slow)
    return "slow"


def test_killed_worker_is_retried_and_budget_holds_in_threads(
    tmp_path: Path, make_reports: Callable[..., Any]
) -> None:
    df = make_reports(32)
    src = tmp_path / "reports.csv"
    df.to_csv(src, index=False)
    ref = tmp_path / "ref.parquet"
    label_file(src, ref, LabelOptions("colorectal"), workers=1, chunk_rows=4)
    slow_src = tmp_path / "slow.csv"
    slow = df.copy()
    slow.loc[13, "text"] = f"DIAGNOSIS: {SLOW} adenocarcinoma."
    slow.to_csv(slow_src, index=False)

    cluster = distributed.LocalCluster(
        n_workers=2, threads_per_worker=1, processes=True, host="127.0.0.1", dashboard_address=None
    )
    client = distributed.Client(cluster)
    try:
        marker = tmp_path / "killed-once"
        assert set(client.run(_arm_kill, str(marker)).values()) == {"armed"}
        out = tmp_path / "labels"
        summary = label_dask(
            src,
            out,
            LabelOptions("colorectal"),
            client=client,
            partition_rows=8,
            chunk_rows=4,
        )
        assert marker.exists()  # a worker really died mid-run
        got = pd.read_parquet(out)
        want = pd.read_parquet(ref)
        pd.testing.assert_frame_equal(got.reset_index(drop=True), want, check_dtype=False)
        assert summary.cases == 32

        # dask labels in worker threads: the budget's watchdog, not SIGALRM, stops a report
        client.wait_for_workers(2)
        assert set(client.run(_arm_slow).values()) == {"slow"}
        started = time.monotonic()
        out2 = tmp_path / "labels-slow"
        label_dask(
            slow_src,
            out2,
            LabelOptions("colorectal", time_budget=1.0),
            client=client,
            partition_rows=8,
            chunk_rows=4,
        )
        assert time.monotonic() - started < 50
        got2 = pd.read_parquet(out2).reset_index(drop=True)
        assert (
            got2.loc[13, "error"]
            == f"case {df.loc[13, 'case_id']}: exceeded the time budget of 1 s"
        )
        same = got2.drop(index=13).reset_index(drop=True)
        same["error"] = same["error"].str.replace(str(slow_src), str(src), regex=False)
        pd.testing.assert_frame_equal(
            same, want.drop(index=13).reset_index(drop=True), check_dtype=False
        )
    finally:
        client.close()
        cluster.close()
