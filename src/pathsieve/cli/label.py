"""``pathsieve label INPUT --scheme NAME -o OUT``: label a report export."""

from __future__ import annotations

import argparse
import sys
from typing import Any

from ..budget import BUDGET_CHARS, DEFAULT_BUDGET
from ..export import UNCERTAIN_MODES
from ..io import CHUNK_ROWS
from ..runner import ENGINES, LabelOptions, default_workers, label_file

__all__ = ["register", "run"]


def register(sub: Any) -> None:
    p = sub.add_parser(
        "label",
        help="label reports (CSV/TSV, JSONL, Parquet, Excel or a folder of .txt)",
        description=__doc__,
    )
    p.add_argument("input", help="report export, or a folder of .txt files (stem = case id)")
    p.add_argument(
        "--scheme", required=True, help="scheme name (see `pathsieve schemes`) or YAML path"
    )
    p.add_argument("-o", "--output", required=True, help="label table: .csv, .parquet or .jsonl")
    p.add_argument(
        "--per",
        choices=("case", "part"),
        default="case",
        help="one row per case or per specimen part",
    )
    p.add_argument(
        "--evidence", help="evidence table (.jsonl or .parquet): one row per mention and value"
    )
    p.add_argument(
        "--states", action="store_true", help="write state words instead of certainty scores"
    )
    p.add_argument(
        "--uncertain",
        choices=UNCERTAIN_MODES,
        help="training export: binarise labels; uncertain ones dropped (empty), positive, negative or 0.5",
    )
    p.add_argument("--id-col", default="case_id", help="case id column (default: case_id)")
    p.add_argument("--text-col", default="text", help="report text column (default: text)")
    p.add_argument(
        "--workers",
        type=int,
        default=None,
        help="processes (default: all cores); output is identical for any number",
    )
    p.add_argument(
        "--engine",
        choices=ENGINES,
        default="local",
        help="local: this machine; dask: a dask.distributed cluster, writing partitioned "
        "Parquet (-o and --evidence name directories)",
    )
    p.add_argument(
        "--scheduler",
        metavar="tcp://HOST:PORT",
        help="with --engine dask: an existing cluster's scheduler (default: start a local one "
        "with --workers processes); paths must be on storage every worker sees",
    )
    p.add_argument(
        "--redact-evidence",
        action="store_true",
        help="evidence without matched text (offsets and concept ids only); unredacted "
        "evidence holds report text and gets a <evidence>.PHI.txt notice beside it",
    )
    p.add_argument(
        "--time-budget",
        type=float,
        default=DEFAULT_BUDGET,
        metavar="SECONDS",
        help=f"seconds allowed per report (per {BUDGET_CHARS:,} characters of a longer one); "
        f"a report that overruns becomes an error row (default {DEFAULT_BUDGET:g}; 0: no limit)",
    )
    p.add_argument(
        "--chunk-rows",
        type=int,
        default=CHUNK_ROWS,
        help=f"reports per chunk, the unit of progress kept for --resume (default {CHUNK_ROWS})",
    )
    p.add_argument(
        "--resume",
        action="store_true",
        help="continue a killed run of the same command from its last completed chunk "
        "(kept in <output>.parts/ with <output>.manifest.json)",
    )
    p.add_argument("--no-progress", action="store_true", help="no progress bar")
    p.set_defaults(func=run)


def run(args: argparse.Namespace) -> int:
    options = LabelOptions(
        scheme=args.scheme,
        per=args.per,
        states=args.states,
        uncertain=args.uncertain,
        redact=args.redact_evidence,
        time_budget=args.time_budget or None,
    )
    summary = label_file(
        args.input,
        args.output,
        options,
        evidence_path=args.evidence,
        id_col=args.id_col,
        text_col=args.text_col,
        workers=args.workers or default_workers(),
        progress=not args.no_progress and sys.stderr.isatty(),
        engine=args.engine,
        scheduler=args.scheduler,
        chunk_rows=args.chunk_rows,
        resume=args.resume,
    )
    print(summary.text(), file=sys.stderr)
    print(
        f"labels: {args.output}" + (f"  evidence: {args.evidence}" if args.evidence else ""),
        file=sys.stderr,
    )
    return 0
