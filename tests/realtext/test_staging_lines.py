"""Staging lines as real reports write them (AJCC Cancer Staging Manual, 8th ed. syntax).

"pT3 N1b MX" (a bare N takes the string's prefix), "T3N0" and "T2NOMX" (no
prefix: read as pathological and flagged), "pT2 pNO RO" (OCR O for 0, a
residual-tumour code after it), "pT1 a NO" (a space inside the category),
"T4N2Ml" (OCR l for 1), "pT2NO cancer" (N glued to T).  MX is no category (AJCC 7th/8th ed.).  Every
fragment here is invented.
"""

from __future__ import annotations

from functools import cache

import pytest

from pathsieve import Labeler
from pathsieve.values import extract_values


@cache
def _labeler(scheme: str) -> Labeler:
    return Labeler(scheme)


def _tnm(text: str) -> dict[str, str]:
    found = extract_values(text, [(0, len(text), "diagnosis", "")])
    out: dict[str, str] = {}
    for v in found:
        assert text[v.start : v.end] == v.text
        if v.key in ("pt", "pn", "pm"):
            out.setdefault(v.key, str(v.value))
    return out


@pytest.mark.parametrize(
    ("text", "expected", "assumed"),
    [
        ("Pathologic stage: pT3 N1b MX", {"pt": "pT3", "pn": "pN1b"}, False),
        ("5: T3N0", {"pt": "pT3", "pn": "pN0"}, True),
        ("E: T2NOMX", {"pt": "pT2", "pn": "pN0"}, True),
        ("TNM classification pT2 pNO RO, stage IB.", {"pt": "pT2", "pn": "pN0"}, False),
        ("Pathologic stage: pT1 a NO", {"pt": "pT1a", "pn": "pN0"}, False),
        ("E: T4N2Ml", {"pt": "pT4", "pn": "pN2", "pm": "pM1"}, True),
        ("ypT2 N2 MO", {"pt": "ypT2", "pn": "ypN2", "pm": "cM0"}, False),
        ("(G2, pT2, L0, V0, R0, pN0 0/19)", {"pt": "pT2", "pn": "pN0"}, False),
        ("TNM stage: pT2a pN1 (2/14) pMX", {"pt": "pT2a", "pn": "pN1"}, False),
        # an N glued to its T is certain even before a word
        (
            "complete resection of a\nT2NO squamous cell carcinoma.",
            {"pt": "pT2", "pn": "pN0"},
            True,
        ),
        ("this tumor is staged as a pT2NO cancer,", {"pt": "pT2", "pn": "pN0"}, False),
        # ... but an N after a space, before a word, is the word "NO"
        ("pT2 NO EVIDENCE OF LYMPHOVASCULAR INVASION", {"pt": "pT2"}, False),
        ("pT2 No lymphovascular invasion", {"pt": "pT2"}, False),
        ("pT3 NOS", {"pt": "pT3"}, False),
        # OCR letters in every category when a heading makes the string pathological
        ("Pathological stage TINIMX", {"pt": "pT1", "pn": "pN1"}, False),
        # an OCR'd subcategory after an OCR'd digit: "pNlb" is pN1b
        ("Regional lymph nodes: pNlb", {"pn": "pN1b"}, False),
        ("Astler-Coller C2, pT3, pNlb, R0).", {"pt": "pT3", "pn": "pN1b"}, False),
        # glued strings go on with M, R, L or V (UICC descriptors)
        ("(T2aNOMIa, stage IV)", {"pt": "pT2a", "pn": "pN0", "pm": "pM1a"}, True),
        ("UICC stage: pT3aN1R1.", {"pt": "pT3a", "pn": "pN1"}, False),
        ("AJCC pathologic staging: pT2bNOM-n/a", {"pt": "pT2b", "pn": "pN0"}, False),
        ("Tumor classification: G2, pT2 NO LO VO RO.", {"pt": "pT2", "pn": "pN0"}, False),
        # an N after a slash belongs to the string
        ("PATHOLOGIC STAGE: T2a2/NO FIGO IIA2", {"pt": "pT2a2", "pn": "pN0"}, False),
        # a table row under a "Pathological T" column heading; ", NOS" after a category
        (
            "Grade/DifferentiationPathological T Pathological N Clinical M Stage\nIII T2,NOS N1 M0",
            {"pt": "pT2", "pn": "pN1", "pm": "cM0"},
            False,
        ),
        (
            "Size (cm)HistologyPathological TPathological NClinical M Comments\n"
            "4.10 02 IB T2,NOS N0 M0 right upper lobe",
            {"pt": "pT2", "pn": "pN0", "pm": "cM0"},
            False,
        ),
        # a numbered subdivision written apart (cervix: AJCC 8 T1b2)
        ("Pathologic staging (pTNM): pT 1 b2 N 0 M X", {"pt": "pT1b2", "pn": "pN0"}, False),
    ],
)
def test_staging_line_forms(text: str, expected: dict[str, str], assumed: bool) -> None:
    assert _tnm(text) == expected
    flags = {f for v in extract_values(text, [(0, len(text), "diagnosis", "")]) for f in v.flags}
    assert ("prefix_assumed" in flags) == assumed


def test_a_staging_line_reaches_the_case_labels() -> None:
    text = (
        "DIAGNOSIS: Colon, sigmoid, resection: invasive adenocarcinoma.\n"
        "Tumor stage therefore pT3 pN1a (1/17) L1 V0; G2 R0.\n"
    )
    res = _labeler("colorectal").label_report(text)
    assert res.case.values["pt"].value == "pT3"
    assert res.case.values["pn"].value == "pN1a"
    assert res.case.values["lymph_nodes_positive"].value == 1
