"""``pathsieve validate``: measure a label table against a hand-coded gold table."""

from __future__ import annotations

import argparse
import sys
from pathlib import Path
from typing import Any

from ..errors import ConfigError
from ..validate import validate

__all__ = ["register", "run"]


def register(sub: Any) -> None:
    p = sub.add_parser(
        "validate",
        help="score labels against a gold table (precision, recall, F1, kappa with CIs)",
        description=(
            "Score a label table against a hand-coded gold table: per-label precision, "
            "recall, F1 and Cohen's kappa with bootstrap 95%% intervals, a confusion table "
            "over the certainty states, value-label accuracy and the list of disagreements. "
            "Gold is long (case_id,label,expected[,scheme,part]) or wide (the label table's "
            "layout)."
        ),
    )
    p.add_argument("--gold", required=True, help="gold table (CSV, Parquet or JSONL)")
    p.add_argument("--pred", required=True, help="label table written by 'pathsieve label'")
    p.add_argument("--scheme", help="scheme name or YAML path (default: the tables' scheme column)")
    p.add_argument("--evidence", help="evidence JSONL/Parquet, quoted beside each disagreement")
    p.add_argument(
        "-o",
        "--output",
        help="write a report: .html (self-contained, with a chart) or .md (Markdown)",
    )
    p.add_argument("--json", action="store_true", help="print the full result as JSON to stdout")
    p.add_argument(
        "--positive-at",
        type=float,
        default=0.75,
        help="lowest certainty score counted positive (default 0.75: present or likely)",
    )
    p.add_argument(
        "--n-boot",
        type=int,
        default=1000,
        help="bootstrap resamples of cases for the 95%% intervals (default 1000; 0 for none)",
    )
    p.add_argument("--seed", type=int, default=0, help="bootstrap seed (default 0)")
    p.set_defaults(func=run)


def run(args: argparse.Namespace) -> int:
    out = Path(args.output) if args.output else None
    if out is not None and out.suffix.lower() not in {".html", ".htm", ".md", ".markdown"}:
        raise ConfigError(f"cannot write a report as {out.name}; use a .html or .md file name")
    result = validate(
        args.gold,
        args.pred,
        scheme=args.scheme,
        positive_at=args.positive_at,
        n_boot=args.n_boot,
        seed=args.seed,
        evidence=args.evidence,
    )
    if out is not None:
        text = result.to_html() if out.suffix.lower() in {".html", ".htm"} else result.to_markdown()
        try:
            out.parent.mkdir(parents=True, exist_ok=True)
            out.write_text(text, encoding="utf-8")
        except OSError as exc:
            raise ConfigError(f"cannot write {out}: {exc.strerror}; check the path") from exc
    if args.json:
        # stdout stays machine-readable; the mismatch notes go to stderr as well
        for line in result.problems():
            print(f"pathsieve validate: {line}", file=sys.stderr)
        print(result.to_json())
    elif out is not None:
        m = result.micro
        f1 = "—" if m.f1 is None else f"{m.f1:.3f}"
        print(
            f"wrote {out}: {result.n_units} judged, {len(result.labels)} labels, "
            f"micro F1 {f1}, {len(result.disagreements)} disagreement(s)"
        )
        for line in result.problems():
            print(f"note: {line}")
    else:
        print(result.to_text())
    return 0
