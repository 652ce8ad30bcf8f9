"""The ``pathsieve`` command line.

Each command lives in its own module with ``register(subparsers)`` and
``run(args) -> int``; each is a thin wrapper over a plain library function.
Library errors (:class:`pathsieve.errors.PathsieveError`) become one clear line
on stderr and a non-zero exit, never a traceback.
"""

from __future__ import annotations

import argparse
import importlib
import sys
from collections.abc import Sequence

from ..errors import PathsieveError

__all__ = ["COMMANDS", "build_parser", "main"]

#: Command modules, in the order ``pathsieve --help`` lists them.
COMMANDS: tuple[str, ...] = (
    "label",
    "validate",
    "sample",
    "review",
    "demo",
    "schemes",
    "ontology",
    "vocab",
)


def build_parser() -> argparse.ArgumentParser:
    from .. import __version__

    parser = argparse.ArgumentParser(
        prog="pathsieve",
        description=(
            "Graded, auditable weak labels from surgical pathology reports. "
            "Labels are research aids for model training, not diagnoses."
        ),
    )
    parser.add_argument("--version", action="version", version=f"pathsieve {__version__}")
    sub = parser.add_subparsers(dest="command", metavar="COMMAND")
    for name in COMMANDS:
        module = importlib.import_module(f"{__name__}.{name}")
        module.register(sub)
    return parser


def main(argv: Sequence[str] | None = None) -> int:
    parser = build_parser()
    args = parser.parse_args(argv)
    if not getattr(args, "func", None):
        parser.print_help()
        return 2
    try:
        return int(args.func(args) or 0)
    except PathsieveError as exc:
        print(f"pathsieve: error: {exc}", file=sys.stderr)
        return 1
    except KeyboardInterrupt:
        print("pathsieve: interrupted", file=sys.stderr)
        return 130
    except BrokenPipeError:
        return 0
    except Exception as exc:  # a traceback could quote report text: name the failure only
        print(
            f"pathsieve: internal error: {type(exc).__name__}; please report it with the command "
            "line (not the data)",
            file=sys.stderr,
        )
        return 70
