"""Gleason score and grade group readers.

Rules: primary + secondary = total (ISUP 2014 consensus, Epstein et al., Am J Surg
Pathol 2016); grade groups (ISUP 2014 / WHO 2016): score <= 6 -> 1, 3+4 -> 2,
4+3 -> 3, 8 -> 4, 9-10 -> 5.  All texts are invented.
"""

from __future__ import annotations

from collections.abc import Callable

import pytest

from pathsieve.records import Value
from pathsieve.values import grade_group, grade_group_from_total

Reader = Callable[[str, str], list[Value]]

# (text, normalised score, evidence text, tertiary)
SCORES = [
    ("Prostatic adenocarcinoma, Gleason score 3+4=7.", "3+4=7", "Gleason score 3+4=7", None),
    ("Gleason score 4+3=7, involving 40% of tissue.", "4+3=7", "Gleason score 4+3=7", None),
    ("Adenocarcinoma, GS 3+3=6, left apex.", "3+3=6", "GS 3+3=6", None),
    ("Acinar adenocarcinoma, Gleason 7 (4+3).", "4+3=7", "Gleason 7 (4+3)", None),
    (
        "Gleason pattern 4 + 3 = 7 with tertiary pattern 5.",
        "4+3=7",
        "Gleason pattern 4 + 3 = 7 with tertiary pattern 5",
        5,
    ),
    ("Gleason sum 8 (4+4) in two cores.", "4+4=8", "Gleason sum 8 (4+4)", None),
    ("Gleason's score: 3 + 4 = 7", "3+4=7", "Gleason's score: 3 + 4 = 7", None),
    ("Gleason score 3 +4 = 7 (OCR spacing)", "3+4=7", "Gleason score 3 +4 = 7", None),
    (
        "PROSTATIC ADENOCARCINOMA, GLEASON SCORE 4 + 5 = 9.",
        "4+5=9",
        "GLEASON SCORE 4 + 5 = 9",
        None,
    ),
    ("Adenocarcinoma, Gleason grade 3+3, small focus.", "3+3=6", "Gleason grade 3+3", None),
    ("with a Gleason score of 3+4=7 in the right base", "3+4=7", "Gleason score of 3+4=7", None),
    ("The Gleason score is 7 (3+4).", "3+4=7", "Gleason score is 7 (3+4)", None),
    ("Gleason score = 3 + 4 = 7", "3+4=7", "Gleason score = 3 + 4 = 7", None),
    ("Gleason score 7/10 (4+3)", "4+3=7", "Gleason score 7/10 (4+3)", None),
    ("Gleason Score: 4+3=7/10", "4+3=7", "Gleason Score: 4+3=7/10", None),
    ("Gleason 3+4=7 (Grade Group 2)", "3+4=7", "Gleason 3+4=7", None),
    (
        "GLEASON'S GRADE 4 + 3 (SCORE 7/10), BOTH LOBES",
        "4+3=7",
        "GLEASON'S GRADE 4 + 3 (SCORE 7/10)",
        None,
    ),
    ("Gleason grade 3+3, score = 6, small volume", "3+3=6", "Gleason grade 3+3, score = 6", None),
    (
        "Gleason's predominant score 8 (4+4) with a small",
        "4+4=8",
        "Gleason's predominant score 8 (4+4)",
        None,
    ),
    ("ADENOCARCINOMA, GLEASON SCORE 9 (5+4) (SEE COMMENT)", "5+4=9", "GLEASON SCORE 9 (5+4)", None),
    (
        "Gleason score 4+3=7 with tertiary Gleason grade 5.",
        "4+3=7",
        "Gleason score 4+3=7 with tertiary Gleason grade 5",
        5,
    ),
    (
        "Total Gleason Score (Primary + Secondary): 4+3",
        "4+3=7",
        "Gleason Score (Primary + Secondary): 4+3",
        None,
    ),
    (
        "Gleason Grade/Sum: Grade 4 + 4, Sum 8/10",
        "4+4=8",
        "Gleason Grade/Sum: Grade 4 + 4, Sum 8/10",
        None,
    ),
    ("Gleason score 5+5=10, extensive", "5+5=10", "Gleason score 5+5=10", None),
    ("Gleason score 3+5=8", "3+5=8", "Gleason score 3+5=8", None),
    ("Gleason score 5+3=8", "5+3=8", "Gleason score 5+3=8", None),
    ("Gleason pattern 3 + 4 = 7", "3+4=7", "Gleason pattern 3 + 4 = 7", None),
    ("adenocarcinoma, gleason score 3+4=7", "3+4=7", "gleason score 3+4=7", None),
    ("Gleason score: 3+4 = 7 (ISUP Grade Group 2)", "3+4=7", "Gleason score: 3+4 = 7", None),
    ("Gleason 4+5=9, involving 60% of the core", "4+5=9", "Gleason 4+5=9", None),
    ("GS 4+3=7 in 3 of 12 cores", "4+3=7", "GS 4+3=7", None),
    ("Gleason score 3 + 3 = 6 (ISUP grade group 1)", "3+3=6", "Gleason score 3 + 3 = 6", None),
    ("Gleason score 3+4 =7", "3+4=7", "Gleason score 3+4 =7", None),
    ("Gleason score 4+3 (7)", "4+3=7", "Gleason score 4+3", None),
    ("Gleason score 2+3=5 (historical grading)", "2+3=5", "Gleason score 2+3=5", None),
    ("Focus of carcinoma, Gleason 3+4", "3+4=7", "Gleason 3+4", None),
    ("Gleason's pattern 4+4=8", "4+4=8", "Gleason's pattern 4+4=8", None),
    ("Gleason scores 3+4=7 in both lobes", "3+4=7", "Gleason scores 3+4=7", None),
    ("Gleason score 3+4=7 (pattern 4: 20%)", "3+4=7", "Gleason score 3+4=7", None),
    ("GLEASON SCORE 4 + 3 = 7 (SEE COMMENT)", "4+3=7", "GLEASON SCORE 4 + 3 = 7", None),
    (
        "Gleason score 3+4=7 with tertiary pattern 5 (<5%).",
        "3+4=7",
        "Gleason score 3+4=7 with tertiary pattern 5",
        5,
    ),
    ("Gleason 4+5=9 (Gleason 4: 70%, Gleason 5: 30%)", "4+5=9", "Gleason 4+5=9", None),
    ("Gleason score 4+4 = 8.", "4+4=8", "Gleason score 4+4 = 8", None),
    ("Gleason score 5+4=9; perineural invasion present", "5+4=9", "Gleason score 5+4=9", None),
    # synoptic blocks
    (
        "primary pattern 3, secondary pattern 4, total score 7",
        "3+4=7",
        "primary pattern 3, secondary pattern 4, total score 7",
        None,
    ),
    (
        "Primary Gleason pattern: 4\nSecondary Gleason pattern: 3\nTotal Gleason score: 7",
        "4+3=7",
        "Primary Gleason pattern: 4\nSecondary Gleason pattern: 3\nTotal Gleason score: 7",
        None,
    ),
    (
        "PRIMARY GLEASON GRADE: 3\nSECONDARY GLEASON GRADE: 3\nTERTIARY GLEASON GRADE: 4\n"
        "TOTAL GLEASON SCORE: 6",
        "3+3=6",
        "PRIMARY GLEASON GRADE: 3\nSECONDARY GLEASON GRADE: 3\nTERTIARY GLEASON GRADE: 4\n"
        "TOTAL GLEASON SCORE: 6",
        4,
    ),
    (
        "Primary pattern: Pattern 4\nSecondary pattern: Pattern 5\nTertiary pattern: Not applicable\n"
        "Total Gleason score: 9",
        "4+5=9",
        "Primary pattern: Pattern 4\nSecondary pattern: Pattern 5\nTertiary pattern: Not applicable\n"
        "Total Gleason score: 9",
        None,
    ),
    (
        "Gleason score: Primary pattern 4, secondary pattern 3, total 7",
        "4+3=7",
        "Primary pattern 4, secondary pattern 3, total 7",
        None,
    ),
    (
        "Predominant pattern 3, secondary pattern 4.",
        "3+4=7",
        "Predominant pattern 3, secondary pattern 4",
        None,
    ),
    ("Primary grade: 3; secondary grade: 4", "3+4=7", "Primary grade: 3; secondary grade: 4", None),
    (
        "PRIMARY GLEASON GRADE: 4 \nSECONDARY GLEASON GRADE: 4",
        "4+4=8",
        "PRIMARY GLEASON GRADE: 4 \nSECONDARY GLEASON GRADE: 4",
        None,
    ),
]


