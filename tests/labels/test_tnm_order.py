"""The case-level pT/pN is the most extensive category stated, in AJCC order.

AJCC Cancer Staging Manual, 8th ed. (from memory): TX (cannot be assessed) <
T0 < Ta / Tis < T1 (T1mi < T1a < T1b < T1c) < T2 < T3 < T4, and NX < N0 <
N1 (N1mi < N1a < ...) < N2 < N3.  A string order would put "Tis" and "TX"
above "T4" ('i' and 'X' sort after digits); a report that states a polyp's
pTis beside the resection's pT2 must report pT2.  Every fragment is invented
(fictional Northgate Lane laboratory).
"""

from __future__ import annotations

from functools import cache

import pytest

from pathsieve import Labeler
from pathsieve.aggregate import tnm_rank

AJCC_T_ORDER = [
    "pTX", "pT0", "pTis", "pT1mi", "pT1a", "pT1b", "pT1c", "pT2", "pT2a", "pT2b", "pT3", "pT4a",
    "pT4b",
]  # fmt: skip
AJCC_N_ORDER = ["pNX", "pN0", "pN1mi", "pN1a", "pN1b", "pN1c", "pN2", "pN2a", "pN3"]


@pytest.mark.parametrize("order", [AJCC_T_ORDER, AJCC_N_ORDER])
def test_rank_follows_ajcc_order(order: list[str]) -> None:
    shuffled = sorted(order, key=lambda v: v[::-1])
    assert sorted(shuffled, key=tnm_rank) == order


@pytest.mark.parametrize(
    ("low", "high"),
    [("ypTis", "ypT1"), ("pTX", "pT1"), ("pNX", "pN0"), ("pT1b1", "pT1b2"), ("pT2", "pT2a")],
)
def test_prefixes_and_numbered_subdivisions(low: str, high: str) -> None:
    assert tnm_rank(low) < tnm_rank(high)


@cache
def _labeler() -> Labeler:
    return Labeler("colorectal")


@pytest.mark.parametrize(
    ("text", "expected"),
    [
        (
            "DIAGNOSIS:\nA. Colon, polyp, polypectomy: adenocarcinoma in situ (pTis).\n"
            "B. Sigmoid colon, resection: invasive adenocarcinoma, pT2 pN0.\n",
            "pT2",
        ),
        (
            "DIAGNOSIS:\nA. Rectum, resection: invasive adenocarcinoma, pT3 pN1a.\n"
            "B. Additional margin: pTX.\n",
            "pT3",
        ),
    ],
)
def test_case_reports_the_most_extensive_category(text: str, expected: str) -> None:
    res = _labeler().label_report(text)
    assert str(res.case.values["pt"].value) == expected
