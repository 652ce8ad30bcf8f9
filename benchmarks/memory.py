#!/usr/bin/env python3
"""Memory: label 1,000,000 generated reports to Parquet and measure peak RSS.

Generates the reports (benchmarks/corpus.py, streamed to a Parquet file with
one row group per 10,000 reports), then runs ``pathsieve label`` on it in a
child process exactly as a user would::

    python -m pathsieve label reports.parquet --scheme S -o labels.parquet --workers W

and measures that process's peak resident set size (``ru_maxrss`` from
``wait4``), plus, sampled every 0.2 s, the resident and proportional set
size of the whole process tree (with ``--workers`` > 1 the worker processes
share the parent's pages, so their summed RSS over-counts and PSS is the
fair total).  Target: peak RSS under 400 MB.  May take many minutes at the
default size; ``-n`` makes it shorter.

    .venv/bin/python benchmarks/memory.py                   # 1,000,000 reports
    .venv/bin/python benchmarks/memory.py -n 100000 --workers 2 --evidence

Prints the figures and, as the last line, a JSON summary.
"""

from __future__ import annotations

import argparse
import json
import os
import shutil
import subprocess
import sys
import tempfile
import threading
import time
from collections.abc import Sequence
from pathlib import Path

HERE = Path(__file__).resolve().parent
sys.path.insert(0, str(HERE))

import corpus  # noqa: E402  (the invented-report generator beside this file)

__all__ = ["main", "tree_memory"]

TARGET_MB = 400.0


def _children(pid: int) -> list[int]:
    try:
        with open(f"/proc/{pid}/task/{pid}/children") as fh:
            return [int(x) for x in fh.read().split()]
    except OSError:
        return []


def _status_kb(pid: int, field: str) -> int:
    try:
        with open(f"/proc/{pid}/status") as fh:
            for line in fh:
                if line.startswith(field + ":"):
                    return int(line.split()[1])
    except OSError:
        pass
    return 0


def _pss_kb(pid: int) -> int:
    try:
        with open(f"/proc/{pid}/smaps_rollup") as fh:
            for line in fh:
                if line.startswith("Pss:"):
                    return int(line.split()[1])
    except OSError:
        pass
    return 0


def tree_memory(pid: int) -> tuple[int, int, int]:
    """(process count, summed RSS KiB, summed PSS KiB) of ``pid`` and its descendants."""
    todo, seen = [pid], []
    while todo:
        p = todo.pop()
        seen.append(p)
        todo.extend(_children(p))
    return (
        len(seen),
        sum(_status_kb(p, "VmRSS") for p in seen),
        sum(_pss_kb(p) for p in seen),
    )


class _Sampler(threading.Thread):
    def __init__(self, pid: int, every: float = 0.2) -> None:
        super().__init__(daemon=True)
        self.pid, self.every = pid, every
        self.peak_rss = self.peak_pss = self.peak_procs = 0
        self.done = threading.Event()

    def run(self) -> None:
        while not self.done.is_set():
            procs, rss, pss = tree_memory(self.pid)
            self.peak_rss = max(self.peak_rss, rss)
            self.peak_pss = max(self.peak_pss, pss)
            self.peak_procs = max(self.peak_procs, procs)
            self.done.wait(self.every)


def main(argv: Sequence[str] | None = None) -> int:
    ap = argparse.ArgumentParser(
        description=__doc__, formatter_class=argparse.RawDescriptionHelpFormatter
    )
    ap.add_argument("-n", type=int, default=1_000_000, help="reports (default 1,000,000)")
    ap.add_argument("--seed", type=int, default=0)
    ap.add_argument("--organ", default="mixed", help="corpus organ or 'mixed' (default)")
    ap.add_argument("--scheme", default="colorectal")
    ap.add_argument("--workers", type=int, default=1, help="label processes (default 1)")
    ap.add_argument("--evidence", action="store_true", help="also write the evidence table")
    ap.add_argument("--workdir", help="where to write the files (default: a temp folder)")
    ap.add_argument("--keep", action="store_true", help="keep the generated files")
    args = ap.parse_args(argv)

    work = Path(args.workdir or tempfile.mkdtemp(prefix="pathsieve-memory-"))
    work.mkdir(parents=True, exist_ok=True)
    src = work / f"reports-{args.n}-{args.seed}-{args.organ}.parquet"
    t0 = time.perf_counter()
    if not src.exists():
        corpus.write_corpus(src, args.n, seed=args.seed, organ=args.organ, chunk_rows=10_000)
    gen_s = time.perf_counter() - t0
    print(
        f"input: {args.n} generated reports -> {src} "
        f"({src.stat().st_size / 1e6:.0f} MB Parquet, {gen_s:.0f} s to generate)"
    )

    out = work / "labels.parquet"
    cmd = [
        sys.executable,
        "-m",
        "pathsieve",
        "label",
        str(src),
        "--scheme",
        args.scheme,
        "-o",
        str(out),
        "--workers",
        str(args.workers),
        "--no-progress",
    ]
    if args.evidence:
        cmd += ["--evidence", str(work / "evidence.parquet")]
    print("running:", " ".join(cmd[2:]))
    t0 = time.perf_counter()
    log = work / "label.log"
    # the child's messages go to a file: a full pipe nobody reads would stall it
    with log.open("wb") as log_fh:
        proc = subprocess.Popen(cmd, stdout=subprocess.DEVNULL, stderr=log_fh)
    sampler = _Sampler(proc.pid)
    sampler.start()
    _, status, usage = os.wait4(proc.pid, 0)
    elapsed = time.perf_counter() - t0
    sampler.done.set()
    sampler.join()
    proc.returncode = os.waitstatus_to_exitcode(status)
    if proc.returncode != 0:
        print(log.read_text(errors="replace")[-2000:], file=sys.stderr)
        print(json.dumps({"benchmark": "memory", "error": f"exit {proc.returncode}"}))
        return 1

    import pyarrow.parquet as pq

    rows = pq.ParquetFile(out).metadata.num_rows
    peak_mb = usage.ru_maxrss / 1024  # KiB on Linux
    tree_rss_mb, tree_pss_mb = sampler.peak_rss / 1024, sampler.peak_pss / 1024
    print(
        f"\nlabelled {rows} reports in {elapsed:.0f} s ({rows / elapsed:.0f} reports/s, "
        f"{args.workers} worker{'s' if args.workers > 1 else ''})"
    )
    print(f"peak RSS of the labelling process: {peak_mb:.0f} MB (target < {TARGET_MB:.0f} MB)")
    print(
        f"process tree, sampled every 0.2 s: peak RSS sum {tree_rss_mb:.0f} MB, "
        f"peak PSS sum {tree_pss_mb:.0f} MB, {sampler.peak_procs} process(es)"
    )
    ok = rows == args.n and peak_mb < TARGET_MB
    summary = {
        "benchmark": "memory",
        "reports": args.n,
        "rows_written": rows,
        "workers": args.workers,
        "evidence": args.evidence,
        "seconds": round(elapsed, 1),
        "reports_per_s": round(rows / elapsed, 1),
        "peak_rss_mb": round(peak_mb, 1),
        "tree_peak_rss_mb": round(tree_rss_mb, 1),
        "tree_peak_pss_mb": round(tree_pss_mb, 1),
        "target_mb": TARGET_MB,
        "target_met": ok,
    }
    if not args.keep and not args.workdir:
        shutil.rmtree(work, ignore_errors=True)
    print(json.dumps(summary))
    return 0 if ok else 1


if __name__ == "__main__":
    raise SystemExit(main())
