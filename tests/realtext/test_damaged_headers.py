"""Headers OCR has damaged beyond one letter, and headers joined to the line before.

Real exports write "I1PRESSION:" (a digit for a letter, text run on after the
colon), "INPRE S S ION :" (letters spaced out), "II+WRESSION:" (two letters and
a stray mark), a header lost in a garbled line of stars, or a header that ends
the line of other text before it ("...left vas DIAGNOSIS:").  The diagnosis
under such a header must decide; ordinary words and checklist lines must stay
what they are.  Every fragment here is invented (fictional laboratory, people
and accession numbers).
"""

from __future__ import annotations

from functools import cache

import pytest

from pathsieve import Labeler
from pathsieve.sections import find_sections


@cache
def _labeler(scheme: str) -> Labeler:
    return Labeler(scheme)


def _kinds(text: str) -> list[tuple[str, str]]:
    return [(s.kind, s.header) for s in find_sections(text) if s.header]


def _decides(scheme: str, text: str, key: str) -> list[str]:
    res = _labeler(scheme).label_report(text)
    assert res.case.states[key].state == "present", res.case.states
    return [
        r.mention.section
        for r in res.evidence
        if r.mention is not None and r.decides and key in r.labels
    ]


_HISTORY = "CLINICAL HISTORY:\nPelvic mass, Larkspur Valley Clinic.\nSPECIMEN/PROCEDURE:\n1. CERVIX - BIOPSY\n"


@pytest.mark.parametrize(
    "header_line",
    [
        "I1PRESSION:Subm Dr Q. Ferrand :",  # digit for a letter, text run on
        "INPRE S S ION :PAGE:1",  # letters spaced out, one misread
        "II+WRESSION:",  # two letters misread and a stray mark
        "IMPRESS1ON:",
        "IMPRESS!ON:",  # a mark for a letter
        "XPRESSION:",  # the first letter lost
    ],
)
def test_damaged_impression_header_heads_the_diagnosis(header_line: str) -> None:
    text = (
        _HISTORY + header_line + "\nCERVIX, 3 O'CLOCK, BIOPSY:\n"
        "Invasive squamous cell carcinoma, keratinizing, moderately differentiated.\n"
        "GROSS DESCRIPTION:\nReceived in formalin, one tan fragment, 0.4 cm. Accession ZP-0417.\n"
    )
    assert ("diagnosis", header_line.split(":")[0].rstrip()) in _kinds(text)
    assert "diagnosis" in _decides("cervix", text, "squamous_cell_carcinoma")


@pytest.mark.parametrize(
    ("line", "kind"),
    [
        ("********'II.*'IIDIAGNOSI5******U***", "diagnosis"),
        ("at**aat***DIAGNOSIS*t* aaaat***", "diagnosis"),
        ("~~~~ GR0SS DESCRIPTI0N ~~~~~~~~~~~~", "gross"),
    ],
)
def test_header_in_garbled_decoration(line: str, kind: str) -> None:
    text = (
        "PREOPERATIVE DIAGNOSIS: Right lung mass\n" + line + "\n"
        "A. Right lower lobe, lobectomy:\nWell-differentiated adenocarcinoma, 3.1 cm.\n"
    )
    assert [k for k, _ in _kinds(text)][-1] == kind
    if kind == "diagnosis":
        assert "diagnosis" in _decides("lung", text, "adenocarcinoma")


@pytest.mark.parametrize(
    ("line", "kind"),
    [
        ("DIAGNO$IS", "diagnosis"),  # "$" for "S"
        ("DIDGHOSIS", "diagnosis"),  # two letters misread in a head of nine, in capitals
        ("MICROS(OPIC DESCRIPTION", "microscopic"),  # "(" for "C"
        ("F|NAL DIAGNOSIS:", "diagnosis"),  # "|" for "I"
    ],
)
def test_header_with_marks_for_letters(line: str, kind: str) -> None:
    text = (
        "CLINICAL HISTORY: Left lung mass, Larkspur Valley Clinic.\n" + line + "\n"
        "A. Left upper lobe, lobectomy:\nModerately differentiated adenocarcinoma, 2.2 cm.\n"
    )
    assert ("clinical_history", "CLINICAL HISTORY") in _kinds(text)
    assert [k for k, _ in _kinds(text)][-1] == kind
    if kind == "diagnosis":
        assert "diagnosis" in _decides("lung", text, "adenocarcinoma")


