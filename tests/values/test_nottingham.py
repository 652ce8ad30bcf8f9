"""Nottingham (Elston–Ellis 1991) histologic grade of breast carcinoma.

Rules (Elston & Ellis, Histopathology 1991): tubule formation, nuclear
pleomorphism and mitotic count each score 1-3; the sum 3-5 is grade 1, 6-7 grade
2, 8-9 grade 3.  All texts are invented.
"""

from __future__ import annotations

from collections.abc import Callable

import pytest

from pathsieve.records import Value
from pathsieve.values.breast import nottingham_grade_from_score

Read = Callable[..., list[Value]]

BREAST = "Left breast, lumpectomy: invasive ductal carcinoma. "


def grades(read: Read, text: str) -> list[tuple[int, str]]:
    return [(v.value, v.text) for v in read(text) if v.key == "nottingham_grade"]


# (text, grade, evidence, score, (tubules, nuclei, mitoses) or None)
FORMS = [
    ("Nottingham grade 2 (score 6/9).", 2, "Nottingham grade 2 (score 6/9)", 6, None),
    ("tubules 3, nuclei 2, mitoses 1", 2, "tubules 3, nuclei 2, mitoses 1", 6, (3, 2, 1)),
    (BREAST + "Histologic grade: 3", 3, "Histologic grade: 3", None, None),
    ("SBR grade II", 2, "SBR grade II", None, None),
    ("Modified Bloom-Richardson score 7", 2, "Modified Bloom-Richardson score 7", 7, None),
    ("Nottingham histologic grade: 1", 1, "Nottingham histologic grade: 1", None, None),
    ("Nottingham grade 3 of 3", 3, "Nottingham grade 3 of 3", None, None),
    ("Nottingham score 8/9", 3, "Nottingham score 8/9", 8, None),
    ("Nottingham grade 2 (3+2+1)", 2, "Nottingham grade 2 (3+2+1)", 6, (3, 2, 1)),
    ("SBR score 3+2+2 = 7", 2, "SBR score 3+2+2 = 7", 7, (3, 2, 2)),
    (
        "Histologic grade (Nottingham): Grade 2",
        2,
        "Histologic grade (Nottingham): Grade 2",
        None,
        None,
    ),
    (
        "Nottingham grade 2 (tubules 3, nuclei 2, mitoses 1; score 6/9)",
        2,
        "Nottingham grade 2 (tubules 3, nuclei 2, mitoses 1; score 6/9)",
        6,
        (3, 2, 1),
    ),
    (
        "Glandular (acinar)/tubular differentiation: Score 3\nNuclear pleomorphism: Score 2\n"
        "Mitotic rate: Score 1 (<=7 mitoses per mm2)\nOverall grade: Grade 2",
        2,
        "Glandular (acinar)/tubular differentiation: Score 3\nNuclear pleomorphism: Score 2\n"
        "Mitotic rate: Score 1 (<=7 mitoses per mm2)\nOverall grade: Grade 2",
        6,
        (3, 2, 1),
    ),
    (
        "Tubule formation: 3\nNuclear pleomorphism: 3\nMitotic count: 3\nTotal score: 9",
        3,
        "Tubule formation: 3\nNuclear pleomorphism: 3\nMitotic count: 3\nTotal score: 9",
        9,
        (3, 3, 3),
    ),
    ("Elston-Ellis grade 1", 1, "Elston-Ellis grade 1", None, None),
    (
        "Nottingham combined histologic grade: 3",
        3,
        "Nottingham combined histologic grade: 3",
        None,
        None,
    ),
    ("mSBR grade 2", 2, "mSBR grade 2", None, None),
    ("NHG 3", 3, "NHG 3", None, None),
    ("Scarff-Bloom-Richardson grade III", 3, "Scarff-Bloom-Richardson grade III", None, None),
    (
        "Modified Bloom-Richardson grade 1 (score 4)",
        1,
        "Modified Bloom-Richardson grade 1 (score 4)",
        4,
        None,
    ),
    ("Nottingham grade: II", 2, "Nottingham grade: II", None, None),
    (
        "Right breast, core biopsy: Invasive carcinoma, favour ductal (no special type), grade 2.",
        2,
        "grade 2",
        None,
        None,
    ),
    (BREAST + "Overall grade: 2", 2, "Overall grade: 2", None, None),
    ("Nottingham score: 5", 1, "Nottingham score: 5", 5, None),
    (
        "Tubules 2, nuclei 3, mitoses 3 (score 8)",
        3,
        "Tubules 2, nuclei 3, mitoses 3 (score 8)",
        8,
        (2, 3, 3),
    ),
    ("Nottingham grade 1 (3/9)", 1, "Nottingham grade 1 (3/9)", 3, None),
    (BREAST + "Combined histologic grade: 1", 1, "Combined histologic grade: 1", None, None),
    ("SBR grade 2 (T3 N2 M1)", 2, "SBR grade 2", None, None),
]


