"""Oestrogen and progesterone receptor status.

Rules (ASCO/CAP 2020 ER/PgR guideline, Allison et al., J Clin Oncol 2020): >= 1 %
of tumour nuclei staining is positive, < 1 % negative; 1-10 % is reported as
"low positive".  All texts are invented.
"""

from __future__ import annotations

from collections.abc import Callable

import pytest

from pathsieve.records import Value
from pathsieve.values.breast import Percent, receptor_status_from_percent

Read = Callable[..., list[Value]]


def receptors(read: Read, text: str) -> list[tuple[str, str, str]]:
    return [(v.key, v.value, v.text) for v in read(text) if v.key in ("er_status", "pr_status")]


ER, PR = "er_status", "pr_status"
POS, NEG = "positive", "negative"

# (text, [(key, value, evidence)], ER-or-first detail subset)
FORMS = [
    (
        "ER positive (95%, strong)",
        [(ER, POS, "ER positive (95%, strong)")],
        {"percent": 95, "intensity": "strong"},
    ),
    (
        "ER: negative (<1%)",
        [(ER, NEG, "ER: negative (<1%)")],
        {"percent": 1, "percent_qualifier": "<"},
    ),
    (
        "PR 5% weak",
        [(PR, POS, "PR 5% weak")],
        {"percent": 5, "intensity": "weak", "low_positive": True},
    ),
    (
        "Estrogen receptor: positive, 80%",
        [(ER, POS, "Estrogen receptor: positive, 80%")],
        {"percent": 80},
    ),
    (
        "Progesterone receptor (PR): negative",
        [(PR, NEG, "Progesterone receptor (PR): negative")],
        {"percent": None},
    ),
    (
        "Oestrogen receptor: positive (Allred 8/8, 100%).",
        [(ER, POS, "Oestrogen receptor: positive (Allred 8/8, 100%)")],
        {"allred": 8, "percent": 100},
    ),
    (
        "Progesterone receptor: positive (70%).",
        [(PR, POS, "Progesterone receptor: positive (70%)")],
        {"percent": 70},
    ),
    (
        "ER: positive (95%, strong). PR: positive (40%, moderate).",
        [(ER, POS, "ER: positive (95%, strong)"), (PR, POS, "PR: positive (40%, moderate)")],
        {"percent": 95},
    ),
    ("ER/PR: positive", [(ER, POS, "ER/PR: positive"), (PR, POS, "ER/PR: positive")], {}),
    ("ER and PR negative", [(ER, NEG, "ER and PR negative"), (PR, NEG, "ER and PR negative")], {}),
    (
        "Hormone receptors: negative",
        [(ER, NEG, "Hormone receptors: negative"), (PR, NEG, "Hormone receptors: negative")],
        {},
    ),
    (
        "Estrogen receptor (ER): Positive\nPercentage of cells with nuclear positivity: 95%\nAverage intensity of staining: Strong",
        [
            (
                ER,
                POS,
                "Estrogen receptor (ER): Positive\nPercentage of cells with nuclear positivity: 95%\nAverage intensity of staining: Strong",
            )
        ],
        {"percent": 95, "intensity": "strong"},
    ),
    (
        "ER: low positive (5%)",
        [(ER, POS, "ER: low positive (5%)")],
        {"low_positive": True, "percent": 5},
    ),
    ("ER+ / PR- / HER2-", [(ER, POS, "ER+"), (PR, NEG, "PR-")], {}),
    ("ER 90%, PR 0%", [(ER, POS, "ER 90%"), (PR, NEG, "PR 0%")], {"percent": 90}),
    (
        "Tumour cells are positive for estrogen receptor (90%).",
        [(ER, POS, "positive for estrogen receptor (90%)")],
        {"percent": 90},
    ),
    ("Negative for progesterone receptor.", [(PR, NEG, "Negative for progesterone receptor")], {}),
    (
        "Estrogen receptor: Negative (0%)",
        [(ER, NEG, "Estrogen receptor: Negative (0%)")],
        {"percent": 0},
    ),
    (
        "PgR: positive, 60%, moderate to strong",
        [(PR, POS, "PgR: positive, 60%, moderate to strong")],
        {"percent": 60, "intensity": "moderate-strong"},
    ),
    (
        "ER: POSITIVE (>90%)",
        [(ER, POS, "ER: POSITIVE (>90%)")],
        {"percent": 90, "percent_qualifier": ">"},
    ),
    (
        "ER: positive, 80-90% of cells, strong",
        [(ER, POS, "ER: positive, 80-90% of cells, strong")],
        {"percent": 80, "percent_max": 90},
    ),
    (
        "PR: weakly positive (2%)",
        [(PR, POS, "PR: weakly positive (2%)")],
        {"low_positive": True, "intensity": "weak"},
    ),
    ("ER (SP1): positive, 100%", [(ER, POS, "ER (SP1): positive, 100%")], {"percent": 100}),
    ("Estrogen receptor status: positive", [(ER, POS, "Estrogen receptor status: positive")], {}),
    (
        "ER: Positive; PR: Negative; HER2: 1+",
        [(ER, POS, "ER: Positive"), (PR, NEG, "PR: Negative")],
        {},
    ),
    ("Oestrogen receptor negative", [(ER, NEG, "Oestrogen receptor negative")], {}),
    ("ER pos, PR neg", [(ER, POS, "ER pos"), (PR, NEG, "PR neg")], {}),
    ("ER: 95% strong", [(ER, POS, "ER: 95% strong")], {"percent": 95, "intensity": "strong"}),
    ("PR: 0.5%", [(PR, NEG, "PR: 0.5%")], {"percent": 0.5}),
    (
        "Estrogen receptor: positive (Allred score 7)",
        [(ER, POS, "Estrogen receptor: positive (Allred score 7)")],
        {"allred": 7},
    ),
    (
        "Progesterone receptors: positive in 30% of tumor nuclei",
        [(PR, POS, "Progesterone receptors: positive in 30%")],
        {"percent": 30},
    ),
    (
        "ER: positive (1-10%, weak)",
        [(ER, POS, "ER: positive (1-10%, weak)")],
        {"low_positive": True, "percent": 1, "percent_max": 10},
    ),
    (
        "ER-positive, PR-positive invasive carcinoma",
        [(ER, POS, "ER-positive"), (PR, POS, "PR-positive")],
        {},
    ),
    (
        "estrogen and progesterone receptors: negative",
        [
            (ER, NEG, "estrogen and progesterone receptors: negative"),
            (PR, NEG, "estrogen and progesterone receptors: negative"),
        ],
        {},
    ),
    (
        "ER: Positive (90%)\nPR: Positive (5%)",
        [(ER, POS, "ER: Positive (90%)"), (PR, POS, "PR: Positive (5%)")],
        {"percent": 90},
    ),
    ("ER negative; PR negative; HER2 3+", [(ER, NEG, "ER negative"), (PR, NEG, "PR negative")], {}),
    (
        "Estrogen receptor: Positive, 100%, strong intensity",
        [(ER, POS, "Estrogen receptor: Positive, 100%, strong")],
        {"percent": 100, "intensity": "strong"},
    ),
    (
        "PR: positive, less than 10%",
        [(PR, POS, "PR: positive, less than 10%")],
        {"percent": 10, "percent_qualifier": "<"},
    ),
    ("ER: negative, <1%", [(ER, NEG, "ER: negative, <1%")], {"percent_qualifier": "<"}),
    ("ER (+)", [(ER, POS, "ER (+)")], {}),
]


