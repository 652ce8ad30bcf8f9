"""OCR forms of names that the damage benchmark found unread, and sentence joins.

``benchmarks/ocr_damage.py`` damages the type name of real development reports
one way at a time and counts how often it still reads.  These invented
fragments (fictional Northgate Lane laboratory) pin the forms it found unread:

* two words of a name glued ("squamouscell carcinoma"), where the glued word is
  known only as a generated spelling of another name;
* a word split into two known words ("squamo us", "squamo" being a word of
  "squamo-columnar junction");
* glyph runs an OCR engine makes of one letter ("rn", "nn", "in", "ri", "ii" for
  "m", "m", "m", "n", "u"), and such a run plus one more slip in a long word;
* two letters misread, not side by side, in a word of twelve letters or more;
* a name joined by its comma form to the next sentence ("... adenocarcinoma.
  Metastatic ..." is no "adenocarcinoma, metastatic").

The confusions are common OCR confusions (trade practice, no published table).
"""

from __future__ import annotations

import pytest
from reading_support import concept

from pathsieve.matcher import ConceptMatcher
from pathsieve.ontology import Ontology


def reads_as(matcher: ConceptMatcher, onto: Ontology, text: str, span: str, name: str) -> bool:
    """Some mention holds ``span`` and is of ``name`` or a narrower concept.

    (The shipped ontology may know a longer name: "squamous cell carcinoma,
    keratinizing".)
    """
    cid = concept(onto, name)
    return any(span in m.text and onto.is_a(m.concept_id, cid) for m in matcher.find(text))


READ: list[tuple[str, str, str]] = [
    ("Left lung, lobectomy: squamouscell carcinoma, keratinizing.", "squamouscell carcinoma",
     "squamous cell carcinoma"),
    ("LEFT LUNG: SQUAMOUSCELL CARCINOMA, POORLY DIFFERENTIATED", "SQUAMOUSCELL CARCINOMA",
     "squamous cell carcinoma"),
    ("Right lung: squamo us cell carcinoma, moderately differentiated.",
     "squamo us cell carcinoma", "squamous cell carcinoma"),
    ("Sigmoid colon: invasive adenocarcinorna, grade 2.", "adenocarcinorna", "adenocarcinoma"),
    ("Sigmoid colon: adeuocarcinorna, grade 2.", "adeuocarcinorna", "adenocarcinoma"),
    ("Cervix: squainous cell carcinoma, nonkeratinizing.", "squainous cell carcinoma",
     "squamous cell carcinoma"),
    ("Rectum: invasive carcinonna.", "carcinonna", "carcinoma"),
    # two letters misread, apart, in a long word
    ("Cecum: aaenocarcinomo, moderately differentiated.", "aaenocarcinomo", "adenocarcinoma"),
    ("CECUM: ADENOCARC1NOMO, MODERATELY DIFFERENTIATED", "ADENOCARC1NOMO", "adenocarcinoma"),
]  # fmt: skip


@pytest.mark.parametrize(("text", "span", "name"), READ)
def test_damaged_name_reads(
    matcher: ConceptMatcher, onto: Ontology, text: str, span: str, name: str
) -> None:
    assert reads_as(matcher, onto, text, span, name), matcher.find(text)


def test_the_reading_says_what_it_read(matcher: ConceptMatcher) -> None:
    (m,) = [x for x in matcher.find("Lung: squamouscell carcinoma.") if x.match == "fuzzy"]
    assert "read as 'squamous cell'" in m.note


# Ordinary words a glyph run plus a slip would bring near a name: short words never
# take the two steps ("focality" is no "focally", "corion" no "colon")
@pytest.mark.parametrize("text", ["Tumor focality: unifocal.", "vaginal corion", "a typical day"])
def test_short_words_take_no_second_step(matcher: ConceptMatcher, text: str) -> None:
    assert [m.text for m in matcher.find(text) if m.match == "fuzzy"] == []


# Two slips are letters misread in place: a word of another length, or with its
# ending changed whole, is another word
@pytest.mark.parametrize(
    "text", ["Uterus: Mullerian adenosarcoma, low grade.", "Uterus: adenosarcomas, low grade."]
)
def test_two_slips_never_reach_another_tumour(
    matcher: ConceptMatcher, onto: Ontology, text: str
) -> None:
    assert not reads_as(matcher, onto, text, "adenosarcoma", "adenocarcinoma")


def test_a_name_does_not_join_the_next_sentence(matcher: ConceptMatcher, onto: Ontology) -> None:
    text = "Margins are free of carcinoma.\nMETASTATIC CARCINOMA in three of nine nodes."
    found = [(m.text, m.concept_id) for m in matcher.find(text)]
    assert ("carcinoma", concept(onto, "carcinoma")) in found
    assert ("METASTATIC CARCINOMA", concept(onto, "metastatic carcinoma")) in found
    same_line = "Invasive adenocarcinoma. Metastatic carcinoma in one node."
    assert reads_as(matcher, onto, same_line, "adenocarcinoma", "adenocarcinoma")
    assert not reads_as(matcher, onto, same_line, "adenocarcinoma", "metastatic carcinoma")
    assert reads_as(matcher, onto, same_line, "Metastatic carcinoma", "metastatic carcinoma")


def test_a_comma_name_still_reads_within_its_sentence(
    matcher: ConceptMatcher, onto: Ontology
) -> None:
    if not onto.lookup("carcinoma, metastatic"):
        pytest.skip("this ontology names no carcinoma with a comma")
    text = "Lymph node: carcinoma, metastatic (1/12)."
    assert reads_as(matcher, onto, text, "carcinoma, metastatic", "metastatic carcinoma")


@pytest.mark.parametrize(
    ("text", "span", "name"),
    [
        # a stray full stop inside a name, the first half being no name
        ("RIGHT LUNG: SQUAMOUS CELI. CARCINOMA", "SQUAMOUS CELI. CARCINOMA",
         "squamous cell carcinoma"),
        # an initial's full stop is no sentence end
        ("Antrum: H. pylori gastritis, chronic active gastritis.", "H. pylori",
         "Helicobacter pylori infection"),
    ],
)  # fmt: skip
def test_full_stops_inside_a_name(
    matcher: ConceptMatcher, onto: Ontology, text: str, span: str, name: str
) -> None:
    assert reads_as(matcher, onto, text, span, name), matcher.find(text)
