"""``pathsieve demo``: label the bundled invented reports and check them against their gold."""

from __future__ import annotations

import argparse
import sys
from typing import Any

from ..demo import EXAMPLES, run_demo

__all__ = ["register", "run"]


def register(sub: Any) -> None:
    p = sub.add_parser(
        "demo", help="label the bundled demo reports and score them", description=__doc__
    )
    p.add_argument("--out", default="demo-output", help="output folder (default: demo-output)")
    p.add_argument("--examples", default=str(EXAMPLES), help=argparse.SUPPRESS)
    p.set_defaults(func=run)


def run(args: argparse.Namespace) -> int:
    print(
        "pathsieve demo: 246 invented reports from a fictional laboratory.\n"
        "Labels are research aids for model training, not diagnoses; the signing "
        "pathologist's report is authoritative.\n",
        file=sys.stderr,
    )
    result = run_demo(args.out, examples=args.examples, log=lambda s: print(s, file=sys.stderr))
    f1, acc, n_values, units = result.pooled()
    print(
        f"\nall schemes: binary micro-F1 {f1:.3f} over {units} cases; "
        f"value accuracy {acc:.3f} over {n_values} values",
        file=sys.stderr,
    )
    print(f"tables, evidence and validation reports under {result.out.resolve()}/", file=sys.stderr)
    return 0
