"""Concept matching: exact names and synonyms, short forms, definitions, misspellings."""

from __future__ import annotations

from pathlib import Path

import pytest
from fuzzy_cases import MISSPELLINGS, ORDINARY_SENTENCES, ORDINARY_WORDS
from hypothesis import given, settings
from hypothesis import strategies as st
from reading_support import MINI_OBO, concept
from reports import REPORTS

from pathsieve.abbreviations import AbbreviationDictionary
from pathsieve.errors import ConfigError, InputError, VocabError
from pathsieve.matcher import (
    FUZZY_CUTOFF,
    ConceptMatcher,
    check_common_words,
    load_common_words,
    matching_key,
    plural_forms,
)
from pathsieve.normalize import normalize
from pathsieve.ontology import Ontology, load_ontology
from pathsieve.records import Mention


def assert_sound(text: str, mentions: list[Mention]) -> None:
    """Offsets are exact, mentions are sorted and never overlap."""
    last_end = 0
    for m in mentions:
        assert m.text == text[m.start : m.end]
        assert m.start >= last_end
        last_end = m.end
        assert m.match in {"exact", "abbreviation", "fuzzy"}
        assert (m.score == 100.0) == (m.match != "fuzzy") or m.match == "fuzzy"


# (text, expected (surface, concept name, match or None for any), surfaces that must NOT be mentions)
EXACT: list[tuple[str, list[tuple[str, str, str | None]], list[str]]] = [
    (
        "Tubular adenoma with high-grade dysplasia.",
        [
            ("Tubular adenoma", "tubular adenoma", "exact"),
            ("high-grade dysplasia", "high-grade dysplasia", "exact"),
        ],
        ["adenoma", "dysplasia"],
    ),
    (
        "TUBULAR ADENOMAS, MULTIPLE FRAGMENTS",
        [("TUBULAR ADENOMAS", "tubular adenoma", "exact")],
        [],
    ),
    ("with high grade dysplasia", [("high grade dysplasia", "high-grade dysplasia", "exact")], []),
    (
        "High -  grade\n dysplasia",
        [("High -  grade\n dysplasia", "high-grade dysplasia", "exact")],
        [],
    ),
    (
        "Adeno-\ncarcinoma, moderately differentiated.",
        [("Adeno-\ncarcinoma", "adenocarcinoma", "exact")],
        [],
    ),
    ("tubulo-villous adenoma", [("tubulo-villous adenoma", "tubulovillous adenoma", None)], []),
    (
        "INVASIVE DUCTAL CARCINOMA, grade 2",
        [("INVASIVE DUCTAL CARCINOMA", "invasive ductal carcinoma", "exact")],
        ["DUCTAL CARCINOMA", "CARCINOMA"],
    ),
    ("adenomatous change and carcinomatosis", [], ["adenoma", "carcinoma"]),
    (
        "squamous cell carcinoma; small cell carcinoma",
        [
            ("squamous cell carcinoma", "squamous cell carcinoma", "exact"),
            ("small cell carcinoma", "small cell carcinoma", "exact"),
        ],
        ["cell carcinoma"],
    ),
    ("Hyperplastic polyps x2", [("Hyperplastic polyps", "hyperplastic polyp", "exact")], []),
    (
        "coeliac disease / celiac disease",
        [
            ("coeliac disease", "celiac disease", "exact"),
            ("celiac disease", "celiac disease", "exact"),
        ],
        [],
    ),
    (
        "crypt hyperplasia and villous atrophy",
        [
            ("crypt hyperplasia", "crypt hyperplasia", "exact"),
            ("villous atrophy", "villous atrophy", "exact"),
        ],
        [],
    ),
    ("\ufb01broadenoma", [("\ufb01broadenoma", "fibroadenoma", "exact")], []),
    (
        "lobular carcinoma in situ.",
        [("lobular carcinoma in situ", "lobular carcinoma in situ", "exact")],
        ["carcinoma", "lobular carcinoma"],
    ),
]


