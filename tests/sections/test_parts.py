"""Specimen-part splitter: label styles, sequences, false-part guards, offsets.

All report fragments are invented (Harbor Valley Pathology is a fictional
laboratory); label styles are those laboratories commonly use (practice).
"""

from __future__ import annotations

import itertools

import pytest

from pathsieve.parts import find_parts
from pathsieve.records import Part, Section
from pathsieve.sections import find_sections


def kind_at(sections: list[Section], pos: int) -> str:
    for s in sections:
        if s.start <= pos < s.end:
            return s.kind
    raise AssertionError(f"offset {pos} outside every section")


def assert_parts(text: str, sections: list[Section], parts: list[Part]) -> None:
    """Offsets are exact, parts are sorted and never overlap."""
    assert parts == sorted(parts, key=lambda p: (p.start, p.end))
    for a, b in itertools.pairwise(parts):
        assert a.end <= b.start, (a, b)
    for p in parts:
        assert 0 <= p.start < p.end <= len(text), p
        assert p.label == p.label.upper()
        assert p.site_ids == () and p.procedure_ids == ()
        if p.header:
            assert text[p.start : p.header_end] == p.header
            assert p.header == p.header.strip()
            assert "\n" not in p.header and "\r" not in p.header
        else:
            assert p.header_end == p.start


def shape(text: str, sections: list[Section], parts: list[Part]) -> list[tuple[str, str, str]]:
    """(label, header, kind of the section the part starts in) per part."""
    return [(p.label, p.header, kind_at(sections, p.start)) for p in parts]


