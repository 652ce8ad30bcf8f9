"""A run that writes no evidence takes a shortcut; its label table must not change.

Without evidence, labelling runs only the value readers of the scheme's value
keys and assesses only the mentions that can change a label (sites and
procedures are evidence only), and skips the sections that never decide
(clinical history; gross text beside a diagnosis section).  The label rows must equal those of the full
reading, for every scheme, per case and per part, on invented reports in
every house style and on the bundled demo reports.
"""

from __future__ import annotations

import pandas as pd
import pytest

from pathsieve.labeler import Labeler
from shared_paths import REPO, benchmark

SCHEMES = ("colorectal", "prostate", "cervix", "duodenum", "lung", "breast")


@pytest.fixture(scope="module")
def records() -> list[tuple[str, str, str]]:
    texts = [r.text for r in benchmark("corpus").generate(40, seed=21, organ="mixed")]
    demo = REPO / "examples" / "demo_reports.csv"
    if demo.exists():  # hand-written awkward cases: addenda, hedges, odd layouts
        texts += pd.read_csv(demo)["text"].fillna("").tolist()[:60]
    return [(f"c{i}", t, "") for i, t in enumerate(texts)]


@pytest.mark.parametrize("scheme", SCHEMES)
def test_label_rows_equal_with_and_without_evidence(
    records: list[tuple[str, str, str]], scheme: str
) -> None:
    lab = Labeler(scheme)
    for per in ("case", "part"):
        full, evidence = lab.label_records(records, per=per, evidence=True)
        short, none = lab.label_records(records, per=per, evidence=False)
        assert none == []
        assert len(evidence) > len(records)
        assert short == full
    # the shortcut really skips work: fewer mentions are read for the table
    text = records[0][1]
    assert len(lab._read_for_labels(text).mentions) <= len(lab.read(text).mentions)