@pytest.mark.parametrize(("text", "expected", "absent"), EXACT, ids=[e[0] for e in EXACT])
def test_exact(
    matcher: ConceptMatcher,
    onto: Ontology,
    text: str,
    expected: list[tuple[str, str, str | None]],
    absent: list[str],
) -> None:
    found = matcher.find(text)
    assert_sound(text, found)
    got = {(m.text, m.concept_id, m.match) for m in found}
    for surface, name, match in expected:
        cid = concept(onto, name)
        assert any(
            t == surface and c == cid and (match is None or k == match) for t, c, k in got
        ), f"{surface!r} as {name} not in {sorted((m.text, m.label, m.match) for m in found)}"
    texts = {m.text for m in found}
    for surface in absent:
        assert surface not in texts


def test_longest_then_deeper(tmp_path: Path) -> None:
    # Two concepts share "neoplasia X"; the deeper one wins that key.  A longer
    # span beats a shorter one whatever the depth.
    obo = tmp_path / "tiny.obo"
    obo.write_text(
        MINI_OBO.read_text(encoding="utf-8").split("[Term]", 1)[0]
        + "[Term]\nid: T:1\nname: lesion\n\n"
        "[Term]\nid: T:2\nname: special lesion\nis_a: T:1 ! lesion\n"
        'synonym: "lesion x" EXACT []\nproperty_value: PSV:shared_synonym "lesion x" xsd:string\n\n'
        "[Term]\nid: T:3\nname: very special lesion\nis_a: T:2 ! special lesion\n"
        'synonym: "lesion x" EXACT []\nproperty_value: PSV:shared_synonym "lesion x" xsd:string\n\n'
        "[Term]\nid: T:4\nname: x lesion x\nis_a: T:1 ! lesion\n\n"
        "[Typedef]\nid: PSV:shared_synonym\nname: shared synonym\nis_metadata_tag: true\n",
        encoding="utf-8",
    )
    onto = load_ontology(obo)
    m = ConceptMatcher(onto, AbbreviationDictionary.empty(), fuzzy_cutoff=None)
    assert [(x.text, x.concept_id) for x in m.find("a lesion x here")] == [("lesion x", "T:3")]
    assert [(x.text, x.concept_id) for x in m.find("an x lesion x")] == [("x lesion x", "T:4")]
    assert m.ambiguous_keys == {}  # related by is_a: not ambiguous


# ----------------------------------------------------------------- short forms


def rows(onto: Ontology, *specs: tuple[str, str, str, str, str]) -> AbbreviationDictionary:
    """A dictionary whose concept column names concepts (looked up in ``onto``)."""
    return AbbreviationDictionary.from_rows(
        (abbr, exp, concept(onto, name) if name else "", ctx, case)
        for abbr, exp, name, ctx, case in specs
    )


def test_short_forms_are_whole_tokens_and_respect_case(onto: Ontology) -> None:
    d = rows(
        onto,
        ("XTA", "tubular adenoma", "tubular adenoma", "*", "yes"),
        ("xva", "villous adenoma", "villous adenoma", "*", "no"),
    )
    m = ConceptMatcher(onto, d, fuzzy_cutoff=None)
    text = "XTA, xta, XTAs, (XTA); XVA and Xva, xvax"
    found = [(x.text, x.start, x.match) for x in m.find(text) if x.match == "abbreviation"]
    assert found == [
        ("XTA", 0, "abbreviation"),
        ("XTA", text.index("(XTA)") + 1, "abbreviation"),
        ("XVA", text.index("XVA"), "abbreviation"),
        ("Xva", text.index("Xva"), "abbreviation"),
    ]


def test_short_form_sense_by_section(onto: Ontology) -> None:
    d = rows(
        onto,
        ("XA", "tubular adenoma", "tubular adenoma", "diagnosis", "yes"),
        ("XA", "villous adenoma", "villous adenoma", "gross", "yes"),
    )
    m = ConceptMatcher(onto, d, fuzzy_cutoff=None)
    text = "DIAGNOSIS: XA.\nGROSS: XA."
    gross_starts = text.index("GROSS")

    def section_at(offset: int) -> str:
        return "gross" if offset >= gross_starts else "diagnosis"

    found = [x for x in m.find(text, section_at=section_at) if x.match == "abbreviation"]
    assert [x.concept_id for x in found] == [
        concept(onto, "tubular adenoma"),
        concept(onto, "villous adenoma"),
    ]
    assert "section gross" in found[1].note


