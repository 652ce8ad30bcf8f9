"""Marsh grade (Marsh 1992, modified by Oberhuber et al. 1999).

Categories: 0, 1 (infiltrative), 2 (hyperplastic), 3a/3b/3c (partial, subtotal,
total villous atrophy: Oberhuber 1999), 4 (hypoplastic: Marsh 1992).  Only type 3
has subtypes.  All texts are invented.
"""

from __future__ import annotations

from collections.abc import Callable

import pytest

from pathsieve.records import Value
from pathsieve.values.marsh import MARSH_CATEGORIES

Read = Callable[..., list[Value]]


def marsh(read: Read, text: str) -> list[tuple[str, str]]:
    return [(v.value, v.text) for v in read(text) if v.key == "marsh_grade"]


FORMS = [
    ("Consistent with celiac disease (Marsh 3a).", [("3a", "Marsh 3a")]),
    ("Subtotal villous atrophy, Marsh IIIb.", [("3b", "Marsh IIIb")]),
    ("Marsh-Oberhuber type 3c.", [("3c", "Marsh-Oberhuber type 3c")]),
    ("Increased IELs (modified Marsh grade 2).", [("2", "modified Marsh grade 2")]),
    ("Normal mucosa, Marsh type 0.", [("0", "Marsh type 0")]),
    ("Modified Marsh (Oberhuber) type: 3a", [("3a", "Modified Marsh (Oberhuber) type: 3a")]),
    ("Modified Marsh (Oberhuber) type: 0", [("0", "Modified Marsh (Oberhuber) type: 0")]),
    ("(MARSH 3B), CONSISTENT WITH CELIAC DISEASE", [("3b", "MARSH 3B")]),
    (
        "THE MODIFIED MARSH GRADE IS CORRECTED TO 3A.",
        [("3a", "MODIFIED MARSH GRADE IS CORRECTED TO 3A")],
    ),
    ("Marsh classification: 3a", [("3a", "Marsh classification: 3a")]),
    ("Marsh 1 lesion (increased intraepithelial lymphocytes).", [("1", "Marsh 1")]),
    ("Marsh type I", [("1", "Marsh type I")]),
    ("Marsh type II", [("2", "Marsh type II")]),
    ("Marsh IIIa", [("3a", "Marsh IIIa")]),
    ("Marsh IIIC", [("3c", "Marsh IIIC")]),
    ("Marsh 3 b", [("3b", "Marsh 3 b")]),
    ("Marsh-3a", [("3a", "Marsh-3a")]),
    ("Marsh stage 3c", [("3c", "Marsh stage 3c")]),
    ("Marsh 4 (hypoplastic)", [("4", "Marsh 4")]),
    ("Marsh type IV", [("4", "Marsh type IV")]),
    ("Oberhuber type 3b", [("3b", "Oberhuber type 3b")]),
    ("modified Marsh classification 3a", [("3a", "modified Marsh classification 3a")]),
    ("Marsh grade: 0", [("0", "Marsh grade: 0")]),
    ("Marsh score 2", [("2", "Marsh score 2")]),
    ("Marsh/Oberhuber 3a", [("3a", "Marsh/Oberhuber 3a")]),
    ("Marsh 3A, partial villous atrophy", [("3a", "Marsh 3A")]),
    ("(modified Marsh 3c)", [("3c", "modified Marsh 3c")]),
    ("Marsh 3a; see comment", [("3a", "Marsh 3a")]),
]


@pytest.mark.parametrize(("text", "expected"), FORMS)
def test_marsh_forms(read: Read, text: str, expected: list[tuple[str, str]]) -> None:
    assert marsh(read, text) == expected


def test_table_has_enough_forms() -> None:
    assert len(FORMS) >= 25


def test_values_are_published_categories(read: Read) -> None:
    # Marsh 1992 / Oberhuber 1999 categories
    assert MARSH_CATEGORIES == ("0", "1", "2", "3a", "3b", "3c", "4")
    for _text, expected in FORMS:
        for value, _ in expected:
            assert value in MARSH_CATEGORIES


def test_type_3_without_subtype_is_kept_and_flagged(read: Read) -> None:
    # Marsh 1992 had type 3 undivided; Oberhuber 1999 split it into a/b/c
    (v,) = [v for v in read("Villous atrophy, Marsh III.") if v.key == "marsh_grade"]
    assert v.value == "3"
    assert "marsh_subtype_missing" in v.flags


@pytest.mark.parametrize(
    "text",
    [
        "Marsh 2a",  # only type 3 has subtypes (Oberhuber 1999)
        "Marsh 3a-3b",  # a range is not one category
        "Marsh IIIb/c",
        "Marsh 3a or 3b",
        "Marsh 5",
        "Dr. Marsh reviewed the slides.",
        "Marsh classification: not applicable",
        "Corazza grade B1",
        "Duodenal mucosa with no significant abnormality.",
    ],
)
def test_no_marsh_where_no_category_is_stated(read: Read, text: str) -> None:
    assert marsh(read, text) == []
