"""Frozen-section diagnoses as support; "non-small cell carcinoma with squamous features".

Real exports often state the tumour type only in the frozen-section
(intraoperative) diagnosis: the permanent diagnosis reads "same", or its type
word is lost to OCR.  The frozen-section text reads like a comment: it decides
a label no diagnosis section mentions, never one the permanent diagnosis
decides.  Lung reports write "non-small cell carcinoma with squamous
features", which WHO small-specimen terminology reads as squamous cell
carcinoma, not as NSCLC NOS.  Every fragment here is invented (fictional
laboratory, people and accession numbers).
"""

from __future__ import annotations

from functools import cache

import pytest

from pathsieve import Labeler


@cache
def _labeler(scheme: str) -> Labeler:
    return Labeler(scheme)


def _states(scheme: str, text: str) -> dict[str, str]:
    res = _labeler(scheme).label_report(text)
    return {k: s.state for k, s in res.case.states.items()}


def _deciding_sections(scheme: str, text: str, key: str) -> set[str]:
    res = _labeler(scheme).label_report(text)
    return {
        r.mention.section
        for r in res.evidence
        if r.mention is not None and r.decides and key in r.labels
    }


@pytest.mark.parametrize(
    ("scheme", "text", "key", "state"),
    [
        # the permanent diagnosis defers to the frozen section
        (
            "lung",
            "ACCESSION: QX-24-0311\nFINAL DIAGNOSIS:\nA. Lung, left upper lobe, lobectomy:\n"
            "See frozen section.\nINTRAOPERATIVE CONSULTATION:\n"
            "A. FROZEN SECTION DIAGNOSIS: SQUAMOUS CELL CARCINOMA.\nPERMANENT DIAGNOSIS: SAME\n",
            "squamous_cell_carcinoma",
            "present",
        ),
        # the type word of the permanent diagnosis is lost to OCR
        (
            "colorectal",
            "Brightwater Pathology Group  Acc. BW-88-1207\nDIAGNOSIS:\n"
            "1. Sigmoid colon, resection: ADXQ#RC!N&MA, moderately differentiated.\n"
            "FROZEN SECTION:\n1. Sigmoid colon: adenocarcinoma, margins free.\n",
            "adenocarcinoma",
            "present",
        ),
    ],
)
def test_frozen_section_supports(scheme: str, text: str, key: str, state: str) -> None:
    assert _states(scheme, text).get(key) == state
    assert _deciding_sections(scheme, text, key) == {"comment"}


def test_frozen_section_never_overrides_the_permanent_diagnosis() -> None:
    # negative case: the permanent diagnosis negates what the frozen section said
    text = (
        "FINAL DIAGNOSIS:\nLung, right lower lobe, lobectomy: squamous cell carcinoma;\n"
        "no adenocarcinoma component.\nFROZEN SECTION DIAGNOSIS:\nAdenocarcinoma.\n"
    )
    states = _states("lung", text)
    assert states["squamous_cell_carcinoma"] == "present"
    assert states["adenocarcinoma"] == "absent"


@pytest.mark.parametrize(
    ("text", "expected"),
    [
        (
            "DIAGNOSIS:\nC. Lung, right upper lobe, lobectomy:\n"
            "POORLY DIFFERENTIATED NON-SMALL CELL CARCINOMA WITH\nSQUAMOUS FEATURES.\n",
            {"squamous_cell_carcinoma": "present"},
        ),
        # checklist value with the head noun dropped
        (
            "SYNOPTIC REPORT\nHISTOLOGIC TYPE: NON-SMALL CELL WITH SQUAMOUS FEATURES\n"
            "HISTOLOGIC GRADE: G3\nTUMOR SIZE: 3.1 cm\n",
            {"squamous_cell_carcinoma": "present"},
        ),
        # negative cases: NSCLC not otherwise specified stays NOS; a negated one is absent
        (
            "DIAGNOSIS:\nLung, wedge biopsy: non-small cell carcinoma, not otherwise specified.\n",
            {"nsclc_nos": "present"},
        ),
        (
            "DIAGNOSIS:\nLymph node, station 7: negative for non-small cell carcinoma with "
            "squamous features (0/2).\n",
            {"squamous_cell_carcinoma": "absent"},
        ),
    ],
)
def test_nsclc_with_squamous_features(text: str, expected: dict[str, str]) -> None:
    states = _states("lung", text)
    for key, state in expected.items():
        assert states.get(key) == state, states
    if "nsclc_nos" in expected:
        assert "squamous_cell_carcinoma" not in states