def test_short_form_without_concept_reads_nothing(onto: Ontology) -> None:
    d = rows(onto, ("PR", "progesterone receptor", "", "breast", "yes"))
    m = ConceptMatcher(onto, d, fuzzy_cutoff=None)
    assert [x for x in m.find("PR: positive (20%)") if x.text == "PR"] == []


def test_shipped_dictionary_chooses_by_scheme(
    onto: Ontology, shipped_abbreviations: AbbreviationDictionary
) -> None:
    text = "Biopsy: HP."
    colorectal = ConceptMatcher(onto, shipped_abbreviations, scheme_name="colorectal")
    hp = [x for x in colorectal.find(text) if x.text == "HP"]
    assert [x.concept_id for x in hp] == [concept(onto, "hyperplastic polyp")]
    assert "scheme colorectal" in hp[0].note


# ----------------------------------------------------------------- definitions


def test_definition_overrides_dictionary(onto: Ontology) -> None:
    # the dictionary (deliberately) reads TSA as tubular adenoma; the report says otherwise
    d = rows(onto, ("TSA", "tubular adenoma", "tubular adenoma", "*", "yes"))
    m = ConceptMatcher(onto, d, fuzzy_cutoff=None)
    plain = [x for x in m.find("One TSA.") if x.text == "TSA"]
    assert [x.concept_id for x in plain] == [concept(onto, "tubular adenoma")]
    text = "A traditional serrated adenoma (TSA) is present. The TSA is excised."
    found = [x for x in m.find(text) if x.text == "TSA"]
    assert [x.concept_id for x in found] == [concept(onto, "traditional serrated adenoma")] * 2
    assert all("defined in this report as 'traditional serrated adenoma'" in x.note for x in found)
    assert [x.start for x in found] == [text.index("TSA"), text.rindex("TSA")]


def test_definition_as_something_else_silences_the_short_form(onto: Ontology) -> None:
    d = rows(onto, ("HQ", "tubular adenoma", "tubular adenoma", "*", "yes"))
    m = ConceptMatcher(onto, d, fuzzy_cutoff=None)
    text = "A heat quench (HQ) was applied; HQ removed."
    assert [x for x in m.find(text) if x.text == "HQ"] == []


# ----------------------------------------------------------------- fuzzy


def _misspelling_found(m: ConceptMatcher, onto: Ontology, written: str, name: str) -> bool:
    text = f"Diagnosis: {written}, see comment."
    start = text.index(written)
    cid = concept(onto, name)
    return any(
        x.concept_id == cid and x.start < start + len(written) and x.end > start
        for x in m.find(text)
    )


def test_fuzzy_recall(matcher: ConceptMatcher, onto: Ontology) -> None:
    cases = [(w, n) for w, n, _ in MISSPELLINGS if onto.lookup(n)]
    assert len(cases) >= 40
    missed = [w for w, n in cases if not _misspelling_found(matcher, onto, w, n)]
    rate = 1 - len(missed) / len(cases)
    print(f"\nfuzzy recall {rate:.1%} on {len(cases)} misspellings; missed: {missed}")
    assert rate >= 0.90


@pytest.mark.parametrize("common", [False, True], ids=["filter-off", "filter-on"])
def test_fuzzy_precision_on_ordinary_text(onto: Ontology, common: bool) -> None:
    m = ConceptMatcher(
        onto, AbbreviationDictionary.empty(), common_words=None if common else frozenset()
    )
    false = [
        f"{x.text!r} -> {x.label}"
        for text in [*ORDINARY_WORDS, *ORDINARY_SENTENCES]
        for x in m.find(text)
        if x.match == "fuzzy"
    ]
    assert false == []


