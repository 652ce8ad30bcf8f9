"""The examples in the value readers' docstrings run and hold."""

from __future__ import annotations

import doctest
import importlib

import pytest

MODULES = [
    "pathsieve.values",
    "pathsieve.values.common",
    "pathsieve.values.lexicon",
    "pathsieve.values.gleason",
    "pathsieve.values.marsh",
    "pathsieve.values.breast",
    "pathsieve.values.tnm",
    "pathsieve.values.nodes",
    "pathsieve.values.margins",
    "pathsieve.values.size",
    "pathsieve.values.lvi",
]


@pytest.mark.parametrize("name", MODULES)
def test_docstring_examples(name: str) -> None:
    module = importlib.import_module(name)
    result = doctest.testmod(module, optionflags=doctest.NORMALIZE_WHITESPACE)
    assert result.failed == 0