@pytest.mark.parametrize(("text", "value", "evidence", "tertiary"), SCORES)
def test_gleason_forms(
    values_of: Reader, text: str, value: str, evidence: str, tertiary: int | None
) -> None:
    scores = values_of(text, "gleason_score")
    assert [v.value for v in scores] == [value]
    v = scores[0]
    assert v.text == evidence
    assert v.detail["tertiary"] == tertiary
    p, rest = value.split("+")
    s, t = rest.split("=")
    assert (v.detail["primary"], v.detail["secondary"], v.detail["total"]) == (
        int(p),
        int(s),
        int(t),
    )
    assert v.flags == ()


def test_table_has_fifty_forms() -> None:
    assert len(SCORES) >= 50


@pytest.mark.parametrize(("text", "value", "evidence", "tertiary"), SCORES)
def test_every_consistent_score_derives_its_grade_group(
    values_of: Reader, text: str, value: str, evidence: str, tertiary: int | None
) -> None:
    # ISUP 2014 / WHO 2016: the grade group follows from the pattern pair.
    derived = [v for v in values_of(text, "grade_group") if v.detail["derived"]]
    assert len(derived) == 1
    score = values_of(text, "gleason_score")[0]
    assert (derived[0].start, derived[0].end) == (score.start, score.end)
    p, rest = value.split("+")
    assert derived[0].value == grade_group(int(p), int(rest.split("=")[0]))