def test_fuzzy_mention_fields(matcher: ConceptMatcher, onto: Ontology) -> None:
    text = "RECTUM: ADENOCARCNOMA, MODERATELY DIFFERENTIATED."
    (m,) = [x for x in matcher.find(text) if x.match == "fuzzy"]
    assert (m.text, m.concept_id) == ("ADENOCARCNOMA", concept(onto, "adenocarcinoma"))
    assert FUZZY_CUTOFF <= m.score < 100
    assert "'adenocarcnoma' read as 'adenocarcinoma'" in m.note


def test_fuzzy_never_hides_a_glued_negation(matcher: ConceptMatcher, onto: Ontology) -> None:
    # "Noadenocarcinoma" must not become a (present) adenocarcinoma; "Nomalignancy"
    # may only be read as a whole, "no malignancy", never as "malignancy"; the loose
    # reading may read "Negative formalignancy" whole, as "negative for malignancy"
    positive = {concept(onto, "adenocarcinoma"), concept(onto, "malignancy")}
    found = matcher.find("Nomalignancy seen. Noadenocarcinoma. Negative formalignancy.")
    assert [x for x in found if x.concept_id in positive] == []
    assert all(
        x.match == "fuzzy" and ("as 'no " in x.note or "as 'negative for " in x.note) for x in found
    )


def test_fuzzy_off(onto: Ontology) -> None:
    m = ConceptMatcher(onto, AbbreviationDictionary.empty(), fuzzy_cutoff=None)
    assert [x for x in m.find("adenocarcnoma") if x.match == "fuzzy"] == []


def test_short_words_are_never_corrected(matcher: ConceptMatcher) -> None:
    assert matcher.fuzzy_correction("polpy") is None  # below the shortest corrected length
    assert matcher.fuzzy_correction("carcinorna") == ("carcinoma", 95.0)  # one OCR confusion


# ----------------------------------------------------------------- reports and properties


@pytest.mark.parametrize("name", sorted(REPORTS))
def test_invented_reports(onto: Ontology, name: str) -> None:
    m = ConceptMatcher(onto, AbbreviationDictionary.empty(), scheme_name="colorectal")
    text = REPORTS[name]
    found = m.find(text)
    assert found
    assert_sound(text, found)
    assert m.find(text, norm=normalize(text, known_words=m.known_words)) == found


def test_ocr_report(matcher: ConceptMatcher, onto: Ontology) -> None:
    found = {(x.text, x.concept_id) for x in matcher.find(REPORTS["ocr_noise"])}
    assert ("TUBULOVILOUS ADENOMA", concept(onto, "tubulovillous adenoma")) in found
    assert ("CARCINORNA", concept(onto, "carcinoma")) in found
    assert ("ADENOCARCNOMA", concept(onto, "adenocarcinoma")) in found


_PHRASES = [
    "tubular adenoma",
    "High-Grade Dysplasia",
    "adenocarcinoma",
    "ADENOCARCINOMA",
    "HGD",
    "polyp",
    "carcinorna",
    "adeno carcinoma",
    "sessile serrated lesion",
    "(HP)",
    "hyperplastic polyp",
    "lymph node",
    "the",
    "of",
    "no",
    "margins",
    "2.5 cm",
    "0/12",
    "\n",
    "  ",
    "-\n",
    ", ",
    ". ",
    "\ufb01broadenoma",
    "Stra\u00dfe",
    "caf\u00e9",
    "\u2013",
    "CIN 2-3",
    "ER+",
]


@settings(max_examples=150, deadline=None)
@given(st.lists(st.sampled_from(_PHRASES), max_size=14).map(" ".join))
def test_mentions_point_at_what_was_found(matcher: ConceptMatcher, text: str) -> None:
    found = matcher.find(text)
    assert_sound(text, found)
    keys = matcher._index.key_concept
    for m in found:
        if m.match == "exact":
            # the original text of the span is itself a name or synonym of the concept
            key = matching_key(m.text)
            assert key in keys
            assert keys[key] == m.concept_id or matcher.ambiguous_keys.get(key)


