#!/usr/bin/env python3
"""Long reports: labelling time must grow linearly with a report's length.

A pasted export, a merged document or a runaway OCR job can put megabytes in
one report cell.  This labels single reports of growing size (generated
reports joined end to end, so every size has the same mix of sections, short
forms and misspellings) and prints the CPU seconds per size and per million
characters.  Linear work keeps the per-million figure flat; the summary's
``growth`` is (time per character at the largest size) / (at the smallest),
which stays near 1 when labelling is linear (target <= 1.5; on a shared
machine allow for noise).

    .venv/bin/python benchmarks/long_report.py                  # 0.25 to 4 MB
    .venv/bin/python benchmarks/long_report.py --sizes 0.5 1 2 --evidence

Prints the figures and, as the last line, a JSON summary.
"""

from __future__ import annotations

import argparse
import json
import sys
import time
from collections.abc import Sequence
from pathlib import Path

HERE = Path(__file__).resolve().parent
sys.path.insert(0, str(HERE))

import corpus  # noqa: E402  (the invented-report generator beside this file)

TARGET_GROWTH = 1.5


def main(argv: Sequence[str] | None = None) -> int:
    ap = argparse.ArgumentParser(description=__doc__.split("\n\n")[0])
    ap.add_argument("--sizes", type=float, nargs="+", default=[0.25, 0.5, 1.0, 2.0, 4.0],
                    help="report sizes in millions of characters")  # fmt: skip
    ap.add_argument("--scheme", default="colorectal")
    ap.add_argument("--seed", type=int, default=3)
    ap.add_argument("--evidence", action="store_true", help="the evidence path (full reading)")
    args = ap.parse_args(argv)

    from pathsieve import Labeler

    labeler = Labeler(args.scheme)
    pieces = corpus.texts(400, seed=args.seed, organ=args.scheme)
    block = "\n\n".join(pieces)
    print(f"scheme {args.scheme}; evidence {'on' if args.evidence else 'off'}")
    print(f"{'size (M chars)':>15} {'CPU s':>8} {'s per M chars':>14} {'mentions':>9}")
    rows = []
    for size in sorted(args.sizes):
        n = int(size * 1_000_000)
        text = (block * (n // len(block) + 1))[:n]
        start = time.process_time()
        result = (
            labeler.label_report(text)
            if args.evidence
            else labeler.label_records([("long", text, "")], evidence=False, time_budget=0)
        )
        cpu = time.process_time() - start
        found = len(result.evidence) if args.evidence else -1  # type: ignore[union-attr]
        rows.append({"chars": n, "cpu_s": round(cpu, 2), "s_per_m": round(cpu / size, 2)})
        print(f"{size:>15.2f} {cpu:>8.2f} {cpu / size:>14.2f} {found if found >= 0 else '-':>9}")
    growth = rows[-1]["s_per_m"] / rows[0]["s_per_m"] if rows[0]["s_per_m"] else None
    print(f"\ngrowth (time per character, largest / smallest size): {growth:.2f}"
          f" (target <= {TARGET_GROWTH:g})")  # fmt: skip
    summary = {
        "benchmark": "long_report",
        "scheme": args.scheme,
        "evidence": args.evidence,
        "sizes": rows,
        "growth": round(growth, 2) if growth is not None else None,
        "targets_met": {"linear": growth is not None and growth <= TARGET_GROWTH},
    }
    print(json.dumps(summary))
    return 0


if __name__ == "__main__":
    sys.exit(main())