# (id, text, expected [(label, header, section kind)])
CASES = [
    (
        "letters-dot",
        "FINAL DIAGNOSIS:\nA. COLON, ASCENDING, POLYPECTOMY:\n- Tubular adenoma.\n"
        "B. RECTUM, POLYPECTOMY:\n- Hyperplastic polyp.\nC. SIGMOID, BIOPSY:\n- Normal mucosa.\n",
        [
            ("A", "A. COLON, ASCENDING, POLYPECTOMY:", "diagnosis"),
            ("B", "B. RECTUM, POLYPECTOMY:", "diagnosis"),
            ("C", "C. SIGMOID, BIOPSY:", "diagnosis"),
        ],
    ),
    (
        "letters-paren",
        "DIAGNOSIS\nA) Prostate, right base, needle biopsy: Benign.\n"
        "B) Prostate, left base, needle biopsy: Adenocarcinoma, Gleason 3+3=6.\n",
        [
            ("A", "A) Prostate, right base, needle biopsy:", "diagnosis"),
            ("B", "B) Prostate, left base, needle biopsy:", "diagnosis"),
        ],
    ),
    (
        "letters-in-parentheses",
        "DIAGNOSIS:\n(A) Cervix, 12 o'clock, biopsy: LSIL (CIN 1).\n(B) Endocervical curettage: "
        "Negative.\n",
        [
            ("A", "(A) Cervix, 12 o'clock, biopsy:", "diagnosis"),
            ("B", "(B) Endocervical curettage:", "diagnosis"),
        ],
    ),
    (
        "letters-colon",
        "DIAGNOSIS:\nA: Duodenum, biopsy - Marsh 3a.\nB: Stomach, antrum, biopsy - Gastritis.\n",
        [
            ("A", "A: Duodenum, biopsy -", "diagnosis"),
            ("B", "B: Stomach, antrum, biopsy -", "diagnosis"),
        ],
    ),
    (
        "numbers-dot",
        "FINAL DIAGNOSIS\n1. Lung, right upper lobe, wedge: Adenocarcinoma.\n"
        "2. Lymph node, station 4R: Negative (0/1).\n3. Lymph node, station 7: Negative (0/2).\n",
        [
            ("1", "1. Lung, right upper lobe, wedge:", "diagnosis"),
            ("2", "2. Lymph node, station 4R:", "diagnosis"),
            ("3", "3. Lymph node, station 7:", "diagnosis"),
        ],
    ),
    (
        "numbers-paren",
        "DIAGNOSIS:\n1) Sigmoid polyp: tubular adenoma\n2) Descending polyp: hyperplastic polyp\n",
        [
            ("1", "1) Sigmoid polyp:", "diagnosis"),
            ("2", "2) Descending polyp:", "diagnosis"),
        ],
    ),
    (
        "part-keyword-numbers",
        "DIAGNOSIS:\nPart 1: Prostate, right apex, biopsy - Adenocarcinoma, Gleason 3+4=7.\n"
        "Part 2: Prostate, left apex, biopsy - Benign prostatic tissue.\n",
        [
            ("1", "Part 1: Prostate, right apex, biopsy -", "diagnosis"),
            ("2", "Part 2: Prostate, left apex, biopsy -", "diagnosis"),
        ],
    ),
    (
        "part-keyword-letters-dash",
        "FINAL DIAGNOSIS\nPART A - LEFT BREAST, CORE BIOPSY:\nInvasive ductal carcinoma.\n"
        "PART B - LEFT AXILLA, CORE BIOPSY:\nNo carcinoma.\n",
        [
            ("A", "PART A - LEFT BREAST, CORE BIOPSY:", "diagnosis"),
            ("B", "PART B - LEFT AXILLA, CORE BIOPSY:", "diagnosis"),
        ],
    ),
    (
        "specimen-keyword-dash",
        "DIAGNOSIS\nSPECIMEN A - RIGHT COLON, RESECTION:\nAdenocarcinoma.\n"
        "SPECIMEN B - DONUT, ANASTOMOTIC:\nBenign colonic tissue.\n",
        [
            ("A", "SPECIMEN A - RIGHT COLON, RESECTION:", "diagnosis"),
            ("B", "SPECIMEN B - DONUT, ANASTOMOTIC:", "diagnosis"),
        ],
    ),
    (
        "specimen-hash-number",
        "DIAGNOSIS:\nSpecimen #1: Duodenum, biopsy: increased intraepithelial lymphocytes.\n"
        "Specimen #2: Stomach, biopsy: chronic gastritis.\n",
        [
            ("1", "Specimen #1: Duodenum, biopsy:", "diagnosis"),
            ("2", "Specimen #2: Stomach, biopsy:", "diagnosis"),
        ],
    ),
    (
        "parts-in-gross-and-diagnosis",
        'GROSS DESCRIPTION:\nA. Received in formalin labeled "cecal polyp" is a 0.4 cm polyp.\n'
        'A1: entirely submitted.\nB. Received in formalin labeled "rectum" are two fragments.\n'
        "B1-B2: entirely submitted.\nFINAL DIAGNOSIS:\nA. CECUM, POLYPECTOMY:\n"
        "- Sessile serrated lesion.\nB. RECTUM, BIOPSY:\n- Hyperplastic polyp.\n",
        [
            (
                "A",
                'A. Received in formalin labeled "cecal polyp" is a 0.4 cm polyp.',
                "gross",
            ),
            ("B", 'B. Received in formalin labeled "rectum" are two fragments.', "gross"),
            ("A", "A. CECUM, POLYPECTOMY:", "diagnosis"),
            ("B", "B. RECTUM, BIOPSY:", "diagnosis"),
        ],
    ),
    (
        "cassette-keys-stay-in-part",
        'GROSS:\nA. Labeled "sigmoid": 3.0 cm segment.\nA1-A3: tumor.\nA4: margin.\n'
        'B. Labeled "lymph nodes": fat.\nB1-B4: nodes.\n',
        [
            ("A", 'A. Labeled "sigmoid":', "gross"),
            ("B", 'B. Labeled "lymph nodes":', "gross"),
        ],
    ),
    (
        "cassette-summary-section-has-no-parts",
        "GROSS DESCRIPTION:\nReceived in formalin, one polyp, 0.9 cm.\nCASSETTE SUMMARY:\n"
        "A: stalk\nB: head\nC: remainder\nDIAGNOSIS:\nTubulovillous adenoma.\n",
        [("", "", "diagnosis")],
    ),
    (
        "site-named-parts",
        "DIAGNOSIS:\nSigmoid colon, biopsy:\n- Tubular adenoma.\nRectum, polypectomy:\n"
        "- Hyperplastic polyp.\n",
        [
            ("SIGMOID COLON, BIOPSY", "Sigmoid colon, biopsy:", "diagnosis"),
            ("RECTUM, POLYPECTOMY", "Rectum, polypectomy:", "diagnosis"),
        ],
    ),
    (
        "one-site-line-is-one-specimen",
        "DIAGNOSIS:\nRIGHT COLON, RIGHT COLECTOMY:\n- Adenocarcinoma.\n- Margins negative.\n",
        [("", "", "diagnosis")],
    ),
    (
        "numbered-list-mid-line-is-not-parts",
        "DIAGNOSIS:\nColon, biopsy: 1. Tubular adenoma. 2. No high-grade dysplasia.\n",
        [("", "", "diagnosis")],
    ),
    (
        "letter-mid-sentence-is-not-a-part",
        "DIAGNOSIS:\nSmall bowel, biopsy: normal; patient on vitamin A.\nB. cells noted?\n",
        [("", "", "diagnosis")],
    ),
    (
        "lone-label-with-nothing-after",
        "DIAGNOSIS:\nA.\nTubular adenoma.\n",
        [("", "", "diagnosis")],
    ),
    (
        "labels-out-of-sequence",
        "DIAGNOSIS:\nB. Benign.\nD. Benign.\n",
        [("", "", "diagnosis")],
    ),
    (
        "letters-with-numbered-sub-items",
        "DIAGNOSIS:\nA. COLON, TRANSVERSE, POLYPECTOMY:\n1. Tubular adenoma.\n2. Margin clear.\n"
        "B. COLON, SIGMOID, POLYPECTOMY:\n1. Hyperplastic polyp.\n",
        [
            ("A", "A. COLON, TRANSVERSE, POLYPECTOMY:", "diagnosis"),
            ("B", "B. COLON, SIGMOID, POLYPECTOMY:", "diagnosis"),
        ],
    ),
    (
        "keyword-parts-with-lettered-findings",
        "FINAL DIAGNOSIS:\nPART 1: LYMPH NODES, RIGHT PELVIC, EXCISION -\nNo tumor (0/6).\n"
        "PART 2: PROSTATE, RADICAL PROSTATECTOMY -\nA. ADENOCARCINOMA, GLEASON 4+3=7.\n"
        "B. MARGINS FREE.\nC. NO EXTRAPROSTATIC EXTENSION.\n",
        [
            ("1", "PART 1: LYMPH NODES, RIGHT PELVIC, EXCISION -", "diagnosis"),
            ("2", "PART 2: PROSTATE, RADICAL PROSTATECTOMY -", "diagnosis"),
        ],
    ),
    (
        "single-keyword-part",
        "DIAGNOSIS:\nPart 1: Cervix, LEEP - HSIL (CIN 3), margins negative.\n",
        [("1", "Part 1: Cervix, LEEP -", "diagnosis")],
    ),
    (
        "single-letter-part-with-site-header",
        "DIAGNOSIS:\nA. Duodenum, biopsy: Normal duodenal mucosa.\n",
        [("A", "A. Duodenum, biopsy:", "diagnosis")],
    ),
    (
        "single-number-without-header-is-one-specimen",
        "DIAGNOSIS:\n1. Tubular adenoma.\n",
        [("", "", "diagnosis")],
    ),
    (
        "weak-gross-label-supported-by-diagnosis",
        "GROSS:\nA. Received in formalin, a 0.3 cm polyp.\nDIAGNOSIS:\n"
        "A. Colon, polypectomy: Tubular adenoma.\n",
        [
            ("A", "A. Received in formalin, a 0.3 cm polyp.", "gross"),
            ("A", "A. Colon, polypectomy:", "diagnosis"),
        ],
    ),
    (
        "sequence-continues-after-synoptic-run",
        "DIAGNOSIS:\nA. COLON, SIGMOID, RESECTION:\nAdenocarcinoma.\nHistologic type: Adenocarcinoma\n"
        "Histologic grade: G2\nMargins: Negative\nB. LYMPH NODES, MESENTERIC:\nNo tumor (0/15).\n",
        [
            ("A", "A. COLON, SIGMOID, RESECTION:", "diagnosis"),
            ("B", "B. LYMPH NODES, MESENTERIC:", "diagnosis"),
        ],
    ),
    (
        "sequence-continues-in-next-diagnosis-section",
        "FINAL DIAGNOSIS\nA. STOMACH, BIOPSY:\nGastritis.\nB. DUODENUM, BIOPSY:\nNormal.\n"
        "COMMENT:\nCorrelate.\nFINAL DIAGNOSIS (continued)\nC. ESOPHAGUS, BIOPSY:\nBarrett mucosa.\n",
        [
            ("A", "A. STOMACH, BIOPSY:", "diagnosis"),
            ("B", "B. DUODENUM, BIOPSY:", "diagnosis"),
            ("C", "C. ESOPHAGUS, BIOPSY:", "diagnosis"),
        ],
    ),
    (
        "headerless-report-with-parts",
        "A. Endometrium, biopsy: Proliferative endometrium.\n"
        "B. Endocervix, curettage: Benign endocervical tissue.\n",
        [
            ("A", "A. Endometrium, biopsy:", "diagnosis"),
            ("B", "B. Endocervix, curettage:", "diagnosis"),
        ],
    ),
    (
        "headerless-single-specimen",
        "Tubular adenoma, no high-grade dysplasia.\n",
        [("", "", "diagnosis")],
    ),
    (
        "numbered-checklist-is-not-parts",
        "DIAGNOSIS:\nLung, lobectomy: Squamous cell carcinoma.\nCHECKLIST\n"
        "1. Histologic type: Squamous cell carcinoma\n2. Tumor size: 3.1 cm\n"
        "3. Bronchial margin: Free\n4. Lymph nodes: 0/7\n",
        [("", "", "diagnosis")],
    ),
    (
        "addendum-parts",
        "FINAL DIAGNOSIS:\nA. Breast, left, core: Invasive carcinoma.\nADDENDUM:\n"
        "A. ER: Positive (95%).\nB. Axilla, core: Negative.\n",
        [
            ("A", "A. Breast, left, core:", "diagnosis"),
            ("A", "A. ER:", "addendum"),
            ("B", "B. Axilla, core:", "addendum"),
        ],
    ),
    (
        "decimal-at-line-start-is-not-a-part",
        "GROSS:\n1.5 cm polyp received.\n2.0 cm stalk.\nDIAGNOSIS:\nTubular adenoma.\n",
        [("", "", "diagnosis")],
    ),
    (
        "lowercase-letters-are-sub-items",
        "DIAGNOSIS:\na. Tubular adenoma.\nb. Negative for HGD.\n",
        [("", "", "diagnosis")],
    ),
    (
        "per-part-synoptic-under-header",
        "DIAGNOSIS:\nA. Colon: carcinoma.\nB. Liver: metastasis.\nSYNOPTIC REPORT\n"
        "A. Colon, sigmoid:\nHistologic type: Adenocarcinoma\nHistologic grade: G2\n"
        "B. Liver, segment 6:\nHistologic type: Metastatic adenocarcinoma\n",
        [
            ("A", "A. Colon:", "diagnosis"),
            ("B", "B. Liver:", "diagnosis"),
            ("A", "A. Colon, sigmoid:", "synoptic"),
            ("B", "B. Liver, segment 6:", "synoptic"),
        ],
    ),
    (
        "specimen-is-received-gross-style",
        'GROSS DESCRIPTION:\nSpecimen A is received in formalin labeled "right lobe".\n'
        'Specimen B is received in formalin labeled "left lobe".\nDIAGNOSIS:\n'
        "Nodular hyperplasia.\n",
        [
            ("A", 'Specimen A is received in formalin labeled "right lobe".', "gross"),
            ("B", 'Specimen B is received in formalin labeled "left lobe".', "gross"),
            ("", "", "diagnosis"),
        ],
    ),
    (
        "crlf-parts",
        "DIAGNOSIS:\r\nA. Colon, biopsy:\r\nAdenoma.\r\nB. Rectum, biopsy:\r\nNormal.\r\n",
        [
            ("A", "A. Colon, biopsy:", "diagnosis"),
            ("B", "B. Rectum, biopsy:", "diagnosis"),
        ],
    ),
    (
        "only-gross-and-microscopic",
        "GROSS DESCRIPTION\nOne core.\nMICROSCOPIC\nBenign glands.\n",
        [("", "", "gross")],
    ),
    (
        "label-on-its-own-line-in-sequence",
        "DIAGNOSIS:\nA.\nTubular adenoma.\nB.\nHyperplastic polyp.\n",
        [("A", "A.", "diagnosis"), ("B", "B.", "diagnosis")],
    ),
    (
        "ocr-numeric-label-glued-to-capitals",
        "DIAGNOSIS:\n1.LUNG, RIGHT LOWER LOBE, WEDGE: CARCINOMA.\n2.LYMPH NODE, LEVEL 7: NEGATIVE.\n",
        [
            ("1", "1.LUNG, RIGHT LOWER LOBE, WEDGE:", "diagnosis"),
            ("2", "2.LYMPH NODE, LEVEL 7:", "diagnosis"),
        ],
    ),
    (
        "ocr-letter-label-glued-to-word",
        "DIAGNOSIS:\nA.Right ovary, excision:\nSerous carcinoma.\nB.Uterus, hysterectomy:\n"
        "Leiomyoma.\nNote at 9 A.M. today.\n",
        [
            ("A", "A.Right ovary, excision:", "diagnosis"),
            ("B", "B.Uterus, hysterectomy:", "diagnosis"),
        ],
    ),
    (
        "ocr-keyword-semicolon-with-lettered-findings",
        "FINAL DIAGNOSIS:\nPART 1; RIGHT PELVIC LYMPH NODES, EXCISION-\nA. ONE OF FIVE NODES "
        "POSITIVE.\nB. FOCUS 0.15 CM.\nPART 2; PROSTATE, PROSTATECTOMY-\nA. ADENOCARCINOMA.\n",
        [
            ("1", "PART 1; RIGHT PELVIC LYMPH NODES, EXCISION-", "diagnosis"),
            ("2", "PART 2; PROSTATE, PROSTATECTOMY-", "diagnosis"),
        ],
    ),
    (
        "abbreviation-at-line-start-is-not-a-label",
        "DIAGNOSIS:\nA.M. specimen: benign.\nP.M. specimen: benign.\n",
        [("", "", "diagnosis")],
    ),
    (
        "lowercase-letters-with-site-headers-are-parts",
        "DIAGNOSIS:\na. Rectosigmoid colon, low anterior resection:\nAdenocarcinoma.\n"
        "b. Colon, distal margin, excision:\nNo tumor.\n",
        [
            ("A", "a. Rectosigmoid colon, low anterior resection:", "diagnosis"),
            ("B", "b. Colon, distal margin, excision:", "diagnosis"),
        ],
    ),
    (
        "comment-between-parts-keeps-the-sequence",
        "FINAL DIAGNOSIS:\nA. Colon, biopsy:\nTubular adenoma.\nComment: fragmented.\n"
        "B. Rectum, biopsy:\nHyperplastic polyp.\n",
        [
            ("A", "A. Colon, biopsy:", "diagnosis"),
            ("B", "B. Rectum, biopsy:", "diagnosis"),
        ],
    ),
    (
        "unicode-spaces-and-lone-cr",
        "DIAGNOSIS:\rA.\u00a0Colon,\u00a0biopsy:\u00a0\rAdenoma.\rB. Rectum, biopsy:\rNormal.\r",
        [
            ("A", "A.\u00a0Colon,\u00a0biopsy:", "diagnosis"),
            ("B", "B. Rectum, biopsy:", "diagnosis"),
        ],
    ),
    (
        "site-named-parts-with-unicode-space",
        "DIAGNOSIS:\nSigmoid\u00a0colon, biopsy:\nAdenoma.\nRectum, biopsy:\nNormal.\n",
        [
            ("SIGMOID COLON, BIOPSY", "Sigmoid\u00a0colon, biopsy:", "diagnosis"),
            ("RECTUM, BIOPSY", "Rectum, biopsy:", "diagnosis"),
        ],
    ),
    (
        "indented-labels",
        "DIAGNOSIS:\n   A. Skin, back, shave: Seborrheic keratosis.\n   B. Skin, arm, punch: "
        "Dermatitis.\n",
        [
            ("A", "A. Skin, back, shave:", "diagnosis"),
            ("B", "B. Skin, arm, punch:", "diagnosis"),
        ],
    ),
]