@pytest.mark.parametrize(("text", "grade", "evidence", "score", "components"), FORMS)
def test_nottingham_forms(
    read: Read,
    text: str,
    grade: int,
    evidence: str,
    score: int | None,
    components: tuple[int, int, int] | None,
) -> None:
    vals = [v for v in read(text) if v.key == "nottingham_grade"]
    assert [(v.value, v.text) for v in vals] == [(grade, evidence)]
    d = vals[0].detail
    assert d["score"] == score
    assert (d["tubules"], d["nuclei"], d["mitoses"]) == (components or (None, None, None))
    assert vals[0].flags == ()


def test_table_has_enough_forms() -> None:
    assert len(FORMS) >= 25


@pytest.mark.parametrize(
    ("score", "grade"),
    [(3, 1), (4, 1), (5, 1), (6, 2), (7, 2), (8, 3), (9, 3), (2, None), (10, None)],
)
def test_elston_ellis_score_table(score: int, grade: int | None) -> None:
    # Elston & Ellis 1991: 3-5 -> 1, 6-7 -> 2, 8-9 -> 3
    assert nottingham_grade_from_score(score) == grade


@pytest.mark.parametrize(
    ("t", "n", "m"), [(t, n, m) for t in (1, 2, 3) for n in (1, 2, 3) for m in (1, 2, 3)]
)
def test_every_component_combination(read: Read, t: int, n: int, m: int) -> None:
    # Elston & Ellis 1991: each component 1-3, the sum decides the grade
    (v,) = [v for v in read(f"tubules {t}, nuclei {n}, mitoses {m}") if v.key == "nottingham_grade"]
    assert v.value == nottingham_grade_from_score(t + n + m)
    assert v.detail["score"] == t + n + m


@pytest.mark.parametrize(
    ("text", "value", "flag"),
    [
        ("Nottingham score 7 (tubules 3, nuclei 2, mitoses 1)", 2, "nottingham_sum_mismatch"),
        ("tubules 3, nuclei 3, mitoses 1, total score 8", 3, "nottingham_sum_mismatch"),
        ("Nottingham grade 3 (score 6/9)", 3, "nottingham_grade_mismatch"),
        ("Nottingham grade 1 (3+3+2)", 1, "nottingham_grade_mismatch"),
    ],
)
def test_inconsistent_grades_are_flagged_not_corrected(
    read: Read, text: str, value: int, flag: str
) -> None:
    # Elston & Ellis 1991: components add up to the score; the score decides the grade
    (v,) = [v for v in read(text) if v.key == "nottingham_grade"]
    assert v.value == value
    assert flag in v.flags


@pytest.mark.parametrize(
    "text",
    [
        "Histologic grade: 2 (moderately differentiated), sigmoid colon adenocarcinoma.",  # no breast
        BREAST + "DCIS, nuclear grade 2.",
        BREAST + "Histologic grade: G2",
        BREAST + "Nottingham grade: cannot be assessed",
        "Tubules 3 and nuclei 2 only",
        "Nottingham grade 4",
        "Nottingham score 11",
        BREAST + "FIGO grade 2",
        "Low grade dysplasia, grade 1 of colon.",
    ],
)
def test_no_grade_where_none_is_stated(read: Read, text: str) -> None:
    assert grades(read, text) == []
