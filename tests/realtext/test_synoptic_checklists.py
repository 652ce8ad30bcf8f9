"""CAP-style synoptic checklists as real exports print them.

Key and value on separate lines with no colon ("HISTOLOGIC TYPE" / "ACINAR
ADENOCARCINOMA"), lettered sub-items ("a. Primary pattern: 4/5"), checklist
fields after an unrelated field header ("CLINICAL DATA: PSA value: ..."),
and staging choices printed with their wording ("pN1: Metastasis in ...")
after wrapped explanatory lines.  Every fragment here is invented.
"""

from __future__ import annotations

from functools import cache

import pytest

from pathsieve import Labeler


@cache
def _labeler(scheme: str) -> Labeler:
    return Labeler(scheme)


KEY_LINE_VALUE_LINE = (
    "PROSTATE AND PELVIC LYMPH NODES: RADICAL PROSTATECTOMY:\n"
    "HISTOLOGIC TYPE\n"
    "ACINAR ADENOCARCINOMA\n"
    "HISTOLOGIC GRADE (PRIMARY PATTERN+SECONDARY PATTERN = GLEASON SCORE):\n"
    "4+3=7\n"
    "SURGICAL MARGINS\n"
    "FREE OF INVASIVE CARCINOMA\n"
    "PATHOLOGICAL STAGING\n"
    "pT3a\n"
    "pNO\n"
    "pMX\n"
)
LETTERED_ITEMS = (
    "DIAGNOSIS:\n"
    "C. Prostate, prostatectomy:\n"
    "Tumor Characteristics:\n"
    "1. Histologic type: Adenocarcinoma.\n"
    "2. Gleason grade:\n"
    "a. Primary pattern: 4/5.\n"
    "b. Secondary pattern: 3/5.\n"
    "c. Total Gleason score: 7/10.\n"
    "3. Extraprostatic extension: Not identified.\n"
)
FIELDS_AFTER_CLINICAL_DATA = (
    "CASE SYNOPSIS:\n"
    "SYNOPTIC DATA - PRIMARY PROSTATE TUMORS\n"
    "CLINICAL DATA: PSA value: 5.0\n"
    "INVASIVE CA IDENTIFIED?: Yes\n"
    "TUMOR HISTOLOGY: Adenocarcinoma NOS\n"
    "PRIMARY GLEASON GRADE: 4\n"
    "SECONDARY GLEASON GRADE: 3\n"
    "GLEASON SUM SCORE: 7\n"
    "TUMOR SIZE: 1.2 cm\n"
)
STAGING_AFTER_WRAPPED_TEXT = (
    "DIAGNOSIS:\nLung, right lower lobe, lobectomy: squamous cell carcinoma.\n"
    "SPECIMEN\n"
    "Procedure: Lobectomy\n"
    "Histologic Type: Squamous cell carcinoma\n"
    "Histologic Grade: G2: Moderately differentiated\n"
    "Tumor Size: 1.5 cm\n"
    "Bronchial Margin Involvement by Squamous Cell Carcinoma in situ\n"
    "(CIS):\n"
    "not identified at bronchial\n"
    "margin\n"
    "Primary Tumor (pT):\n"
    "pT1a: Tumor 2 cm or less in greatest dimension, surrounded by lung\n"
    "or visceral pleura, without bronchoscopic evidence of invasion more\n"
    "proximal than the lobar bronchus\n"
    "Regional Lymph Nodes (pN) pN1: Metastasis in ipsilateral peribronchial\n"
    "and/or hilar lymph nodes\n"
)


@pytest.mark.parametrize(
    ("scheme", "text", "states", "values"),
    [
        ("prostate", KEY_LINE_VALUE_LINE, {"adenocarcinoma": "present"},
         {"gleason_score": "4+3=7", "grade_group": 3, "pt": "pT3a", "pn": "pN0"}),
        ("prostate", LETTERED_ITEMS, {"adenocarcinoma": "present"},
         {"gleason_score": "4+3=7", "grade_group": 3}),
        ("prostate", FIELDS_AFTER_CLINICAL_DATA, {"adenocarcinoma": "present"},
         {"gleason_score": "4+3=7", "grade_group": 3}),
        ("lung", STAGING_AFTER_WRAPPED_TEXT, {"squamous_cell_carcinoma": "present"},
         {"pt": "pT1a", "pn": "pN1"}),
    ],
)  # fmt: skip
def test_checklist_layouts(
    scheme: str, text: str, states: dict[str, str], values: dict[str, object]
) -> None:
    res = _labeler(scheme).label_report(text)
    for key, state in states.items():
        assert res.case.states[key].state == state, key
    for key, value in values.items():
        assert key in res.case.values, key
        assert res.case.values[key].value == value, key


def test_lettered_checklist_items_are_not_specimen_parts() -> None:
    report = _labeler("prostate").read(LETTERED_ITEMS)
    assert not {"A", "B"} & {p.label for p in report.parts}
    (score,) = [v for v in report.values if v.key == "gleason_score"]
    assert score.text.startswith("Primary pattern") and score.text.endswith("7")
