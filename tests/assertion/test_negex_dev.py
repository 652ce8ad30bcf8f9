"""The assertion engine on the shared NegEx/ConText development corpus.

Reference baseline: negspacy's ``negex`` component with its ``en_clinical``
termset (NegEx, Chapman et al., J Biomed Inform 2001), run on the same spans.
The corpus is read in place from ../shared and never copied; the test skips
where it is absent.
"""

from __future__ import annotations

from pathlib import Path
from types import ModuleType

import pytest

from shared_paths import benchmark, shared_file

pytestmark = pytest.mark.shared


@pytest.fixture(scope="module")
def corpus() -> tuple[ModuleType, list]:
    path: Path = shared_file("negex-dev", "context_dev.tsv")
    bench = benchmark("assertion")
    rows, unlocated = bench.load_corpus(path)
    assert unlocated == 0
    assert len(rows) > 1000
    return bench, rows


@pytest.fixture(scope="module")
def scores(corpus: tuple[ModuleType, list]) -> dict[str, dict]:
    bench, rows = corpus
    ours = bench.run_engine(rows)
    out = {}
    for name, (gold_of, pred_of) in bench.CATEGORIES.items():
        out[name] = bench.prf([gold_of(r) for r in rows], [pred_of(a) for a in ours])
    out["negspacy"] = bench.prf([r.negated for r in rows], bench.run_negspacy(rows))
    return out


@pytest.mark.parametrize(
    ("category", "floor"),
    [("negated", 0.975), ("historical", 0.85), ("hypothetical", 0.80)],
)
def test_f1_floor(scores: dict[str, dict], category: str, floor: float) -> None:
    assert scores[category]["f1"] >= floor, scores[category]


def test_negation_beats_the_negspacy_baseline(scores: dict[str, dict]) -> None:
    # negspacy en_clinical measured about 0.94 F1 on this file; it must stay the weaker
    assert scores["negspacy"]["f1"] > 0.9, "the baseline run looks broken"
    assert scores["negated"]["f1"] > scores["negspacy"]["f1"]


def test_every_concept_is_located(corpus: tuple[ModuleType, list]) -> None:
    _, rows = corpus
    for r in rows:
        assert 0 <= r.start < r.end <= len(r.sentence)
        assert r.sentence[r.start : r.end].split()[0].lower() in r.concept.lower()
