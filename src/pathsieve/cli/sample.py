"""``pathsieve sample``: draw a stratified review sample from a label table."""

from __future__ import annotations

import argparse
from pathlib import Path
from typing import Any

from ..errors import ConfigError
from ..sample import sample, strata

__all__ = ["register", "run"]


def register(sub: Any) -> None:
    p = sub.add_parser(
        "sample",
        help="draw a seeded review sample stratified by label and state",
        description=(
            "Draw a review sample from a label table, stratified by (label, state) so rare "
            "labels and doubtful states are represented: every stratum that occurs gets a "
            "minimum, rarest first, the rest is shared in proportion to size. Writes "
            "case_id plus the stratum that picked each case; 'pathsieve review --cases' "
            "accepts the file."
        ),
    )
    p.add_argument("labels", help="label table written by 'pathsieve label' (CSV, Parquet, JSONL)")
    p.add_argument("-n", type=int, required=True, help="sample size (all cases when fewer)")
    p.add_argument("--seed", type=int, default=0, help="random seed (default 0)")
    p.add_argument(
        "--scheme", help="scheme name or YAML path (default: read label columns from the table)"
    )
    p.add_argument(
        "--by",
        choices=("label_state", "label", "primary_label"),
        default="label_state",
        help="strata: (label, state) pairs (default), labels, or primary labels",
    )
    p.add_argument(
        "--min-per-stratum",
        type=int,
        default=2,
        help="cases guaranteed to each stratum while the budget lasts (default 2)",
    )
    p.add_argument("-o", "--output", required=True, help="output CSV")
    p.set_defaults(func=run)


def run(args: argparse.Namespace) -> int:
    picked = sample(
        args.labels,
        args.n,
        seed=args.seed,
        by=args.by,
        scheme=args.scheme,
        min_per_stratum=args.min_per_stratum,
    )
    out = Path(args.output)
    try:
        out.parent.mkdir(parents=True, exist_ok=True)
        picked.to_csv(out, index=False)
    except OSError as exc:
        raise ConfigError(f"cannot write {out}: {exc.strerror}; check the path") from exc
    # how each stratum is represented (a case counts for every stratum it is in)
    chosen = set(picked["case_id"])
    groups = strata(args.labels, scheme=args.scheme, by=args.by)
    print(f"wrote {out}: {len(picked)} case(s); stratum: in sample / in table")
    for g in groups:
        print(f"  {g.name:<40} {len(chosen.intersection(g.cases)):>5} / {len(g.cases)}")
    return 0
