"""Fixtures for the reading-stage tests (tokenizer, normalisation, abbreviations, matcher).

Tests that take ``onto`` run twice: against the shipped ontology (skipped
while it is missing or fails its check) and against the invented miniature
``data/mini.obo``.  Expectations name concepts by name
(``concept(onto, "tubular adenoma")``), never by id, so they hold for both.
"""

from __future__ import annotations

import sys
from pathlib import Path

import pytest

from pathsieve.abbreviations import AbbreviationDictionary
from pathsieve.matcher import ConceptMatcher
from pathsieve.ontology import Ontology, check_ontology, load_ontology
from pathsieve.vocab import lexicon_path, ontology_path

HERE = Path(__file__).resolve().parent
sys.path.insert(0, str(HERE))  # the invented reports and fuzzy tables live beside the tests

from reading_support import MINI_OBO  # noqa: E402


def _shipped_ontology_usable() -> bool:
    p = ontology_path()
    return p.is_file() and not check_ontology(p)


@pytest.fixture(scope="session", params=["shipped", "mini"])
def onto(request: pytest.FixtureRequest) -> Ontology:
    """Every test that takes ``onto`` runs on the shipped ontology and on the mini one."""
    if request.param == "mini":
        return load_ontology(MINI_OBO)
    if not _shipped_ontology_usable():
        pytest.skip("the shipped ontology is not there yet (or fails its check)")
    return load_ontology(ontology_path())


@pytest.fixture(scope="session")
def mini() -> Ontology:
    return load_ontology(MINI_OBO)


@pytest.fixture(scope="session")
def shipped_abbreviations(onto: Ontology) -> AbbreviationDictionary:
    p = lexicon_path("abbreviations.tsv")
    if onto.path != str(ontology_path().resolve()) or not p.is_file():
        pytest.skip("the shipped abbreviation dictionary goes with the shipped ontology only")
    return AbbreviationDictionary.load(p)


@pytest.fixture(scope="session")
def matcher(onto: Ontology) -> ConceptMatcher:
    """A matcher with no abbreviation dictionary (ontology short forms only)."""
    return ConceptMatcher(onto, AbbreviationDictionary.empty())