# The ISUP 2014 / WHO 2016 grade-group table (Epstein et al. 2016), written out for
# every pair of patterns 1..5.  A 7 that is not 3+4 or 4+3 (2+5, 5+2) has no row.
ISUP_TABLE = {
    (p, s): (1 if p + s <= 6 else 2 if (p, s) == (3, 4) else 3 if (p, s) == (4, 3) else None)
    if p + s <= 7
    else (4 if p + s == 8 else 5)
    for p in range(1, 6)
    for s in range(1, 6)
}


@pytest.mark.parametrize(("pair", "expected"), sorted(ISUP_TABLE.items()))
def test_grade_group_table_exhaustive(pair: tuple[int, int], expected: int | None) -> None:
    # ISUP 2014 consensus / WHO 2016: <=6 -> 1, 3+4 -> 2, 4+3 -> 3, 8 -> 4, 9-10 -> 5
    assert grade_group(*pair) == expected


def test_grade_group_table_spot_checks() -> None:
    # ISUP 2014 / WHO 2016, the five rows as published
    assert grade_group(3, 3) == 1
    assert grade_group(3, 4) == 2
    assert grade_group(4, 3) == 3
    assert {grade_group(4, 4), grade_group(3, 5), grade_group(5, 3)} == {4}
    assert {grade_group(4, 5), grade_group(5, 4), grade_group(5, 5)} == {5}
    assert grade_group(0, 3) is None and grade_group(6, 1) is None


@pytest.mark.parametrize(
    ("total", "expected"), [(2, 1), (5, 1), (6, 1), (7, None), (8, 4), (9, 5), (10, 5), (11, None)]
)
def test_grade_group_from_total(total: int, expected: int | None) -> None:
    # ISUP 2014 / WHO 2016: a total decides the group except for 7 (3+4 vs 4+3)
    assert grade_group_from_total(total) == expected


@pytest.mark.parametrize(
    ("text", "pair"),
    [
        ("Gleason score 2+5=7", (2, 5)),
        ("Gleason score 5+2=7", (5, 2)),
    ],
)
def test_seven_outside_the_table_is_flagged_not_grouped(
    values_of: Reader, text: str, pair: tuple[int, int]
) -> None:
    # ISUP 2014 / WHO 2016: grade groups 2 and 3 are 3+4 and 4+3 only
    (v,) = values_of(text, "gleason_score")
    assert "grade_group_undefined" in v.flags
    assert values_of(text, "grade_group") == []


@pytest.mark.parametrize(
    ("text", "value"),
    [
        ("Gleason score 3+4=8", "3+4=8"),
        ("Gleason score 4+4=7", "4+4=7"),
        ("Gleason 7 (4+4)", "4+4=7"),
        ("primary pattern 3, secondary pattern 3, total score 7", "3+3=7"),
    ],
)
def test_sum_mismatch_is_flagged_kept_and_not_grouped(
    values_of: Reader, text: str, value: str
) -> None:
    # ISUP 2014: the score is primary + secondary; a wrong total is reported, not corrected
    (v,) = values_of(text, "gleason_score")
    assert v.value == value
    assert "gleason_sum_mismatch" in v.flags
    assert values_of(text, "grade_group") == []


