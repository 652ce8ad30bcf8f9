"""``pathsieve vocab check``: check every vocabulary data file in one go."""

from __future__ import annotations

import argparse
import sys
from typing import Any

from ..check import check_vocab

__all__ = ["register", "run"]


def register(sub: Any) -> None:
    p = sub.add_parser("vocab", help="check all vocabulary data files", description=__doc__)
    vsub = p.add_subparsers(dest="vocab_command", metavar="ACTION", required=True)
    c = vsub.add_parser(
        "check", help="check ontology, schemes, abbreviations, triggers, headers and value words"
    )
    c.set_defaults(func=run)


def run(args: argparse.Namespace) -> int:
    problems = check_vocab()
    for line in problems:
        print(line, file=sys.stderr)
    if problems:
        print(f"vocab check: {len(problems)} problem(s)", file=sys.stderr)
        return 1
    print("vocab ok")
    return 0