@pytest.mark.parametrize(("text", "expected", "detail"), FORMS)
def test_receptor_forms(
    read: Read, text: str, expected: list[tuple[str, str, str]], detail: dict[str, object]
) -> None:
    got = [v for v in read(text) if v.key in ("er_status", "pr_status")]
    assert [(v.key, v.value, v.text) for v in got] == expected
    for k, want in detail.items():
        assert got[0].detail.get(k) == want, k


def test_table_size() -> None:
    # receptors are 50+ forms together with the HER2 table (test_her2.py)
    assert len(FORMS) >= 35


@pytest.mark.parametrize(
    ("pct", "status", "low"),
    [
        (Percent(0), "negative", False),
        (Percent(0.5), "negative", False),
        (Percent(1), "positive", True),
        (Percent(5), "positive", True),
        (Percent(10), "positive", True),
        (Percent(11), "positive", False),
        (Percent(95), "positive", False),
        (Percent(1, qualifier="<"), "negative", False),
        (Percent(90, qualifier=">"), "positive", False),
        (Percent(0, 5), None, False),  # a range across 1 % decides nothing
        (Percent(1, 10), "positive", True),
    ],
)
def test_asco_cap_2020_percent_rule(pct: Percent, status: str | None, low: bool) -> None:
    # ASCO/CAP 2020: >= 1 % positive, < 1 % negative; 1-10 % low positive
    from pathsieve.values.breast import _is_low_positive

    assert receptor_status_from_percent(pct) == status
    assert (_is_low_positive(pct) and status == "positive") == low


@pytest.mark.parametrize(
    ("text", "value"),
    [
        ("ER: negative (5%)", "negative"),  # 5 % is low positive, not negative
        ("PR: positive (0%)", "positive"),
    ],
)
def test_status_that_contradicts_its_percent_is_kept_and_flagged(
    read: Read, text: str, value: str
) -> None:
    # ASCO/CAP 2020: the percentage decides; a contradicting word is reported, not corrected
    (v,) = [v for v in read(text) if v.key in ("er_status", "pr_status")]
    assert v.value == value
    assert "receptor_status_percent_mismatch" in v.flags


@pytest.mark.parametrize(
    "text",
    [
        "ER: pending",
        "ER and PR: to follow in an addendum",
        "Patient seen in the ER yesterday.",
        "TCGA-XX-0000-01A-PR Redacted",
        "Progesterone receptor: not performed.",
        "HER2: 3+ (positive)",
        "The tumour cells are negative for cytokeratin 7.",
        "Ki-67: 20%",
    ],
)
def test_no_status_where_none_is_stated(read: Read, text: str) -> None:
    assert receptors(read, text) == []


def test_a_percent_of_something_else_is_not_taken(read: Read) -> None:
    text = "ER: positive.\nTumour cellularity: 40%"
    (v,) = [v for v in read(text) if v.key == "er_status"]
    assert v.detail["percent"] is None
