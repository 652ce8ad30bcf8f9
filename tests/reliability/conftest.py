"""Fixtures of the reliability tests: invented reports from benchmarks/corpus.py."""

from __future__ import annotations

import importlib.util
import sys
from pathlib import Path
from types import ModuleType

import pandas as pd
import pytest

REPO = Path(__file__).resolve().parents[2]


def _bench(name: str) -> ModuleType:
    """A script of benchmarks/ as a module (the folder is not a package)."""
    key = f"pathsieve_bench_{name}"
    if key not in sys.modules:
        sys.path.insert(0, str(REPO / "benchmarks"))
        spec = importlib.util.spec_from_file_location(key, REPO / "benchmarks" / f"{name}.py")
        assert spec is not None and spec.loader is not None
        module = importlib.util.module_from_spec(spec)
        sys.modules[key] = module
        spec.loader.exec_module(module)
    return sys.modules[key]


@pytest.fixture(scope="session")
def bench() -> object:
    """``bench("corpus")``, ``bench("fuzz")``: the benchmark scripts as modules."""
    return _bench


def reports(n: int, *, seed: int = 3, join: int = 1) -> pd.DataFrame:
    """``n`` invented reports (``join`` generated reports each), with the rows a real
    export has: an empty id, a repeated id, an empty text."""
    texts = _bench("corpus").texts(n * join, seed=seed, organ="colorectal")
    df = pd.DataFrame(
        {
            "case_id": [f"RL-{i:05d}" for i in range(n)],
            "text": ["\n\n".join(texts[i * join : (i + 1) * join]) for i in range(n)],
        }
    )
    if n > 8:
        df.loc[2, "case_id"] = ""
        df.loc[n - 2, "case_id"] = df.loc[4, "case_id"]
        df.loc[6, "text"] = ""
    return df


@pytest.fixture(scope="session")
def make_reports() -> object:
    """:func:`reports` as a fixture."""
    return reports


@pytest.fixture(scope="session")
def colorectal() -> object:
    """One shared colorectal pipeline for the tests that do not alter it."""
    from pathsieve import Labeler

    return Labeler("colorectal")
