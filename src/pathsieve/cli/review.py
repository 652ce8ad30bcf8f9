"""``pathsieve review``: write a self-contained HTML page to review labels."""

from __future__ import annotations

import argparse
from pathlib import Path
from typing import Any

from ..errors import ConfigError
from ..review import render_data, review_data

__all__ = ["register", "run"]


def register(sub: Any) -> None:
    p = sub.add_parser(
        "review",
        help="write an HTML page to check labels against the report text",
        description=(
            "Write one self-contained HTML page (no network needed) showing each report with "
            "its mentions highlighted by certainty, its labels and values beside it, filters "
            "by label and state and keyboard navigation. Mark labels right or wrong and "
            "download a gold CSV that 'pathsieve validate --gold' reads. The page contains "
            "report text: handle it as protected health information."
        ),
    )
    p.add_argument("--reports", required=True, help="the report export given to 'pathsieve label'")
    p.add_argument("--labels", required=True, help="label table written by 'pathsieve label'")
    p.add_argument("--evidence", required=True, help="evidence table (.jsonl or .parquet)")
    p.add_argument("--scheme", required=True, help="scheme name or YAML path")
    p.add_argument(
        "--cases",
        help="review only these cases: a table with case_id (e.g. from 'pathsieve sample')",
    )
    p.add_argument(
        "--positive-at",
        type=float,
        default=0.75,
        help="lowest certainty score counted positive when proposing corrections (default 0.75)",
    )
    p.add_argument("-o", "--output", required=True, help="output .html file")
    p.set_defaults(func=run)


def run(args: argparse.Namespace) -> int:
    out = Path(args.output)
    if out.suffix.lower() not in {".html", ".htm"}:
        raise ConfigError(f"the review page must be an .html file, not {out.name}")
    review = review_data(
        args.reports,
        args.labels,
        args.evidence,
        scheme=args.scheme,
        cases=args.cases,
        positive_at=args.positive_at,
    )
    page = render_data(review)
    try:
        out.parent.mkdir(parents=True, exist_ok=True)
        out.write_text(page, encoding="utf-8")
    except OSError as exc:
        raise ConfigError(f"cannot write {out}: {exc.strerror}; check the path") from exc
    print(f"wrote {out}: {review.n_cases} case(s); open it in a browser (it needs no network)")
    print("note: the page contains report text; handle it as protected health information")
    if review.missing_reports:
        print(
            f"note: {len(review.missing_reports)} case(s) have labels but no report text: "
            + ", ".join(review.missing_reports[:12])
        )
    if review.missing_labels:
        print(
            f"note: {len(review.missing_labels)} listed case(s) have no label row: "
            + ", ".join(review.missing_labels[:12])
        )
    if review.bad_offsets:
        print(
            f"warning: {review.bad_offsets} evidence row(s) do not match the report text "
            "at their offsets (shown as warnings on the page); were the reports edited?"
        )
    return 0
