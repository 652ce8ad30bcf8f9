"""The product held to the hand-coded demo gold (examples/demo_gold.csv).

Targets of the label contract work: binary micro-F1 >= 0.95 (present/likely
positive) and value accuracy >= 0.95, pooled over the six schemes.  The
per-label table is printed so a failing run shows where.
"""

from __future__ import annotations

from pathlib import Path

import pytest

from pathsieve.demo import DemoResult, run_demo


@pytest.fixture(scope="module")
def demo(tmp_path_factory: pytest.TempPathFactory) -> DemoResult:
    return run_demo(tmp_path_factory.mktemp("demo"))


def test_demo_reaches_the_gold(demo: DemoResult) -> None:
    f1, acc, n_values, units = demo.pooled()
    print("\n" + demo.label_table())
    print(f"pooled micro-F1 {f1:.3f} over {units} cases; value accuracy {acc:.3f} over {n_values}")
    assert units == 246
    assert n_values > 400
    assert f1 >= 0.95
    assert acc >= 0.95


def test_demo_writes_every_table(demo: DemoResult) -> None:
    out: Path = demo.out
    for name in ("breast", "cervix", "colorectal", "duodenum", "lung", "prostate"):
        for suffix in (".labels.csv", ".evidence.jsonl", ".validation.md"):
            assert (out / f"{name}{suffix}").stat().st_size > 0
        assert demo.summaries[name].cases == 41
        assert demo.summaries[name].errors == 0
