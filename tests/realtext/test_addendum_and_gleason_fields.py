"""An addendum that only negates a broad class; Gleason fields with OCR marks.

* A short addendum "margin not involved by neoplasm" speaks of a parent class:
  it does not amend the squamous cell carcinoma stated in the (headerless)
  diagnosis, while an addendum that names the label still wins (LABELS.md: an
  addendum that changes the diagnosis wins).
* Checklists read by OCR put stray marks between a field and its value
  ("Primary pattern:' 4/5.", "Secondary pattern :,Grade 3."); the pattern pair
  is still read, and the total checked against it (ISUP 2014: the score is the
  sum of the primary and secondary patterns).
* A grade group (stated or derived) in a part whose histologic type OCR has
  wrecked makes adenocarcinoma likely (the prostate scheme's implication:
  Gleason patterns grade prostatic adenocarcinoma only).

Every fragment here is invented.
"""

from __future__ import annotations

from functools import cache

import pytest

from pathsieve import Labeler
from pathsieve.values import extract_values


@cache
def _labeler(scheme: str) -> Labeler:
    return Labeler(scheme)


_LEAD = (
    "Lung, left upper lobe, lobectomy: Invasive squamous cell carcinoma forming a 2.4 cm\n"
    "mass, 0.9 cm from the bronchial margin. Five peribronchial lymph nodes negative (0/5).\n"
)


@pytest.mark.parametrize(
    ("addendum", "state"),
    [
        ("ADDENDUM:\nThe re-submitted bronchial margin is not involved by neoplasm.\n", "present"),
        ("ADDENDUM:\nThe bronchial margin is free of malignancy on deeper levels.\n", "present"),
        # an addendum that names the label itself still wins
        ("ADDENDUM:\nOn review, no squamous cell carcinoma is present; see revised report.\n",
         "absent"),
    ],
)  # fmt: skip
def test_broad_negation_in_addendum_does_not_amend(addendum: str, state: str) -> None:
    res = _labeler("lung").label_report(_LEAD + addendum)
    assert res.case.states["squamous_cell_carcinoma"].state == state


def _gleason(text: str) -> list[tuple[str, object]]:
    found = extract_values(text, [(0, len(text), "synoptic", "")])
    return [(v.key, v.value) for v in found if v.key in ("gleason_score", "grade_group")]


@pytest.mark.parametrize(
    ("text", "expected"),
    [
        ("4. Gleason grade:\na. Primary pattern:' 4/5.\nb. Secondary pattern: 5/5.\n"
         "c. Total Gleason score: 9/10.\n",
         [("gleason_score", "4+5=9"), ("grade_group", 5)]),
        ("Histologic Grade Gleason Pattern\nPrimary pattern :.Grade 3.\n"
         "Secondary pattern :Grade 4.\nTotal Gleason Score: 7.\n",
         [("gleason_score", "3+4=7"), ("grade_group", 2)]),
        ("Primary pattern :Grade 3.\nSecondary pattern :,Grade 3.\nTotal Gleason Score: 6.\n",
         [("gleason_score", "3+3=6"), ("grade_group", 1)]),
        # the total still has to add up: 4 + 3 stated as 8 is flagged, no group derived
        ("Primary pattern:' 4\nSecondary pattern:' 3\nTotal Gleason score: 8\n",
         [("gleason_score", "4+3=8")]),
    ],
)  # fmt: skip
def test_gleason_fields_with_stray_marks(text: str, expected: list[tuple[str, object]]) -> None:
    assert _gleason(text) == expected


@pytest.mark.parametrize(
    ("text", "state"),
    [
        # the histologic type lost to OCR; the pattern pair still says adenocarcinoma
        ("DIAGNOSIS:\nC. Prostate, radical prostatectomy:\nTumor characteristics:\n"
         "1. Histologic type&\\'W1Q~o1!i~\n2. Gleason's grade:\na. Primary pattern: 3 of 5.\n"
         "b. Secondary pattern: 4 of 5.\n", "likely"),
        ("FINAL DIAGNOSIS:\nProstate, needle biopsy, left apex:\n(Gleason 4+3=7; tertiary grade 5) "
         "in 3 of 4 cores.\n", "likely"),
        # a named diagnosis keeps its own state
        ("DIAGNOSIS:\nProstatic adenocarcinoma, Gleason score 3+4=7 (grade group 2).\n", "present"),
        # a grade from the clinical history does not imply anything in a benign biopsy
        ("CLINICAL HISTORY:\nPrior biopsy at Quillon Ridge Clinic, Gleason 3+4=7.\n"
         "DIAGNOSIS:\nProstate, needle biopsy, right base: benign prostatic tissue.\n", None),
    ],
)  # fmt: skip
def test_grade_group_implies_adenocarcinoma(text: str, state: str | None) -> None:
    # ISUP 2014 / WHO 2016: Gleason patterns grade prostatic adenocarcinoma only
    states = _labeler("prostate").label_report(text).case.states
    got = states["adenocarcinoma"].state if "adenocarcinoma" in states else None
    assert got == state, states
