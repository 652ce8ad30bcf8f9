"""Nothing is invented: no category where the report states none.

Derived staging is out of scope: a tumour size, a node count or an MRI
"T2-weighted" sequence never becomes a pT or pN; OCR debris after the word
Gleason never becomes a score; a QA form's "Prior Malignancy History" line
never becomes a diagnosis.  Every fragment here is invented.
"""

from __future__ import annotations

from functools import cache

import pytest

from pathsieve import Labeler


@cache
def _labeler(scheme: str) -> Labeler:
    return Labeler(scheme)


@pytest.mark.parametrize(
    ("scheme", "text"),
    [
        ("lung", "DIAGNOSIS: Lung, lobectomy: adenocarcinoma, 4.1 cm, invading the visceral "
                 "pleura. Two of nine lymph nodes with metastatic carcinoma (2/9).\n"),
        ("lung", "CLINICAL HISTORY: MRI T2-weighted images show a 3 cm mass; vertebra T12 "
                 "intact.\nDIAGNOSIS: Lung, biopsy: adenocarcinoma.\n"),
        ("colorectal", "DIAGNOSIS: Colon, resection: adenocarcinoma invading into the "
                       "pericolic fat. No lymph nodes identified. The pTNM classification "
                       "could not be assigned.\n"),
        ("colorectal", "DIAGNOSIS: Colon, resection: adenocarcinoma. Clinical stage cT3 N0 "
                       "before surgery.\n"),
        ("cervix", "DIAGNOSIS: Cervix, LEEP: invasive squamous cell carcinoma, depth 4 mm, "
                   "FIGO stage IB1 per clinician.\n"),
        ("prostate", "DIAGNOSIS: Prostate, biopsy: adenocarcinoma.\nGleason score on the "
                     "initial\npathology report is\n.3f-4= r7\n"),
    ],
)  # fmt: skip
def test_no_category_or_score_without_a_statement(scheme: str, text: str) -> None:
    res = _labeler(scheme).label_report(text)
    for key in ("pt", "pn", "pm"):
        assert key not in res.case.values, res.case.values[key]
    if scheme == "prostate":
        assert "gleason_score" not in res.case.values
        assert "grade_group" not in res.case.values


@pytest.mark.parametrize("scheme", ["colorectal", "lung", "prostate", "cervix"])
def test_qa_form_lines_are_no_diagnosis(scheme: str) -> None:
    text = (
        "Criteria\nDiagnosis Discrepancy\nPrimary Tumor Site Discrepancy\n"
        "Prior Malignancy History\nDual/Synchronous Primary Noted\n"
        "Case is (circle): QUALIFIED / DISQUALIFIED\n"
    )
    res = _labeler(scheme).label_report(text)
    assert res.positive() == []
    assert res.case.values == {}
