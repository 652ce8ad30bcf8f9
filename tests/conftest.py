"""Shared fixtures; shared paths live in ``shared_paths`` (importable by test files)."""

from __future__ import annotations

from pathlib import Path

import pytest

from shared_paths import REPO


@pytest.fixture(scope="session")
def repo() -> Path:
    return REPO
