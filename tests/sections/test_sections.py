"""Sectioner: header styles, synoptic blocks, offsets into the original text.

All report fragments are invented (Harbor Valley Pathology is a fictional
laboratory); the header styles are those laboratories commonly use (practice).
"""

from __future__ import annotations

import itertools

import pytest

from pathsieve.records import SECTION_KINDS, Section
from pathsieve.sections import find_sections

HV = "HARBOR VALLEY PATHOLOGY\nAccession: HV-24-08812\n\n"


def assert_partition(text: str, sections: list[Section]) -> None:
    """Sections are sorted, contiguous, cover the text and name real headers."""
    assert sections, "a non-empty text has at least one section"
    assert sections[0].start == 0
    assert sections[-1].end == len(text)
    for a, b in itertools.pairwise(sections):
        assert a.end == b.start
    for s in sections:
        assert s.kind in SECTION_KINDS
        assert s.start < s.end
        assert s.start <= s.body_start <= s.end
        if s.header:
            assert s.header in text[s.start : s.body_start], s
        else:
            assert s.body_start == s.start


def shape(text: str, sections: list[Section]) -> list[tuple[str, str, str]]:
    """(kind, header, first 12 characters of the body) per section."""
    return [(s.kind, s.header, text[s.body_start : s.body_start + 12]) for s in sections]


