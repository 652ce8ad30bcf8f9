"""Barcode and form-scanning garbage lines in OCR'd report exports.

Real exports carry lines of barcode residue ("IIII1111lIlI"), UUID stamps and
the footer of a scanned quality-assurance form.  They must neither hide the
diagnosis that follows them nor add labels or values of their own.  Every
fragment here is invented.
"""

from __future__ import annotations

from functools import cache

import pytest

from pathsieve import Labeler
from pathsieve.aggregate import CaseLabels

GARBAGE = (
    "UUID:0A1B2C3D-4E5F-6071-8293-A4B5C6D7E8F9\n"
    "TCGA-XX-0000-01A-PR Redacted\n"
    "III IIIIIIIIIII1111111IIIIlllll1111 lIl II1 ^^I1 ll1II\n"
    "II 1 11 1 ^ l ii i ^ 11 11 1 I1 ^^ 1 11 ,a;d c0ot„ c/YIII\n"
)
QA_FOOTER = (
    "Criteria\n"
    "Diagnosis Discrepancy\n"
    "Primary Tumor Site Discrepancy\n"
    "HIPAA Discrepancy\n"
    "Prior Malignancy History\n"
    "Dual/Synchronous Primary Noted\n"
    "Case is (circle): QUALIFIED / DISQUALIFIED\n"
    "Reviewer Initials ____ Date Reviewed: ____\n"
)


@cache
def _labeler(scheme: str) -> Labeler:
    return Labeler(scheme)


def label(scheme: str, text: str) -> CaseLabels:
    res = _labeler(scheme).label_report(text)
    for row in res.evidence:  # evidence always points at the original text
        item = row.mention or row.value
        assert item is not None and text[item.start : item.end] == item.text
    return res


@pytest.mark.parametrize(
    ("scheme", "body", "key"),
    [
        (
            "colorectal",
            "DIAGNOSIS:\nSigmoid colon, resection:\n- Invasive adenocarcinoma, moderately differentiated.\n",
            "adenocarcinoma",
        ),
        (
            "lung",
            "FINAL DIAGNOSIS:\nLung, right upper lobe, lobectomy:\n- Squamous cell carcinoma, 2.4 cm.\n",
            "squamous_cell_carcinoma",
        ),
        (
            "prostate",
            "Diagnosis:\nProstate, radical prostatectomy: acinar adenocarcinoma, Gleason score 3+4=7.\n",
            "adenocarcinoma",
        ),
    ],
)
def test_garbage_before_and_after_the_diagnosis_changes_nothing(
    scheme: str, body: str, key: str
) -> None:
    clean = label(scheme, body)
    noisy_text = GARBAGE + body + QA_FOOTER
    noisy = label(scheme, noisy_text)
    assert noisy.case.states[key].state == "present"
    assert {k: s.state for k, s in noisy.case.states.items()} == {
        k: s.state for k, s in clean.case.states.items()
    }
    assert {k: v.value for k, v in noisy.case.values.items()} == {
        k: v.value for k, v in clean.case.values.items()
    }


@pytest.mark.parametrize("scheme", ["colorectal", "lung", "prostate", "cervix"])
def test_garbage_alone_yields_no_label_and_no_value(scheme: str) -> None:
    res = label(scheme, GARBAGE + QA_FOOTER)
    assert res.positive() == []
    assert res.case.values == {}
