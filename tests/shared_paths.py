"""Paths the tests share: the repository, the examples, and ../shared data (skipped when absent).

A plain module (not conftest) so test files can import it by a unique name.
"""

from __future__ import annotations

import os
from pathlib import Path

import pytest

REPO = Path(__file__).resolve().parents[1]
SHARED = Path(os.environ.get("PATHSIEVE_SHARED", REPO.parent / "shared"))
EXAMPLES = REPO / "examples"


def shared_file(*parts: str) -> Path:
    """A file under ../shared/data, or a clean skip when it is not there."""
    path = SHARED.joinpath("data", *parts)
    if not path.exists():
        pytest.skip(f"shared data not present: {path}")
    return path
