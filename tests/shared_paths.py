"""Paths the tests share: the repository, the examples, and ../shared data (skipped when absent).

A plain module (not conftest) so test files can import it by a unique name.
"""

from __future__ import annotations

import importlib.util
import os
import sys
from pathlib import Path
from types import ModuleType

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


def benchmark(name: str) -> ModuleType:
    """The script ``benchmarks/<name>.py`` as a module, loaded once (the folder is no package)."""
    key = f"pathsieve_bench_{name}"
    if key not in sys.modules:
        folder = str(REPO / "benchmarks")
        if folder not in sys.path:
            sys.path.insert(0, folder)  # the scripts import corpus.py beside them
        spec = importlib.util.spec_from_file_location(key, REPO / "benchmarks" / f"{name}.py")
        assert spec is not None and spec.loader is not None
        module = importlib.util.module_from_spec(spec)
        sys.modules[key] = module  # dataclasses look their module up
        spec.loader.exec_module(module)
    return sys.modules[key]
