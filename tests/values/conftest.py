"""Helpers for the value-reader tests: read a text as one region and check offsets."""

from __future__ import annotations

from collections.abc import Callable

import pytest

from pathsieve.records import Value
from pathsieve.values import extract_values


def read_values(text: str, section: str = "diagnosis", part: str = "") -> list[Value]:
    """All values of ``text`` read as one region; every evidence must be exact."""
    values = extract_values(text, [(0, len(text), section, part)])
    for v in values:
        assert text[v.start : v.end] == v.text, v
        assert v.section == section and v.part == part
    return values


def only(text: str, key: str) -> list[Value]:
    return [v for v in read_values(text) if v.key == key]


@pytest.fixture
def read() -> Callable[..., list[Value]]:
    return read_values


@pytest.fixture
def values_of() -> Callable[[str, str], list[Value]]:
    return only