# ----------------------------------------------------------------- API details


def test_index_is_built_once(onto: Ontology) -> None:
    d = AbbreviationDictionary.empty()
    a = ConceptMatcher(onto, d, scheme_name="colorectal")
    b = ConceptMatcher(onto, d, scheme_name="prostate", fuzzy_cutoff=92)
    assert a._index is b._index


def test_bad_options_and_inputs(matcher: ConceptMatcher, onto: Ontology) -> None:
    with pytest.raises(ConfigError, match="fuzzy_cutoff"):
        ConceptMatcher(onto, fuzzy_cutoff=120)
    with pytest.raises(InputError, match="another text"):
        matcher.find("tubular adenoma", norm=normalize("villous adenoma"))


PLURALS = [
    ("adenoma", ("adenomas", "adenomata")),
    ("polyp", ("polyps",)),
    ("biopsy", ("biopsies",)),
    ("metastasis", ("metastases",)),
    ("villus", ("villi", "villuses")),
    ("abscess", ("abscesses",)),
    ("cervix", ("cervices", "cervixes")),
    ("epithelium", ("epithelia", "epitheliums")),
    ("adenomas", ()),  # already plural
    ("mucinous", ()),  # an adjective
    ("ca", ()),
]


@pytest.mark.parametrize(("word", "plurals"), PLURALS, ids=[p[0] for p in PLURALS])
def test_plural_forms(word: str, plurals: tuple[str, ...]) -> None:
    assert plural_forms(word) == plurals


def test_common_words_file(tmp_path: Path) -> None:
    assert check_common_words() == []
    words = load_common_words()
    assert {"received", "formalin", "the"} <= words
    bad = tmp_path / "common.txt"
    bad.write_text("# comment\nfine\nTwo Words\nfine\n", encoding="utf-8")
    problems = check_common_words(bad)
    assert problems == [
        f"{bad}:3: bad word 'Two Words': one lower-case word per line, letters only",
        f"{bad}:4: duplicate word 'fine' (first at line 2); remove one",
    ]
    with pytest.raises(VocabError) as err:
        load_common_words(bad)
    assert err.value.line == 3


# --------------------------------------------------------------------------- neighbour look-up


@settings(max_examples=200, deadline=None)
@given(
    st.lists(st.tuples(st.integers(0, 400), st.integers(1, 40)), max_size=60),
    st.integers(0, 450),
    st.integers(0, 120),
)
def test_neighbour_lookup_equals_a_scan(spans: list[tuple[int, int]], lo: int, width: int) -> None:
    # The bisect look-up that keeps huge reports linear must find exactly what a
    # scan of every candidate finds (overlap: end > lo and start < hi).
    from pathsieve.matcher import _Near

    cands = [(s - (s + n), 0, 0, s, s + n, f"C{i}", 100.0, "") for i, (s, n) in enumerate(spans)]
    hi = lo + width
    scan = sorted((c[3], c[4], c[5]) for c in cands if c[4] > lo and c[3] < hi)
    assert sorted(_Near(cands).overlapping(lo, hi)) == scan


@pytest.mark.parametrize(
    ("text", "concept", "written"),
    [
        # punctuation inside a wording is a double space in the searched text
        ("No H. pylori identified.", "Helicobacter pylori infection", "H. pylori"),
        (
            "Adenocarcinoma, signet ring cell type.",
            "signet ring cell carcinoma",
            "Adenocarcinoma, signet ring cell type",
        ),
        ("Carcinoma, NOS, in the biopsy.", "carcinoma, not otherwise specified", "Carcinoma, NOS"),
    ],
)
def test_punctuation_inside_a_wording(text: str, concept: str, written: str) -> None:
    from pathsieve.vocab import lexicon_path, ontology_path

    matcher = ConceptMatcher(
        load_ontology(ontology_path()),
        AbbreviationDictionary.load(lexicon_path("abbreviations.tsv")),
    )
    found = [(m.label, m.text) for m in matcher.find(text)]
    assert (concept, written) in found
