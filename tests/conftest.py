"""Shared test helpers: paths to the repository and to the shared data (skipped when absent)."""

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


@pytest.fixture(scope="session")
def repo() -> Path:
    return REPO
