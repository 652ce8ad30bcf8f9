"""``pathsieve vocab check``: check every vocabulary data file in one go.

The ontology, every scheme, the abbreviation dictionary, the assertion
triggers, the section headers, the value words and the common words; each
problem names its file and line.  Exit status 1 when there is any problem.
"""

from __future__ import annotations

import argparse
import sys
from typing import Any

from ..check import vocab_report

__all__ = ["register", "run"]


def register(sub: Any) -> None:
    p = sub.add_parser("vocab", help="check all vocabulary data files", description=__doc__)
    vsub = p.add_subparsers(dest="vocab_command", metavar="ACTION", required=True)
    c = vsub.add_parser(
        "check",
        help="check ontology, schemes, abbreviations, triggers, headers and value words",
        description=__doc__,
    )
    c.add_argument(
        "--vocab",
        metavar="DIR",
        default=None,
        help="vocabulary folder to check (default: $PATHSIEVE_VOCAB, else the shipped ontology/)",
    )
    c.add_argument(
        "--scheme",
        metavar="FILE",
        action="append",
        default=[],
        help="also check this scheme file against the vocabulary (repeatable)",
    )
    c.set_defaults(func=run)


def run(args: argparse.Namespace) -> int:
    report = vocab_report(args.vocab, schemes=args.scheme)
    for line in report.problems:
        print(line, file=sys.stderr)
    for note in report.notes:
        print(f"note: {note}", file=sys.stderr)
    if report.problems:
        print(report.summary(), file=sys.stderr)
        return 1
    print(report.summary())
    return 0
