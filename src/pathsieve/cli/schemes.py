"""``pathsieve schemes``: list the schemes with their labels."""

from __future__ import annotations

import argparse
from typing import Any

from ..schemes import list_schemes, load_scheme

__all__ = ["register", "run"]


def register(sub: Any) -> None:
    p = sub.add_parser("schemes", help="list the label schemes", description=__doc__)
    p.add_argument("name", nargs="?", help="show one scheme (name or YAML path)")
    p.set_defaults(func=run)


def run(args: argparse.Namespace) -> int:
    for name in [args.name] if args.name else list_schemes():
        s = load_scheme(name)
        print(f"{s.name}: {s.title}")
        if s.source:
            print(f"  source: {s.source}")
        for key, d in s.labels.items():
            print(f"  {key:<30} {d.description}")
        if s.value_keys:
            print(f"  values: {', '.join(s.value_keys)}")
    return 0
