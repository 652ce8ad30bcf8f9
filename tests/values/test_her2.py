"""HER2 status.

Rules (ASCO/CAP 2018 HER2 guideline, Wolff et al., J Clin Oncol 2018): IHC 0 and
1+ negative, 2+ equivocal, 3+ positive; in situ hybridisation decides an
equivocal IHC (amplified -> positive, not amplified -> negative).  All texts
are invented.
"""

from __future__ import annotations

from collections.abc import Callable

import pytest

from pathsieve.records import Value
from pathsieve.values.breast import her2_status

Read = Callable[..., list[Value]]

POS, NEG, EQ = "positive", "negative", "equivocal"

# (text, value, evidence, ihc, ish)
FORMS = [
    ("HER2 (IHC) 3+", POS, "HER2 (IHC) 3+", "3+", None),
    (
        "HER2 2+ equivocal; ISH amplified",
        POS,
        "HER2 2+ equivocal; ISH amplified",
        "2+",
        "amplified",
    ),
    ("HER2 negative (1+)", NEG, "HER2 negative (1+)", "1+", None),
    ("HER-2/neu: 0", NEG, "HER-2/neu: 0", "0", None),
    (
        "HER2 by FISH: not amplified (ratio 1.3)",
        NEG,
        "HER2 by FISH: not amplified (ratio 1.3)",
        None,
        "not amplified",
    ),
    ("HER2: 1+ (negative).", NEG, "HER2: 1+ (negative)", "1+", None),
    ("HER2 (IHC): 1+, negative", NEG, "HER2 (IHC): 1+, negative", "1+", None),
    ("HER2: 2+ (equivocal); FISH pending", EQ, "HER2: 2+ (equivocal)", "2+", None),
    ("HER2 2+, ISH not amplified", NEG, "HER2 2+, ISH not amplified", "2+", "not amplified"),
    (
        "HER2 (by immunohistochemistry): Equivocal (Score 2+)\nHER2 (by ISH): Positive (amplified), HER2/CEP17 ratio 2.6",
        POS,
        "HER2 (by immunohistochemistry): Equivocal (Score 2+)\nHER2 (by ISH): Positive (amplified), HER2/CEP17 ratio 2.6",
        "2+",
        "amplified",
    ),
    ("HER2: positive (3+)", POS, "HER2: positive (3+)", "3+", None),
    ("HER2/neu: negative (score 0)", NEG, "HER2/neu: negative (score 0)", "0", None),
    ("HER2 IHC score: 2+", EQ, "HER2 IHC score: 2+", "2+", None),
    (
        "HER2 FISH: amplified (HER2/CEP17 ratio 4.1)",
        POS,
        "HER2 FISH: amplified (HER2/CEP17 ratio 4.1)",
        None,
        "amplified",
    ),
    ("HER2-negative", NEG, "HER2-negative", None, None),
    ("HER2+", POS, "HER2+", None, None),
    ("ER+/PR+/HER2-", NEG, "HER2-", None, None),
    ("HER2 (4B5): 3+ positive", POS, "HER2 (4B5): 3+ positive", "3+", None),
    ("Her2/neu: 1+", NEG, "Her2/neu: 1+", "1+", None),
    ("HER2 by SISH: non-amplified", NEG, "HER2 by SISH: non-amplified", None, "not amplified"),
    ("HER2 equivocal (2+)", EQ, "HER2 equivocal (2+)", "2+", None),
    ("ERBB2 (HER2) by IHC: 0", NEG, "ERBB2 (HER2) by IHC: 0", "0", None),
    ("HER2: negative", NEG, "HER2: negative", None, None),
    (
        "HER2 2+ (equivocal), reflexed to FISH: HER2 gene amplification detected",
        POS,
        "HER2 2+ (equivocal), reflexed to FISH: HER2 gene amplification",
        "2+",
        "amplified",
    ),
    (
        "HER2 immunohistochemistry: 3+ (positive)",
        POS,
        "HER2 immunohistochemistry: 3+ (positive)",
        "3+",
        None,
    ),
]


@pytest.mark.parametrize(("text", "value", "evidence", "ihc", "ish"), FORMS)
def test_her2_forms(
    read: Read, text: str, value: str, evidence: str, ihc: str | None, ish: str | None
) -> None:
    vals = [v for v in read(text) if v.key == "her2_status"]
    assert [(v.value, v.text) for v in vals] == [(value, evidence)]
    assert (vals[0].detail["ihc"], vals[0].detail["ish"]) == (ihc, ish)
    assert vals[0].flags == ()


def test_table_size() -> None:
    # with the ER/PR table of test_receptors.py (40 forms), receptors have 65 forms
    assert len(FORMS) >= 25


@pytest.mark.parametrize(
    ("ihc", "ish", "expected"),
    [
        ("0", None, "negative"),
        ("1+", None, "negative"),
        ("2+", None, "equivocal"),
        ("3+", None, "positive"),
        ("2+", "amplified", "positive"),
        ("2+", "not amplified", "negative"),
        (None, "amplified", "positive"),
        (None, "not amplified", "negative"),
    ],
)
def test_asco_cap_2018_table(ihc: str | None, ish: str | None, expected: str) -> None:
    # ASCO/CAP 2018: 0/1+ negative, 2+ equivocal, 3+ positive; ISH decides an equivocal IHC
    assert her2_status(ihc, ish) == (expected, ())


@pytest.mark.parametrize(
    ("ihc", "ish", "expected"),
    [
        ("3+", "not amplified", "positive"),
        ("1+", "amplified", "positive"),
        ("0", "amplified", "positive"),
    ],
)
def test_discordant_ihc_and_ish_are_flagged(ihc: str, ish: str, expected: str) -> None:
    # ASCO/CAP 2018: IHC 3+ is positive; an amplified ISH is positive
    value, flags = her2_status(ihc, ish)
    assert value == expected
    assert flags == ("her2_ihc_ish_discordant",)


@pytest.mark.parametrize(
    ("text", "value"),
    [
        ("HER2 positive (1+)", "positive"),
        ("HER2 negative (3+)", "negative"),
        ("HER2: equivocal (3+)", "equivocal"),
    ],
)
def test_stated_status_against_its_score_is_kept_and_flagged(
    read: Read, text: str, value: str
) -> None:
    # ASCO/CAP 2018 score table; the stated word is reported, not corrected
    (v,) = [v for v in read(text) if v.key == "her2_status"]
    assert v.value == value
    assert "her2_status_score_mismatch" in v.flags


def test_equivocal_ihc_decided_by_ish_is_no_mismatch(read: Read) -> None:
    # ASCO/CAP 2018: an ISH result decides an equivocal IHC
    (v,) = [v for v in read("HER2: equivocal (2+); FISH: not amplified") if v.key == "her2_status"]
    assert v.value == "negative" and v.flags == ()


@pytest.mark.parametrize(
    "text",
    [
        "HER2: pending",
        "HER2 testing will be reported in an addendum.",
        "HER2/CEP17 ratio: see below",
        "She took her 2 tablets.",
        "ER: positive (90%)",
    ],
)
def test_no_her2_where_none_is_stated(read: Read, text: str) -> None:
    assert [v for v in read(text) if v.key == "her2_status"] == []
