"""Checklist type fields that leave out the head noun: "Histologic type: Squamous cell".

Real checklists often answer the histologic type key with the type's
adjective only ("SQUAMOUS CELL", "Acinar"), the head noun "carcinoma" being
implied by the key.  pathsieve reads such a value with the head nouns of the
header lexicon and keeps the evidence on the value's own characters.  A value
that names no type ("not applicable", a sentence), or that already names one
whole, is left as it is.  Every fragment is invented (fictional Northgate Lane
laboratory, people and accession numbers).
"""

from __future__ import annotations

from functools import cache

import pytest

from pathsieve import Labeler
from pathsieve.abbreviations import AbbreviationDictionary
from pathsieve.matcher import ConceptMatcher
from pathsieve.ontology import load_ontology
from pathsieve.sections import HeaderLexicon
from pathsieve.type_fields import TypeFields


@cache
def _labeler(scheme: str) -> Labeler:
    return Labeler(scheme)


def _field_mentions(scheme: str, text: str) -> list[tuple[str, str, str]]:
    report = _labeler(scheme).read(text)
    return [(m.text, m.label, m.note) for m in report.mentions if m.match == "field"]


@pytest.mark.parametrize(
    ("scheme", "text", "value", "label"),
    [
        (
            "lung",
            "HISTOLOGIC TYPE; SQUAMOUS.\nHISTOLOGIC GRADE; 2/3.",
            "SQUAMOUS",
            "squamous cell carcinoma",
        ),
        (
            "lung",
            'Histologic type: SQUAMOUS CELL "\nGrade: G2',
            "SQUAMOUS CELL",
            "squamous cell carcinoma",
        ),
        (
            "lung",
            "Histologic Type: Squamous cell\nTumor size: 3.1 cm",
            "Squamous cell",
            "squamous cell carcinoma",
        ),
        ("lung", "Histological type: small cell\n", "small cell", "small cell carcinoma"),
        (
            "prostate",
            "Histologic type: Acinar.\nGleason score: 3+4=7",
            "Acinar",
            "prostatic acinar adenocarcinoma",
        ),
    ],
)
def test_value_is_read_with_its_head_noun(scheme: str, text: str, value: str, label: str) -> None:
    found = _field_mentions(scheme, text)
    assert [(v, lab) for v, lab, _ in found] == [(value, label)]
    start = text.index(value)
    report = _labeler(scheme).read(text)
    m = next(m for m in report.mentions if m.match == "field")
    # evidence points at the value's exact characters in the original text
    assert (m.start, m.end) == (start, start + len(value))
    assert text[m.start : m.end] == value
    assert "read as" in m.note


@pytest.mark.parametrize(
    "text",
    [
        # already a whole name: the ordinary match stands
        "Histologic type: Squamous cell carcinoma, keratinizing",
        "Histologic type: Adenocarcinoma",
        # no type named
        "Histologic type: not applicable",
        "Histologic type: Carcinoma, see comment",
        "Histologic type: Mixed type including acinar and papillary",
        # a type word on another key is no type field
        "Specimen: Squamous cell\nProcedure: biopsy",
        # the value on the next line is another field, not this key's answer
        "Histologic type:\nSquamous cell",
    ],
)
def test_other_values_are_left_alone(text: str) -> None:
    assert _field_mentions("lung", text) == []


def test_the_label_follows_the_value() -> None:
    res = _labeler("lung").label_report(
        "FINAL DIAGNOSIS:\nLUNG, LEFT LOWER LOBE, LOBECTOMY:\nINVASIVE CARCINOMA.\n"
        "HISTOLOGIC TYPE; SQUAMOUS.\nHISTOLOGIC GRADE; 2/3.\n"
    )
    assert res.case.states["squamous_cell_carcinoma"].state == "present"
    adeno = res.case.states.get("adenocarcinoma")
    assert adeno is None or adeno.state != "present"


def test_a_lexicon_without_type_fields_reads_none() -> None:
    lex = HeaderLexicon({"diagnosis": "diagnosis"}, ["histologic type"], ["part"])
    fields = TypeFields.from_lexicon(lex)
    assert list(fields.values("Histologic type: Squamous cell")) == []
    matcher = ConceptMatcher(load_ontology(), AbbreviationDictionary.load())
    found = fields.mentions("Histologic type: Squamous cell", [], matcher)
    assert found == []