@pytest.mark.parametrize(("text", "expected"), [c[1:] for c in CASES], ids=[c[0] for c in CASES])
def test_parts_table(text: str, expected: list[tuple[str, str, str]]) -> None:
    sections = find_sections(text)
    parts = find_parts(text, sections)
    assert_parts(text, sections, parts)
    assert shape(text, sections, parts) == expected


def test_part_spans_run_to_the_next_label() -> None:
    text = "DIAGNOSIS:\nA. Colon, biopsy:\nAdenoma.\nB. Rectum, biopsy:\nNormal.\nCOMMENT:\nNone.\n"
    sections = find_sections(text)
    a, b = find_parts(text, sections)
    assert text[a.start : a.end] == "A. Colon, biopsy:\nAdenoma.\n"
    assert text[b.start : b.end] == "B. Rectum, biopsy:\nNormal.\n"


def test_single_specimen_part_covers_each_diagnostic_section() -> None:
    text = "DIAGNOSIS:\nTubular adenoma.\nCOMMENT:\nSmall.\nADDENDUM:\nMMR intact.\n"
    sections = find_sections(text)
    parts = find_parts(text, sections)
    assert [(p.label, text[p.start : p.end]) for p in parts] == [
        ("", "DIAGNOSIS:\nTubular adenoma.\n"),
        ("", "ADDENDUM:\nMMR intact.\n"),
    ]


def test_headerless_single_part_covers_whole_text() -> None:
    text = "Benign prostatic tissue."
    (part,) = find_parts(text, find_sections(text))
    assert (part.label, part.start, part.end, part.header_end) == ("", 0, len(text), 0)


def test_empty_text_has_no_parts() -> None:
    assert find_parts("", []) == []