# (id, text, expected [(kind, header, body head)])
CASES = [
    (
        "all-caps-lines",
        HV + "CLINICAL HISTORY\nScreening colonoscopy.\n\nGROSS DESCRIPTION\n"
        "Received in formalin is a 0.6 cm polyp.\n\nMICROSCOPIC DESCRIPTION\n"
        "Sections show adenomatous epithelium.\n\nFINAL DIAGNOSIS\nTubular adenoma.\n\n"
        "COMMENT\nNo high-grade dysplasia.\n",
        [
            ("other", "", "HARBOR VALLE"),
            ("clinical_history", "CLINICAL HISTORY", "Screening co"),
            ("gross", "GROSS DESCRIPTION", "Received in "),
            ("microscopic", "MICROSCOPIC DESCRIPTION", "Sections sho"),
            ("diagnosis", "FINAL DIAGNOSIS", "Tubular aden"),
            ("comment", "COMMENT", "No high-grad"),
        ],
    ),
    (
        "title-case-colon",
        "Clinical History:\nRectal bleeding.\nGross Description:\nTwo tan fragments.\n"
        "Diagnosis:\nHyperplastic polyp.\n",
        [
            ("clinical_history", "Clinical History", "Rectal bleed"),
            ("gross", "Gross Description", "Two tan frag"),
            ("diagnosis", "Diagnosis", "Hyperplastic"),
        ],
    ),
    (
        "numbered-arabic",
        "1. Clinical history\nElevated PSA.\n2. Gross\nSix cores.\n3. Diagnosis\n"
        "Adenocarcinoma, Gleason score 3+4=7.\n",
        [
            ("clinical_history", "Clinical history", "Elevated PSA"),
            ("gross", "Gross", "Six cores.\n3"),
            ("diagnosis", "Diagnosis", "Adenocarcino"),
        ],
    ),
    (
        "numbered-roman",
        "I. CLINICAL DATA\nCervical lesion.\nII. GROSS\nOne fragment.\nIII. MICROSCOPIC\n"
        "Dysplastic squamous epithelium.\nIV. DIAGNOSIS\nHSIL (CIN 2).\n",
        [
            ("clinical_history", "CLINICAL DATA", "Cervical les"),
            ("gross", "GROSS", "One fragment"),
            ("microscopic", "MICROSCOPIC", "Dysplastic s"),
            ("diagnosis", "DIAGNOSIS", "HSIL (CIN 2)"),
        ],
    ),
    (
        "inline-headers",
        "Clinical History: colon polyp\nDIAGNOSIS: Tubular adenoma.\nComment: Fragmented.\n",
        [
            ("clinical_history", "Clinical History", "colon polyp\n"),
            ("diagnosis", "DIAGNOSIS", "Tubular aden"),
            ("comment", "Comment", "Fragmented.\n"),
        ],
    ),
    (
        "inline-no-space-after-colon",
        "FINAL DIAGNOSIS:Tubular adenoma, no high-grade dysplasia.\n",
        [("diagnosis", "FINAL DIAGNOSIS", "Tubular aden")],
    ),
    (
        "ocr-run-on-no-colon",
        "GROSS DESCRIPTION\nOne polyp.\nDIAGNOSISTubular adenoma.\n",
        [
            ("gross", "GROSS DESCRIPTION", "One polyp.\nD"),
            ("diagnosis", "DIAGNOSIS", "Tubular aden"),
        ],
    ),
    (
        "decorated",
        "*** FINAL DIAGNOSIS ***\nSessile serrated lesion.\n--- Gross ---\n"
        "One 0.8 cm polyp.\n=== COMMENT ===\nSee note.\n## Microscopic\nSerrated crypts.\n",
        [
            ("diagnosis", "FINAL DIAGNOSIS", "Sessile serr"),
            ("gross", "Gross", "One 0.8 cm p"),
            ("comment", "COMMENT", "See note.\n##"),
            ("microscopic", "Microscopic", "Serrated cry"),
        ],
    ),
    (
        "ocr-extra-spaces-and-period",
        "FINAL   DIAGNOSIS\nTubular adenoma.\nClinical  History :\nPolyp.\nGross description.\n"
        "One fragment.\n",
        [
            ("diagnosis", "FINAL   DIAGNOSIS", "Tubular aden"),
            ("clinical_history", "Clinical  History", "Polyp.\nGross"),
            ("gross", "Gross description", "One fragment"),
        ],
    ),
    (
        "ocr-missing-colon-title-case",
        "Final Diagnosis\nBenign prostatic tissue.\nMicroscopic Description\nNo carcinoma.\n",
        [
            ("diagnosis", "Final Diagnosis", "Benign prost"),
            ("microscopic", "Microscopic Description", "No carcinoma"),
        ],
    ),
    (
        "ocr-misspelt-long-headers",
        "GROSS DESCRIPTON\nThree cores.\nMicroscopic Descripfion:\nBenign glands.\n"
        "FINAL DIAGNOSlS\nBenign prostatic tissue.\n",
        [
            ("gross", "GROSS DESCRIPTON", "Three cores."),
            ("microscopic", "Microscopic Descripfion", "Benign gland"),
            ("diagnosis", "FINAL DIAGNOSlS", "Benign prost"),
        ],
    ),
    (
        "british-spellings",
        "Clinical details:\nChange in bowel habit.\nMacroscopic description:\n"
        "Polyp 7 mm.\nHistology:\nLow-grade dysplasia.\nConclusion:\nTubular adenoma.\n",
        [
            ("clinical_history", "Clinical details", "Change in bo"),
            ("gross", "Macroscopic description", "Polyp 7 mm.\n"),
            ("microscopic", "Histology", "Low-grade dy"),
            ("diagnosis", "Conclusion", "Tubular aden"),
        ],
    ),
    (
        "abbreviations-with-colon",
        "Clin Hx: screening\nMicro: adenomatous crypts\nDx: tubular adenoma\n",
        [
            ("clinical_history", "Clin Hx", "screening\nMi"),
            ("microscopic", "Micro", "adenomatous "),
            ("diagnosis", "Dx", "tubular aden"),
        ],
    ),
    (
        "short-abbreviation-without-colon-is-prose",
        "DIAGNOSIS:\nTubular adenoma.\nHx\nnoted above.\n",
        [("diagnosis", "DIAGNOSIS", "Tubular aden")],
    ),
    (
        "synoptic-under-header",
        "DIAGNOSIS:\nAdenocarcinoma of sigmoid colon.\nSYNOPTIC REPORT\n"
        "Procedure: Sigmoidectomy\nHistologic type: Adenocarcinoma\nHistologic grade: G2\n"
        "Tumor size: 4.1 cm\nMargins: Negative\nLymphovascular invasion: Not identified\n"
        "Primary tumor (pT): pT3\n",
        [
            ("diagnosis", "DIAGNOSIS", "Adenocarcino"),
            ("synoptic", "SYNOPTIC REPORT", "Procedure: S"),
        ],
    ),
    (
        "synoptic-cancer-summary-keeps-comment-key",
        "FINAL DIAGNOSIS\nInvasive carcinoma.\nCANCER SUMMARY\nSpecimen: Breast, left\n"
        "Histologic type: Invasive ductal carcinoma\nComment: Grade by Nottingham.\n"
        "Tumor size: 2.2 cm\n",
        [
            ("diagnosis", "FINAL DIAGNOSIS", "Invasive car"),
            ("synoptic", "CANCER SUMMARY", "Specimen: Br"),
        ],
    ),
    (
        "synoptic-tumor-summary-inline",
        "Tumor summary: see below\nHistologic grade: 2\nMargins: free\n",
        [("synoptic", "Tumor summary", "see below\nHi")],
    ),
    (
        "synoptic-bare-run-splits-diagnosis",
        "DIAGNOSIS:\nColon, right, hemicolectomy:\nAdenocarcinoma.\n"
        "Histologic type: Adenocarcinoma\nHistologic grade: Moderately differentiated\n"
        "Tumor size: 5.0 cm\nMargins: Uninvolved\nTwelve lymph nodes, negative.\n",
        [
            ("diagnosis", "DIAGNOSIS", "Colon, right"),
            ("synoptic", "", "Histologic t"),
            ("diagnosis", "", "Twelve lymph"),
        ],
    ),
    (
        "synoptic-two-keys-is-not-a-block",
        "DIAGNOSIS:\nAdenocarcinoma.\nHistologic grade: G2\nMargins: Negative\n",
        [("diagnosis", "DIAGNOSIS", "Adenocarcino")],
    ),
    (
        "synoptic-numbered-items",
        "DIAGNOSIS:\nLung, left upper lobe, lobectomy:\nSquamous cell carcinoma.\n"
        "1. Histologic type: Squamous cell carcinoma\n2. Tumor size: 2.4 cm\n"
        "3. Visceral pleural invasion: Absent\n4. Bronchial margin: Free\n",
        [
            ("diagnosis", "DIAGNOSIS", "Lung, left u"),
            ("synoptic", "", "1. Histologi"),
        ],
    ),
    (
        "synoptic-run-with-unknown-keys-and-wrapped-value",
        "DIAGNOSIS:\nAdenocarcinoma.\nHistologic type: Adenocarcinoma\nTumor deposits "
        "count: 0\nHistologic grade: low grade\n  (well to moderately differentiated)\n"
        "Tumor site: Cecum\n  see part A\nCOMMENT:\nMMR pending.\n",
        [
            ("diagnosis", "DIAGNOSIS", "Adenocarcino"),
            ("synoptic", "", "Histologic t"),
            ("comment", "COMMENT", "MMR pending."),
        ],
    ),
    (
        "procedure-is-header-outside-synoptic",
        "Procedure: Colonoscopy with polypectomy\nDIAGNOSIS:\nHyperplastic polyp.\n",
        [
            ("other", "Procedure", "Colonoscopy "),
            ("diagnosis", "DIAGNOSIS", "Hyperplastic"),
        ],
    ),
    (
        "procedure-is-key-inside-bare-run",
        "DIAGNOSIS:\nAdenocarcinoma.\nProcedure: Low anterior resection\nTumor site: Rectum\n"
        "Histologic type: Adenocarcinoma\n",
        [
            ("diagnosis", "DIAGNOSIS", "Adenocarcino"),
            ("synoptic", "", "Procedure: L"),
        ],
    ),
    (
        "no-headers-bare-diagnosis",
        "Colon, sigmoid, biopsy: Tubular adenoma.\nNo high-grade dysplasia.\n",
        [("diagnosis", "", "Colon, sigmo")],
    ),
    (
        "no-headers-with-synoptic-run",
        "Prostate, radical prostatectomy: adenocarcinoma.\nGleason score: 3+4=7\n"
        "Grade group: 2\nExtraprostatic extension: Absent\nSee addendum for IHC.\n",
        [
            ("diagnosis", "", "Prostate, ra"),
            ("synoptic", "", "Gleason scor"),
            ("diagnosis", "", "See addendum"),
        ],
    ),
    (
        "addendum-family",
        "FINAL DIAGNOSIS:\nAdenocarcinoma.\nADDENDUM\nMMR intact.\nAmended Diagnosis:\n"
        "Adenocarcinoma, mucinous.\nREVISED DIAGNOSIS\nSee above.\nAddendum Diagnosis: HGD.\n"
        "SUPPLEMENTAL REPORT\nHER2 3+.\nADDENDUM 2:\nKRAS mutated.\nAddendum #3\nNone.\n",
        [
            ("diagnosis", "FINAL DIAGNOSIS", "Adenocarcino"),
            ("addendum", "ADDENDUM", "MMR intact.\n"),
            ("addendum", "Amended Diagnosis", "Adenocarcino"),
            ("addendum", "REVISED DIAGNOSIS", "See above.\nA"),
            ("addendum", "Addendum Diagnosis", "HGD.\nSUPPLEM"),
            ("addendum", "SUPPLEMENTAL REPORT", "HER2 3+.\nADD"),
            ("addendum", "ADDENDUM", "KRAS mutated"),
            ("addendum", "Addendum", "None.\n"),
        ],
    ),
    (
        "frozen-section-is-preliminary-comment",
        "FROZEN SECTION DIAGNOSIS:\nCarcinoma, defer grade.\nIntraoperative consultation: "
        "margin free\nFINAL DIAGNOSIS:\nAdenocarcinoma.\n",
        [
            ("comment", "FROZEN SECTION DIAGNOSIS", "Carcinoma, d"),
            ("comment", "Intraoperative consultation", "margin free\n"),
            ("diagnosis", "FINAL DIAGNOSIS", "Adenocarcino"),
        ],
    ),
    (
        "specimens-submitted-and-preop-diagnosis",
        "SPECIMEN(S) SUBMITTED:\nA. Colon polyp\nB. Rectal polyp\nPre-operative diagnosis: "
        "polyps\nPostoperative Diagnosis: same\nDIAGNOSIS:\nSee parts.\n",
        [
            ("other", "SPECIMEN(S) SUBMITTED", "A. Colon pol"),
            ("clinical_history", "Pre-operative diagnosis", "polyps\nPosto"),
            ("clinical_history", "Postoperative Diagnosis", "same\nDIAGNOS"),
            ("diagnosis", "DIAGNOSIS", "See parts.\n"),
        ],
    ),
    (
        "crlf-line-endings",
        "CLINICAL HISTORY:\r\nPolyp.\r\nFINAL DIAGNOSIS\r\nTubular adenoma.\r\n",
        [
            ("clinical_history", "CLINICAL HISTORY", "Polyp.\r\nFINA"),
            ("diagnosis", "FINAL DIAGNOSIS", "Tubular aden"),
        ],
    ),
    (
        "crlf-inline",
        "DIAGNOSIS: Hyperplastic polyp.\r\nNOTE: Clinically correlate.\r\n",
        [
            ("diagnosis", "DIAGNOSIS", "Hyperplastic"),
            ("comment", "NOTE", "Clinically c"),
        ],
    ),
    (
        "sentences-with-colons-are-not-headers",
        "DIAGNOSIS:\nThe differential diagnosis: serrated lesion vs hyperplastic polyp.\n"
        "History of polyps noted.\nDiagnosis of exclusion was considered.\n"
        "Sections show: crypts with serration.\n",
        [("diagnosis", "DIAGNOSIS", "The differen")],
    ),
    (
        "part-lines-are-not-headers",
        "DIAGNOSIS:\nA. RECTUM, POLYPECTOMY:\n- Hyperplastic polyp.\nB. DIAGNOSIS PENDING:\n",
        [("diagnosis", "DIAGNOSIS", "A. RECTUM, P")],
    ),
    (
        "header-words-inside-prose",
        "GROSS DESCRIPTION\nGROSSLY unremarkable mucosa.\nComments to follow.\n"
        "Microscopic examination was limited.\n",
        [("gross", "GROSS DESCRIPTION", "GROSSLY unre")],
    ),
    (
        "lowercase-alone-is-prose-lowercase-colon-is-header",
        "DIAGNOSIS:\nsee the\ngross description\nbelow.\ndiagnosis:\nbenign.\n",
        [
            ("diagnosis", "DIAGNOSIS", "see the\ngros"),
            ("diagnosis", "diagnosis", "benign.\n"),
        ],
    ),
    (
        "header-with-continued",
        "FINAL DIAGNOSIS\nA. Tubular adenoma.\nFINAL DIAGNOSIS (continued):\nB. Normal.\n",
        [
            ("diagnosis", "FINAL DIAGNOSIS", "A. Tubular a"),
            ("diagnosis", "FINAL DIAGNOSIS", "B. Normal.\n"),
        ],
    ),
    (
        "column-layout-caps",
        "GROSS      Received in formalin, two cores.\nDIAGNOSIS\tBenign prostatic tissue.\n",
        [
            ("gross", "GROSS", "Received in "),
            ("diagnosis", "DIAGNOSIS", "Benign prost"),
        ],
    ),
    (
        "dash-inline",
        "Gross - Received fresh, one ovoid nodule.\nDiagnosis - Fibroadenoma.\n",
        [
            ("gross", "Gross", "Received fre"),
            ("diagnosis", "Diagnosis", "Fibroadenoma"),
        ],
    ),
    (
        "indented-headers-and-last-line-without-newline",
        "   Clinical History:\n   Dyspepsia.\n   Final Diagnosis:\n   Duodenal mucosa, "
        "no abnormality.\n   COMMENT: Marsh 0",
        [
            ("clinical_history", "Clinical History", "   Dyspepsia"),
            ("diagnosis", "Final Diagnosis", "   Duodenal "),
            ("comment", "COMMENT", "Marsh 0"),
        ],
    ),
    (
        "consecutive-headers-empty-body",
        "MICROSCOPIC DESCRIPTION\nDIAGNOSIS\nBenign.\n",
        [
            ("microscopic", "MICROSCOPIC DESCRIPTION", "DIAGNOSIS\nBe"),
            ("diagnosis", "DIAGNOSIS", "Benign.\n"),
        ],
    ),
    (
        "ancillary-and-cassette-summary",
        "GROSS DESCRIPTION:\nOne polyp.\nSUMMARY OF SECTIONS:\nA1-A2: polyp\n"
        "IMMUNOHISTOCHEMISTRY:\nMLH1 retained.\n",
        [
            ("gross", "GROSS DESCRIPTION", "One polyp.\nS"),
            ("gross", "SUMMARY OF SECTIONS", "A1-A2: polyp"),
            ("microscopic", "IMMUNOHISTOCHEMISTRY", "MLH1 retaine"),
        ],
    ),
    (
        "header-at-offset-zero-without-preamble",
        "DIAGNOSIS\nNegative for intraepithelial lesion or malignancy.\n",
        [("diagnosis", "DIAGNOSIS", "Negative for")],
    ),
    (
        "whitespace-only-text",
        "   \n\n",
        [("diagnosis", "", "   \n\n")],
    ),
    (
        "unicode-spaces-and-lone-cr",
        "CLINICAL\u00a0HISTORY:\u00a0Polyp.\rFINAL DIAGNOSIS\rTubular\u00a0adenoma.\r",
        [
            ("clinical_history", "CLINICAL\u00a0HISTORY", "Polyp.\rFINAL"),
            ("diagnosis", "FINAL DIAGNOSIS", "Tubular\u00a0aden"),
        ],
    ),
    (
        "ocr-semicolon-and-combined-header",
        "PATHOLOGIC DIAGNOSIS;\nAdenocarcinoma.\nINTERPRETATION AND DIAGNOSIS:\nSee above.\n",
        [
            ("diagnosis", "PATHOLOGIC DIAGNOSIS", "Adenocarcino"),
            ("diagnosis", "INTERPRETATION AND DIAGNOSIS", "See above.\n"),
        ],
    ),
    (
        "specimen-part-lines-are-not-headers",
        "FINAL DIAGNOSIS:\nSPECIMEN A - RIGHT COLON, RESECTION:\nAdenocarcinoma.\n"
        "Specimen #2: Donut, anastomotic: benign.\nPart 3: Appendix: normal.\n",
        [("diagnosis", "FINAL DIAGNOSIS", "SPECIMEN A -")],
    ),
    (
        "fuzzy-leaves-prose-and-near-misses-alone",
        "DIAGNOSIS:\nTubular adenomas\nGross examinations were limited\nClinical histology\n"
        "Diagnosis Discrepancy\n",
        [("diagnosis", "DIAGNOSIS", "Tubular aden")],
    ),
    (
        "specimen-header-on-its-own-line",
        "SPECIMEN\nTerminal ileum and right colon\nGROSS DESCRIPTION\nReceived fresh.\n",
        [
            ("other", "SPECIMEN", "Terminal ile"),
            ("gross", "GROSS DESCRIPTION", "Received fre"),
        ],
    ),
    (
        "inline-comment-inside-diagnosis-then-diagnosis-resumes",
        "DIAGNOSIS:\nA. Colon, biopsy: adenoma.\nComment: fragmented,\nmargins not assessable.\n"
        "B. Rectum, biopsy: hyperplastic polyp.\n\nCOMMENT:\nCorrelate.\n",
        [
            ("diagnosis", "DIAGNOSIS", "A. Colon, bi"),
            ("comment", "Comment", "fragmented,\n"),
            ("diagnosis", "", "B. Rectum, b"),
            ("comment", "COMMENT", "Correlate.\n"),
        ],
    ),
    (
        "inline-field-inside-diagnosis-takes-one-line",
        "FINAL DIAGNOSIS:\nSpecimen: Sigmoid colon, biopsy\nTubular adenoma.\nNote: small.\n\n"
        "Dr. R. Quill (fictional), Harbor Valley Pathology\n",
        [
            ("diagnosis", "FINAL DIAGNOSIS", "Specimen: Si"),
            ("other", "Specimen", "Sigmoid colo"),
            ("diagnosis", "", "Tubular aden"),
            ("comment", "Note", "small.\n\nDr. "),
            ("diagnosis", "", "\nDr. R. Quil"),
        ],
    ),
    (
        "inline-notes-after-inline-diagnosis",
        "DIAGNOSIS: Tubular adenoma.\nCOMMENT: Fragmented.\nCLINICAL HISTORY: Screening.\n",
        [
            ("diagnosis", "DIAGNOSIS", "Tubular aden"),
            ("comment", "COMMENT", "Fragmented.\n"),
            ("clinical_history", "CLINICAL HISTORY", "Screening.\n"),
        ],
    ),
    (
        "colon-rich-prose-is-not-synoptic",
        "DIAGNOSIS:\nSee: note.\nRatio: 2:1\nTime fixed: 8 h\nBenign.\n",
        [("diagnosis", "DIAGNOSIS", "See: note.\nR")],
    ),
]


