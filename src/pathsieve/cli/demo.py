"""``pathsieve demo``: label the bundled invented reports and check them against their gold."""

from __future__ import annotations

import argparse
import sys
from pathlib import Path
from typing import Any

import pandas as pd

from ..runner import LabelOptions, label_file

__all__ = ["register", "run"]

EXAMPLES = Path(__file__).resolve().parents[3] / "examples"


def register(sub: Any) -> None:
    p = sub.add_parser("demo", help="label the bundled demo reports", description=__doc__)
    p.add_argument("--out", default="demo-output", help="output folder (default: demo-output)")
    p.add_argument("--examples", default=str(EXAMPLES), help=argparse.SUPPRESS)
    p.set_defaults(func=run)


def run(args: argparse.Namespace) -> int:
    examples = Path(args.examples)
    out = Path(args.out)
    (out / "inputs").mkdir(parents=True, exist_ok=True)
    reports = pd.read_csv(examples / "demo_reports.csv", dtype=str, keep_default_na=False)
    print(
        "pathsieve demo: invented reports from a fictional laboratory. Labels are research aids "
        "for model training, not diagnoses.",
        file=sys.stderr,
    )
    for scheme, group in reports.groupby("scheme", sort=True):
        src = out / "inputs" / f"{scheme}.csv"
        group.to_csv(src, index=False)
        labels = out / f"{scheme}.labels.csv"
        evidence = out / f"{scheme}.evidence.jsonl"
        summary = label_file(src, labels, LabelOptions(str(scheme)), evidence_path=evidence)
        print(f"\n== {scheme}: {summary.text()}", file=sys.stderr)
        print(f"   labels: {labels}\n   evidence: {evidence}", file=sys.stderr)
    print(f"\npathsieve demo: tables written under {out.resolve()}/", file=sys.stderr)
    return 0