@pytest.mark.parametrize(
    ("text", "kind", "header"),
    [
        # a page export joins the diagnosis header to the last cassette line
        ("C20: representative sections of the left vas DIAGNOSIS:\n"
         "C. PROSTATE, RADICAL PROSTATECTOMY:\nPROSTATE ADENOCARCINOMA, GLEASON 3+4=7.\n",
         "diagnosis", "DIAGNOSIS"),
        ("Margins free of tumor (FS). FINAL DIAGNOSIS:\nAdenocarcinoma of prostate.\n",
         "diagnosis", "FINAL DIAGNOSIS"),
        ("Tumor cells lie in a vessel at the vascular margin. ADDENDUM:\n"
         "Lymph node 7 (0/1) is negative.\n", "addendum", "ADDENDUM"),
    ],
)  # fmt: skip
def test_header_ending_the_line_before(text: str, kind: str, header: str) -> None:
    sections = find_sections(text)
    hit = [s for s in sections if s.header == header]
    assert hit and hit[0].kind == kind
    # the section starts at the header itself, not at the start of its line
    assert text[hit[0].start :].startswith(header)


def test_trailing_header_decides_the_diagnosis() -> None:
    text = (
        "GROSS DESCRIPTION:\nC. PROSTATE: received fresh, 38 grams.\n"
        "C21: representative sections of the left vas DIAGNOSIS:\n"
        "C. PROSTATE, RADICAL PROSTATECTOMY:\n- ADENOCARCINOMA, ACINAR TYPE.\n"
    )
    assert "diagnosis" in _decides("prostate", text, "adenocarcinoma")


@pytest.mark.parametrize(
    "text",
    [
        # an ordinary word two letters from "impression" is not a damaged header
        "HER2 IHC\nEXPRESSION: strong complete membranous staining\n",
        # nor, in Title Case, a word two letters from a nine-letter header
        "Prognosis\nguarded, per Dr V. Ostrander\n",
        # a word starting with a digit is a code, not a damaged header
        "CASSETTE 4D-4E: tumor with closest margin\n",
        # Title Case "Key: value" lines are not read fuzzily inline
        "Impresion: adenocarcinoma is favoured\n",
        # a list of sites ending with a key is not a header joined to its line
        "E. RIGHT LUNG, SPECIMEN:\nwedge\n",
        # a checklist key is never a trailing header
        "Margins were reviewed on all levels PROCEDURE:\nlobectomy\n",
    ],
)
def test_not_damaged_headers(text: str) -> None:
    assert _kinds(text) == []


def test_damaged_key_inside_a_checklist_stays_in_it() -> None:
    # "ANCILLARY STUDIES" is a header elsewhere; inside a checklist a damaged
    # copy of it, written "Key:", is one more key and the checklist goes on.
    text = (
        "SYNOPTIC REPORT\nTumor site: Sigmoid colon\nHistologic type: Mucinous adenocarcinoma\n"
        "ANCILLARY . TUDIES:(Continued)PAGE 2\nHistologic grade: Low-grade\n"
        "Margins: uninvolved by invasive carcinoma\n"
    )
    assert [k for k, _ in _kinds(text)] == ["synoptic"]
    assert "synoptic" in _decides("colorectal", text, "adenocarcinoma")


@pytest.mark.parametrize(
    ("line", "kind", "header"),
    [
        ("MICROSCOPIC/ COMMENT", "microscopic", "MICROSCOPIC"),
        ("MICROSCOPIC / COMMENT:", "microscopic", "MICROSCOPIC"),
        # the second half lost to OCR: the first half still names the section
        ("MICROSCOPIC/ COXWW", "microscopic", "MICROSCOPIC"),
        ("Gross/Microscopic description:", "gross", "Gross"),
        ("Clinical History /Operative Dx:", "clinical_history", "Clinical History"),
    ],
)
def test_compound_header_line(line: str, kind: str, header: str) -> None:
    text = f"GROSS DESCRIPTION\nReceived fresh, labelled NL-26-4410.\n{line}\nB. Sections show tumour.\n"
    assert _kinds(text)[-1] == (kind, header)


@pytest.mark.parametrize(
    "line",
    [
        # prose and lower-case lines with a slash are no headers
        "Carcinoma/ benign tissue",
        "diagnosis/comment",
        "MICROSCOPIC/ COMMENT follows in the addendum of 12 June",
    ],
)
def test_not_compound_headers(line: str) -> None:
    text = f"GROSS DESCRIPTION\nReceived fresh.\n{line}\nB. Sections show tumour.\n"
    assert _kinds(text) == [("gross", "GROSS DESCRIPTION")]


def test_microscopic_under_a_damaged_compound_header_supports_the_label() -> None:
    text = (
        "FINAL DIAGNOSIS\nA. CERVIX, BIOPSY:\nINVASIVS BQIIANOCB CELL CARCIN011\n"
        "GROSS DESCRIPTION\nA. Received in formalin, labelled cervix.\n"
        "MICROSCOPIC/ COXWW\n"
        "A. Sections show a 4.2 cm invasive squamous cell carcinoma with high grade features.\n"
    )
    assert "microscopic" in _decides("cervix", text, "squamous_cell_carcinoma")