GROUPS = [
    ("Grade Group 2", 2, "Grade Group 2"),
    ("Prostate biopsy: GG 3.", 3, "GG 3"),
    ("adenocarcinoma (GG1), left", 1, "GG1"),
    ("Prostate, needle core: ISUP grade 4.", 4, "ISUP grade 4"),
    ("Prostate, WHO grade group 5", 5, "WHO grade group 5"),
    ("Grade group: 2 (of 5)", 2, "Grade group: 2 (of 5)"),
    ("ISUP Grade Group 2 (of 5) for the prostate", 2, "ISUP Grade Group 2 (of 5)"),
    ("Prostate: Grade group 2/5", 2, "Grade group 2/5"),
    ("Prognostic Grade Group 3 (prostatic carcinoma)", 3, "Prognostic Grade Group 3"),
    ("Grade Group IV, prostate", 4, "Grade Group IV"),
    ("ISUP/WHO grade group 1.", 1, "ISUP/WHO grade group 1"),
    ("Gleason grade group 2", 2, "Gleason grade group 2"),
]


@pytest.mark.parametrize(("text", "value", "evidence"), GROUPS)
def test_stated_grade_groups(values_of: Reader, text: str, value: int, evidence: str) -> None:
    stated = [v for v in values_of(text, "grade_group") if not v.detail["derived"]]
    assert [(v.value, v.text) for v in stated] == [(value, evidence)]


def test_stated_group_that_contradicts_its_score_is_flagged(values_of: Reader) -> None:
    # ISUP 2014 / WHO 2016: 3+4=7 is grade group 2
    text = "Gleason score 3+4=7 (Grade Group 3)"
    stated = [v for v in values_of(text, "grade_group") if not v.detail["derived"]]
    assert stated[0].value == 3
    assert "grade_group_mismatch" in stated[0].flags
    assert stated[0].detail["gleason"] == "3+4=7"


def test_stated_group_that_agrees_is_not_flagged(values_of: Reader) -> None:
    text = "Gleason score 4+3=7, Grade Group 3"
    stated = [v for v in values_of(text, "grade_group") if not v.detail["derived"]]
    assert stated[0].value == 3 and stated[0].flags == ()


def test_total_alone_gives_a_group_but_no_score(values_of: Reader) -> None:
    # ISUP 2014: a total of 6 is grade group 1 whatever the patterns
    text = "Adenocarcinoma, Gleason score 6, two cores."
    assert values_of(text, "gleason_score") == []
    (g,) = values_of(text, "grade_group")
    assert g.value == 1 and g.detail == {"derived": True, "from_total": True}
    assert g.text == "Gleason score 6"


@pytest.mark.parametrize(
    "text",
    [
        "Adenocarcinoma, Gleason score 7.",  # 3+4 or 4+3: no score and no group
        "Gleason 4: 70%, Gleason 5: 20%",  # pattern percentages
        "GLEASON 4/5 PERCENTAGE: 30%",
        "Gleason pattern 4 comprises the minority of the tumour.",
        "Gleason score 3+6=9",  # no pattern 6
        "Gleason grade: see comment",
        "Benign prostatic tissue. No carcinoma identified.",
        "ISUP grade 3 clear cell renal cell carcinoma of the kidney",  # nucleolar grade
        "WHO grade 2 meningioma",
        "Grade group 6",
        "The grading system has five grade groups.",
    ],
)
def test_no_gleason_or_group_where_none_is_stated(
    read: Callable[..., list[Value]], text: str
) -> None:
    assert [v for v in read(text) if v.key in ("gleason_score", "grade_group")] == []


def test_two_scores_in_one_report_are_both_read(values_of: Reader) -> None:
    text = "A. Left: Gleason score 3+3=6.\nB. Right: Gleason score 4+3=7."
    assert [v.value for v in values_of(text, "gleason_score")] == ["3+3=6", "4+3=7"]


def test_offsets_point_into_the_original_text(read: Callable[..., list[Value]]) -> None:
    prefix = "CLINICAL HISTORY: elevated PSA.\n\nDIAGNOSIS:\n"
    text = prefix + "Adenocarcinoma, Gleason score 4+3=7."
    v = next(x for x in read(text) if x.key == "gleason_score")
    assert v.start == len(prefix) + len("Adenocarcinoma, ")
    assert text[v.start : v.end] == "Gleason score 4+3=7"
