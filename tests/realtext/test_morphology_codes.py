"""ICD-O-3 morphology codes in a report read as the concepts they code.

External source: the ICD-O-3 morphology codes (WHO, International
Classification of Diseases for Oncology, 3rd ed.; from memory) -- 8140/3
adenocarcinoma NOS, 8070/3 squamous cell carcinoma NOS, 8480/3 mucinous
adenocarcinoma, 8010/3 carcinoma NOS -- held against the ontology's xrefs.
Scanned reports carry a registrar's coded diagnosis ("Carcinoma, squamous cell,
NOS 8070/3") where OCR may have wrecked the words.  Every fragment is invented
(fictional Northgate Lane laboratory).
"""

from __future__ import annotations

from functools import cache

import pytest

from pathsieve import Labeler
from pathsieve.morphology_codes import MorphologyCodes
from pathsieve.ontology import load_ontology

# code -> concept name (ICD-O-3, from memory)
ICDO3 = {
    "8140/3": "adenocarcinoma",
    "8070/3": "squamous cell carcinoma",
    "8480/3": "mucinous adenocarcinoma",
    "8010/3": "carcinoma, not otherwise specified",
}


@cache
def _codes() -> MorphologyCodes:
    return MorphologyCodes.from_ontology(load_ontology())


@cache
def _labeler(scheme: str) -> Labeler:
    return Labeler(scheme)


@pytest.mark.parametrize(("code", "name"), sorted(ICDO3.items()))
def test_code_reads_as_its_concept(code: str, name: str) -> None:
    text = f"Coded diagnosis: {code}\n"
    (m,) = _codes().mentions(text, [])
    assert (m.text, m.label, m.match) == (code, name, "code")
    assert text[m.start : m.end] == code
    assert f"'{code}'" in m.note


@pytest.mark.parametrize(
    "text",
    [
        "Received 2011/3 at Northgate Lane.",  # no morphology code starts with 2
        "Accession 18140/32",  # run into other digits
        "Ref 8140/3/1",  # run into another slash
        "Code 8999/3",  # a code the ontology does not list
        "Ratio 8140 / 35",
    ],
)
def test_no_code_where_none_is_written(text: str) -> None:
    assert _codes().mentions(text, []) == []


def test_ocr_space_around_the_slash() -> None:
    (m,) = _codes().mentions("Carcinoma, squamous cell, NOS 8070 / 3", [])
    assert m.label == "squamous cell carcinoma"


def test_a_code_is_all_that_is_left_of_the_type() -> None:
    text = (
        "scc NOS 8070/3\n"
        "SURGICAL PATHOLOGY REPORT\nDIAGNOSIS:\nCERVIX, RADICAL HYSTERECTOMY\n"
        "- S'^ i CI CiNOMA, MODERATELY DIFFERENTIATED, 2.1 CM\n"
        "LYMPH NODES, PELVIC\n- NO CARCINOMA IDENTIFIED IN NINE LYMPH NODES (0/9)\n"
    )
    states = _labeler("cervix").label_report(text).case.states
    assert states["squamous_cell_carcinoma"].state == "present"
    assert "adenocarcinoma" not in states or states["adenocarcinoma"].state == "absent"
