"""Gleason forms seen in OCR'd exports, and the choice of one score among several.

Grade groups follow the ISUP 2014 / WHO 2016 table (score <= 6 -> 1, 3+4 -> 2,
4+3 -> 3, 8 -> 4, 9-10 -> 5); the score is primary + secondary (ISUP 2014).  The
case-level choice among several stated scores is trade practice, marked so beside
each check.  All texts are invented (fictional laboratory, no real report text).
"""

from __future__ import annotations

from collections.abc import Callable

import pytest

from pathsieve import Labeler
from pathsieve.records import Value

Reader = Callable[[str, str], list[Value]]

# (text, score read, grade group derived) -- grade group from the ISUP 2014 table
FIELD_FORMS = [
    # a field word run onto the field name
    ("a. Primarypattern: 3/5\nb. Secondarypattern: 4/5\n", "3+4=7", 2),
    # a field name glued to the word before it
    ("Margins free of tumorPRIMARY GLEASON GRADE: 4\nSECONDARY GLEASON GRADE: 3\n", "4+3=7", 3),
    ("Primary grade: 3 xq T+5 v SSecondary grade: 3\n", "3+3=6", 1),
    # the field word lost to OCR: one or two short tokens, no digit
    ("a. Primary pattern: 4/5.\nb. Secondary p.;ltern: 4/5.\n", "4+4=8", 4),
    ("Primary Pattern: G ade 4\nSecondary Pattern: &ade 5\n", "4+5=9", 5),
    # "out of five" with its slash read as a one
    ("a. Primary pattern: 315.\nb. Secondary pattern: 415.\n", "3+4=7", 2),
    # a checklist total written "sum score"
    ("PRIMARY GLEASON GRADE: 3\nSECONDARY GLEASON GRADE: 5\nGLEASON SUM SCORE: 8\n", "3+5=8", 4),
]


@pytest.mark.parametrize(("text", "score", "group"), FIELD_FORMS)
def test_field_forms(values_of: Reader, text: str, score: str, group: int) -> None:
    scores = values_of(text, "gleason_score")
    assert [v.value for v in scores] == [score]
    assert scores[0].detail["fields"] is True
    groups = [v.value for v in values_of(text, "grade_group")]
    assert group in groups  # ISUP 2014 grade-group table


def test_sum_score_total_is_kept(values_of: Reader) -> None:
    text = "PRIMARY GLEASON GRADE: 3\nSECONDARY GLEASON GRADE: 5\nGLEASON SUM SCORE: 8\n"
    (v,) = values_of(text, "gleason_score")
    assert v.detail["total_stated"] is True and v.text.endswith("8")


# A pair with its total and no name: read only when the total is the sum.
UNNAMED = [
    ("Prostate, radical prostatectomy: acinar adenocarcinoma, 5+4=9.", "5+4=9", 5),
    ("Prostatic adenocar ci noma, G eason score 3+4=7, bilateral.", "3+4=7", 2),
    ("Prostatic adenocarcinoma, G eason score 7( 3+4) ;organ confined", "3+4=7", 2),
]


@pytest.mark.parametrize(("text", "score", "group"), UNNAMED)
def test_unnamed_pair_with_its_total(values_of: Reader, text: str, score: str, group: int) -> None:
    assert [v.value for v in values_of(text, "gleason_score")] == [score]
    assert group in [v.value for v in values_of(text, "grade_group")]  # ISUP 2014 table


UNNAMED_REFUSED = [
    # total is not the sum: no self-check, nothing read
    "Prostatic adenocarcinoma, 3+4=8.",
    # no word of the prostate or of Gleason in the report: an Allred-like sum
    "Breast carcinoma; ER Allred score 5+3=8.",
    # three terms are not a pattern pair
    "Prostate: carcinoma, score 3+3+2=8.",
    # a pair without a total is not read without a name
    "Prostatic adenocarcinoma, 3+4 in two cores.",
]


@pytest.mark.parametrize("text", UNNAMED_REFUSED)
def test_unnamed_pair_refused(values_of: Reader, text: str) -> None:
    assert values_of(text, "gleason_score") == []


def test_main_word_marks_the_score(values_of: Reader) -> None:
    text = "Predominant pattern Gleason score 8 (4 + 4) with areas of Gleason score 9 (4 + 5)."
    scores = values_of(text, "gleason_score")
    assert [(v.value, bool(v.detail.get("main"))) for v in scores] == [
        ("4+4=8", True),
        ("4+5=9", False),
    ]


# ---------------------------------------------------------------- case-level choice
CHOICE = [
    # the predominant score of a prostatectomy, not a minor component (practice)
    (
        "FINAL DIAGNOSIS:\n1. Prostate, radical prostatectomy: adenocarcinoma, "
        "predominant pattern Gleason score 8 (4 + 4) with areas of Gleason score "
        "9 (4 + 5) in the left lobe.\n",
        "4+4=8",
        "4",
    ),
    (
        "FINAL DIAGNOSIS:\n1. Prostate, radical prostatectomy: adenocarcinoma, Gleason "
        "grade predominant pattern 7 (3+4) with a component of Gleason score 8 (4+4).\n",
        "3+4=7",
        "2",
    ),
    # named primary/secondary fields over a "P+S" summary line of the same
    # checklist (practice: the fields say which pattern is primary)
    (
        "FINAL DIAGNOSIS:\nB. Prostate, prostatectomy: adenocarcinoma.\n"
        "SYNOPTIC REPORT:\nPrimary Pattern: 3\nSecondary Pattern: 4\n"
        "Total Gleason Score (Primary + Secondary): 4+3\n",
        "3+4=7",
        "2",
    ),
    # with neither mark, the worst of several scores (unchanged behaviour)
    (
        "FINAL DIAGNOSIS:\nA. Prostate, right base, needle biopsy: adenocarcinoma, Gleason "
        "score 3+3=6.\nB. Prostate, left base, needle biopsy: adenocarcinoma, Gleason "
        "score 4+3=7.\n",
        "4+3=7",
        "3",
    ),
]


@pytest.fixture(scope="module")
def prostate() -> Labeler:
    return Labeler("prostate")


@pytest.mark.parametrize(("text", "score", "group"), CHOICE)
def test_case_level_choice(prostate: Labeler, text: str, score: str, group: str) -> None:
    values = prostate.label_report(text).case.values
    assert str(values["gleason_score"].value) == score
    assert str(values["grade_group"].value) == group  # ISUP 2014 grade-group table


def test_unnamed_pair_implies_adenocarcinoma(prostate: Labeler) -> None:
    # the histologic type lost to OCR: the grade group implies adenocarcinoma
    # (scheme implication; Gleason grading applies to prostatic adenocarcinoma only,
    # ISUP 2014)
    text = (
        "DIAGNOSIS:\nE. Prostate gland, radical prostatectomy:\n"
        "Pr ost at i c adenocar ci nqma, G eason score 3+4=7, organ confined.\n"
    )
    result = prostate.label_report(text)
    assert str(result.case.values["grade_group"].value) == "2"
    assert result.case.states["adenocarcinoma"].state in ("present", "likely")
