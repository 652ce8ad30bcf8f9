"""Loose reading of names wrecked in more than one word (invented fragments only).

Each fragment imitates one OCR phenomenon seen in scanned reports: two damaged
words, punctuation between the words of a name, run-together words with a lost
letter, a word broken in three, a long word two letters off.  The negative
cases are ordinary sentences, near-miss names of other tumours and negations
that must never become a mention.  The ordinary words and sentences of
``fuzzy_cases`` are checked for any fuzzy mention, this reading's included, by
``test_matcher.test_fuzzy_precision_on_ordinary_text``.
"""

from __future__ import annotations

import pytest
from reading_support import concept

from pathsieve.abbreviations import AbbreviationDictionary
from pathsieve.errors import ConfigError
from pathsieve.matcher import LOOSE_CUTOFF, ConceptMatcher
from pathsieve.ontology import Ontology

# (fragment, damaged span as written, concept name it is read as)
READ: list[tuple[str, str, str]] = [
    # two words one letter off each
    (
        "Invasive squamous ceil carcinomn, moderately",
        "squamous ceil carcinomn",
        "squamous cell carcinoma",
    ),
    # comma between the words, the middle word two letters off
    (
        "LEFT LOBE: SQUAMOUS CEIJ, CARCINOMA, POORLY",
        "SQUAMOUS CEIJ, CARCINOMA",
        "squamous cell carcinoma",
    ),
    # a word broken in two and a lost letter run into the next word
    (
        "BIOPSY: Squamou scellcarcinoma, large cell",
        "Squamou scellcarcinoma",
        "squamous cell carcinoma",
    ),
    # hyphen and garbage inside the first word
    ("-SQUA-NOUS CELL CARCINOMA, grade 2", "SQUA-NOUS CELL CARCINOMA", "squamous cell carcinoma"),
    # one long word broken in three by punctuation
    ("TUMOUR TYPE: ADE.NOCA\\RCINOMA, grade 2", "ADE.NOCA\\RCINOMA", "adenocarcinoma"),
    # one long word two letters off (below the single-word cut-off)
    ("Histologic type\nAdenocerxinoma\nGrade 2", "Adenocerxinoma", "adenocarcinoma"),
    # a letter lost to a smudge inside the first word, the rest intact
    ("LUNG: S* UAMOUS CELL CARCINOMA.", "S* UAMOUS CELL CARCINOMA", "squamous cell carcinoma"),
    # the distinctive words off by a letter or two, only "cell" intact
    ("Squamoas cell carcinena, grade 3", "Squamoas cell carcinena", "squamous cell carcinoma"),
]


@pytest.mark.parametrize(("text", "written", "name"), READ, ids=[r[1] for r in READ])
def test_loose_reading(
    matcher: ConceptMatcher, onto: Ontology, text: str, written: str, name: str
) -> None:
    found = [x for x in matcher.find(text) if x.match == "fuzzy"]
    cid = concept(onto, name)
    hit = [x for x in found if x.concept_id == cid or onto.is_a(x.concept_id, cid)]
    assert hit, found
    m = hit[0]
    start = text.index(written)
    assert (m.start, m.end, m.text) == (start, start + len(written), written)
    assert m.score >= LOOSE_CUTOFF
    assert "read as '" in m.note and m.note.startswith("fuzzy: '")


# text that must yield no fuzzy mention at all
NEVER: list[str] = [
    # a near-miss name of another tumour, exact: stays that tumour
    "small cell carcinoma of the lung",
    # negation words in the window
    "squamous ceii not carcinoma",
    "ade no carcinoma",
    # ordinary report sentences with an unknown word beside a name's word
    "Clinical history: recurrent cough, smokr, carcinoma suspected.",
    "Sections show benign mucosa; zxq cell changes only.",
    "The xqv carcinoma registry number is pending.",
    # a citation whose words sit one letter from a name ("clin" - "colon")
    "See Clin Cancer Res 2009 for the grading rules.",
]


# (text, label words a fuzzy mention must not carry): a missing or different
# word of a longer name is never guessed
NOT_GUESSED: list[tuple[str, str]] = [
    # "a" + "squamous cell carcinoma" is no "adenosquamous carcinoma"
    ("Cervix: a squamoas cell carcinoma.", "adenosquamous"),
    # a name one word longer than what is written
    ("Well differentiatcd adenocarcinoma", "fetal"),
    # an ordinary word in place of a word of the name
    ("small cell carcinoma, compatibel with primary", "combined"),
]


@pytest.mark.parametrize(
    "text", ["Lymph nodes: ...ative for malignancy.", "Lymph nodes: -egative for malignancy."]
)
def test_lost_letters_of_a_negation(matcher: ConceptMatcher, onto: Ontology, text: str) -> None:
    # a negation that lost its first letters is never read as its opposite
    # ("positive for malignancy"): the first letter of a loose reading is kept
    malignant = concept(onto, "malignant neoplasm")
    found = matcher.find(text)
    assert [
        x.text for x in found if x.match == "fuzzy" and onto.is_a(x.concept_id, malignant)
    ] == []


@pytest.mark.parametrize(("text", "word"), NOT_GUESSED)
def test_no_guessed_word(matcher: ConceptMatcher, text: str, word: str) -> None:
    assert [x.label for x in matcher.find(text) if word in x.label] == []


@pytest.mark.parametrize("text", NEVER)
def test_no_loose_reading(matcher: ConceptMatcher, text: str) -> None:
    assert [(x.text, x.label, x.note) for x in matcher.find(text) if x.match == "fuzzy"] == []


def test_near_miss_names_keep_their_tumour(matcher: ConceptMatcher, onto: Ontology) -> None:
    # "smali cell carcinoma" is small cell carcinoma, never squamous cell carcinoma
    squamous = concept(onto, "squamous cell carcinoma")
    found = matcher.find("Lung, biopsy: smali ce1l carcinoma.")
    assert all(x.concept_id != squamous for x in found)


def test_window_beyond_the_name_is_not_taken(matcher: ConceptMatcher) -> None:
    # an unknown word after an exact name does not stretch the name over it
    text = "squamous cell carcinoma xqzt"
    (m,) = [x for x in matcher.find(text) if x.label == "squamous cell carcinoma"]
    assert (m.text, m.match) == ("squamous cell carcinoma", "exact")


def test_loose_off(onto: Ontology) -> None:
    text = "SQUAMOUS CEIJ, CARCINOMA"
    off = ConceptMatcher(onto, AbbreviationDictionary.empty(), loose_cutoff=None)
    on = ConceptMatcher(onto, AbbreviationDictionary.empty())
    assert [x for x in off.find(text) if len(x.text) > 10] == []
    assert [x.text for x in on.find(text) if x.match == "fuzzy"] == [text]
    with pytest.raises(ConfigError, match="loose_cutoff"):
        ConceptMatcher(onto, AbbreviationDictionary.empty(), loose_cutoff=120)
