"""``pathsieve ontology check [PATH]``: check an OBO ontology file."""

from __future__ import annotations

import argparse
import sys
import time
from typing import Any

from ..ontology import check_ontology, load_ontology

__all__ = ["register", "run"]


def register(sub: Any) -> None:
    p = sub.add_parser("ontology", help="check the ontology", description=__doc__)
    osub = p.add_subparsers(dest="ontology_command", metavar="ACTION", required=True)
    c = osub.add_parser("check", help="parse and check an OBO file (default: the shipped one)")
    c.add_argument(
        "path", nargs="?", default=None, help="OBO file (default: ontology/pathsieve.obo)"
    )
    c.set_defaults(func=run)


def run(args: argparse.Namespace) -> int:
    problems = check_ontology(args.path)
    for line in problems:
        print(line, file=sys.stderr)
    if problems:
        print(f"ontology check: {len(problems)} problem(s)", file=sys.stderr)
        return 1
    t0 = time.perf_counter()
    onto = load_ontology(args.path)
    n_syn = sum(len(t.synonyms) for t in onto.terms.values())
    print(
        f"ontology ok: {len(onto)} terms, {n_syn} synonyms "
        f"(loaded in {1000 * (time.perf_counter() - t0):.0f} ms)"
    )
    return 0