@pytest.mark.parametrize(("text", "expected"), [c[1:] for c in CASES], ids=[c[0] for c in CASES])
def test_sections_table(text: str, expected: list[tuple[str, str, str]]) -> None:
    sections = find_sections(text)
    assert_partition(text, sections)
    assert shape(text, sections) == expected


@pytest.mark.parametrize(("text", "expected"), [c[1:] for c in CASES], ids=[c[0] for c in CASES])
def test_sections_same_with_crlf(text: str, expected: list[tuple[str, str, str]]) -> None:
    """Each case read with CRLF endings gives the same kinds and headers."""
    crlf = text.replace("\r\n", "\n").replace("\n", "\r\n")
    sections = find_sections(crlf)
    assert_partition(crlf, sections)
    assert [(s.kind, s.header) for s in sections] == [(k, h) for k, h, _ in expected]


def test_empty_text_has_no_sections() -> None:
    assert find_sections("") == []


def test_inline_body_starts_on_the_header_line() -> None:
    text = "DIAGNOSIS:   Tubular adenoma.\n"
    (s,) = find_sections(text)
    assert text[s.start : s.body_start] == "DIAGNOSIS:   "
    assert text[s.body_start : s.end] == "Tubular adenoma.\n"


def test_trailing_blank_lines_after_a_run_join_the_run() -> None:
    text = "DIAGNOSIS:\nCarcinoma.\nHistologic type: NST\nHistologic grade: 2\nMargins: free\n\n"
    sections = find_sections(text)
    assert_partition(text, sections)
    assert [s.kind for s in sections] == ["diagnosis", "synoptic"]
    assert text[sections[1].start : sections[1].end].endswith("Margins: free\n\n")


def test_headers_keep_original_offsets_with_unicode_decoration() -> None:
    text = "Intro — é\n• FINAL DIAGNOSIS •\nBenign.\n"
    sections = find_sections(text)
    assert_partition(text, sections)
    assert [(s.kind, s.header) for s in sections] == [
        ("other", ""),
        ("diagnosis", "FINAL DIAGNOSIS"),
    ]
    assert text[sections[1].start :].startswith("• FINAL DIAGNOSIS •\n")
