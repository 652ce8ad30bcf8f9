"""Printed checklists: keys in capitals alone on their lines, their values below.

Some laboratories print the CAP-style checklist without colons: "HISTOLOGIC
TYPE" on one line, "Adenocarcinoma" / "Endocervical type" on the next, and
group headings such as "MICROSCOPIC" between the keys.  Such a checklist is a
synoptic section (it decides), not a run of "other" and "microscopic"
sections.  Every fragment is invented (fictional Larkspur Valley laboratory).
"""

from __future__ import annotations

from functools import cache

from pathsieve import Labeler
from pathsieve.sections import find_sections

CHECKLIST = (
    "SPECIMEN\nCervix\nUterine corpus\n"
    "PROCEDURE\nRadical hysterectomy\n"
    "TUMOR SIZE\nGreatest dimension: 1.4 cm\n"
    "MICROSCOPIC\n"
    "HISTOLOGIC TYPE\nAdenocarcinoma\nEndocervical type\n"
    "HISTOLOGIC GRADE\nG1: Well differentiated\n"
    "MARGINS\nMargins uninvolved by invasive carcinoma\n"
)
REPORT = (
    "CLINICAL HISTORY:\nCervical mass. Colposcopy at Larkspur Valley Clinic.\n"
    "IMPRESSION:\n1) LYMPH NODES, LEFT PELVIC, EXCISION:\nFour benign lymph nodes (0/4).\n"
    "CERVICAL CARCINOMA CHECKLIST\n" + CHECKLIST + "\n"
    "GROSS DESCRIPTION:\nReceived fresh labeled with the name of Ms R. Quillfeather.\n"
)


@cache
def _labeler(scheme: str) -> Labeler:
    return Labeler(scheme)


def _kind_at(text: str, phrase: str) -> str:
    at = text.index(phrase)
    return next(s.kind for s in find_sections(text) if s.start <= at < s.end)


def test_printed_checklist_is_one_synoptic_section() -> None:
    for phrase in ("PROCEDURE", "MICROSCOPIC", "HISTOLOGIC TYPE", "Margins uninvolved"):
        assert _kind_at(REPORT, phrase) == "synoptic", phrase
    # the sections around it keep their kinds
    assert _kind_at(REPORT, "Four benign") == "diagnosis"
    assert _kind_at(REPORT, "Received fresh") == "gross"


def test_the_type_under_a_printed_key_decides() -> None:
    result = _labeler("cervix").label_report(REPORT)
    assert result.case.states["adenocarcinoma"].state == "present"
    rows = [
        r
        for r in result.evidence
        if r.mention is not None and r.decides and "adenocarcinoma" in r.labels
    ]
    assert rows and all(r.mention.section == "synoptic" for r in rows)


def test_three_bare_keys_are_no_checklist() -> None:
    # a short list of capitals is not enough: four keys make a printed checklist
    text = (
        "IMPRESSION:\nBenign cervical tissue.\n"
        "SPECIMEN\nCervix\nPROCEDURE\nLoop excision\nTUMOR SIZE\nNot applicable\n"
    )
    assert "synoptic" not in {s.kind for s in find_sections(text)}


def test_a_blank_line_ends_the_checklist() -> None:
    text = REPORT.replace("GROSS DESCRIPTION:\n", "Comment: slides reviewed with Dr P. Ancell.\n")
    assert _kind_at(text, "Margins uninvolved") == "synoptic"
    assert _kind_at(text, "slides reviewed") != "synoptic"
