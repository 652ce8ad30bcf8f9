"""OCR letter/digit confusions: I, l and 1; O and 0; and misread letters in names.

"pTl pNO" is pT1 pN0 (flagged ``ocr_corrected``); "squamous call carcinoma",
"SQUAMOUS 0E11 CARCINOMA" and "AOENOCARCINOMA" name the concept -- but an
ordinary word stays itself outside a name.  Every fragment here is invented.
"""

from __future__ import annotations

from functools import cache

import pytest

from pathsieve import Labeler
from pathsieve.values import extract_values


@cache
def _labeler(scheme: str) -> Labeler:
    return Labeler(scheme)


def _tnm(text: str) -> list[tuple[str, str, str]]:
    found = extract_values(text, [(0, len(text), "diagnosis", "")])
    return [(v.key, str(v.value), v.text) for v in found if v.key in ("pt", "pn", "pm")]


@pytest.mark.parametrize(
    ("text", "expected"),
    [
        ("Tumor stage pTl pNO (0/17) LO VO; G2 R0.", [("pt", "pT1", "pTl"), ("pn", "pN0", "pNO")]),
        ("REGIONAL LYMPH NODES (pN): pNO: No regional lymph node metastasis",
         [("pn", "pN0", "pNO")]),
        ("Regional Lymph Nodes (pN) pNl: Metastasis in ipsilateral peribronchial nodes",
         [("pn", "pN1", "pNl")]),
        ("TNM classification pT2 pNO RO, stage IB.", [("pt", "pT2", "pT2"), ("pn", "pN0", "pNO")]),
        ("Pathological stage pTIb pNI Stage IIA", [("pt", "pT1b", "pTIb"), ("pn", "pN1", "pNI")]),
    ],
)  # fmt: skip
def test_ocr_digits_in_categories(text: str, expected: list[tuple[str, str, str]]) -> None:
    assert _tnm(text) == expected
    for v in extract_values(text, [(0, len(text), "diagnosis", "")]):
        if v.key in ("pt", "pn"):
            # AJCC syntax has digits only: a letter read as a digit is flagged
            assert ("ocr_corrected" in v.flags) == any(c in v.text[2:] for c in "OIl"), v


@pytest.mark.parametrize(
    ("scheme", "text", "key"),
    [
        ("lung", "DIAGNOSIS:\nLung, lobectomy: invasive squamous call carcinoma.\n",
         "squamous_cell_carcinoma"),
        ("lung", "DIAGNOSIS:\nLUNG, LOBECTOMY: SQUAMOUS 0E11 CARCINOMA.\n", "squamous_cell_carcinoma"),
        ("cervix", "IMPRESSION:\nCervix, biopsy: invasive squamcus cell carcinoma, keratinizing.\n",
         "squamous_cell_carcinoma"),
        ("cervix", "DIAGNOSIS:\nCERVIX, BIOPSY - POORLY DIFFERENTIATED AOENOCARCINOMA\n",
         "adenocarcinoma"),
        ("colorectal", "DIAGNOSIS:\nColon, resection: invasive adenocarcinorna.\n", "adenocarcinoma"),
    ],
)  # fmt: skip
def test_misread_letters_inside_a_name(scheme: str, text: str, key: str) -> None:
    res = _labeler(scheme).label_report(text)
    assert res.case.states[key].state == "present"
    fuzzy = [r.mention for r in res.evidence if r.mention and key in r.labels and r.decides]
    assert fuzzy and all(m.match == "fuzzy" and m.note for m in fuzzy)


@pytest.mark.parametrize(
    ("scheme", "text"),
    [
        # the same ordinary words outside a name stay themselves
        ("lung", "DIAGNOSIS:\nBenign lung. The call was returned to the clinic.\n"),
        ("lung", "DIAGNOSIS:\nBenign lung; squamous metaplasia. A call to the surgeon was made.\n"),
        ("colorectal", "DIAGNOSIS:\nBenign colonic mucosa. pT2 No evidence of dysplasia.\n"),
    ],
)
def test_no_reading_without_the_rest_of_the_name(scheme: str, text: str) -> None:
    res = _labeler(scheme).label_report(text)
    assert "squamous_cell_carcinoma" not in res.positive()
    assert "pn" not in res.case.values
