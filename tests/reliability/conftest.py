"""Fixtures of the reliability tests: invented reports from benchmarks/corpus.py."""

from __future__ import annotations

import pandas as pd
import pytest

from shared_paths import benchmark


@pytest.fixture(scope="session")
def bench() -> object:
    """``bench("corpus")``, ``bench("fuzz")``: the benchmark scripts as modules."""
    return benchmark


def reports(n: int, *, seed: int = 3, join: int = 1) -> pd.DataFrame:
    """``n`` invented reports (``join`` generated reports each), with the rows a real
    export has: an empty id, a repeated id, an empty text."""
    texts = benchmark("corpus").texts(n * join, seed=seed, organ="colorectal")
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
