"""Abbreviations: dictionary file, checker, sense choice, in-text definitions."""

from __future__ import annotations

import re
from pathlib import Path

import pytest

from pathsieve.abbreviations import (
    AbbreviationDictionary,
    Sense,
    check_abbreviations,
    choose_sense,
    find_definitions,
)
from pathsieve.errors import VocabError
from pathsieve.ontology import Ontology

HEADER = "abbr\texpansion\tconcept_id\tcontexts\tcase_sensitive\n"


def write(tmp_path: Path, body: str, header: str = HEADER) -> Path:
    p = tmp_path / "abbreviations.tsv"
    p.write_text("# a comment line\n" + header + body, encoding="utf-8")
    return p


# ----------------------------------------------------------------- the file


def test_load_and_look_up(tmp_path: Path) -> None:
    p = write(
        tmp_path,
        "HP\thyperplastic polyp\tX:1\tcolorectal\tyes\n"
        "HP\tHelicobacter pylori\tX:2\t*\tyes\n"
        "\n"
        "ca\tcarcinoma\tX:3\t*\tno\n"
        "PR\tprogesterone receptor\t\tbreast,diagnosis\tyes\n",
    )
    d = AbbreviationDictionary.load(p)
    assert len(d) == 4
    assert [s.expansion for s in d.senses_for("HP")] == [
        "hyperplastic polyp",
        "Helicobacter pylori",
    ]
    assert d.senses_for("hp") == ()  # case-sensitive rows match as written only
    assert [s.expansion for s in d.senses_for("CA")] == ["carcinoma"]  # case-insensitive row
    pr = d.senses_for("PR")[0]
    assert pr.concept_id == "" and pr.schemes == {"breast"} and pr.sections == {"diagnosis"}
    assert d.senses_for("HP")[0].line == 3  # file line numbers are kept


BROKEN: list[tuple[str, str, int, str]] = [
    # (header, body, line of the problem, words the message must hold)
    ("abbr\texpansion\tconcept\n", "HP\thp\tX:1\n", 2, "bad header"),
    (HEADER, "HP\thyperplastic polyp\tX:1\tcolorectal\n", 3, "expected 5 tab-separated columns"),
    (HEADER, "HP\t\tX:1\t*\tyes\n", 3, "empty expansion"),
    (HEADER, "HP\thyperplastic polyp\tX:1\t*\tmaybe\n", 3, "bad case_sensitive value 'maybe'"),
    (HEADER, " HP\thyperplastic polyp\tX:1\t*\tyes\n", 3, "bad abbr"),
    (HEADER, "HP\thyperplastic polyp\tX:1\tColorectal\tyes\n", 3, "bad context 'Colorectal'"),
    (HEADER, "HP\thyperplastic polyp\tX:1\t*,colorectal\tyes\n", 3, "mix * with names"),
    (HEADER, "HP\thyperplastic polyp\tX:1\t\tyes\n", 3, "empty contexts"),
]


@pytest.mark.parametrize(("header", "body", "line", "words"), BROKEN, ids=[b[3] for b in BROKEN])
def test_broken_file_raises_with_line(
    tmp_path: Path, header: str, body: str, line: int, words: str
) -> None:
    p = write(tmp_path, body, header)
    with pytest.raises(VocabError) as err:
        AbbreviationDictionary.load(p)
    assert err.value.line == line
    assert err.value.path == str(p)
    assert words in err.value.message
    assert str(err.value).startswith(f"{p}:{line}: ")


def test_missing_file_raises(tmp_path: Path) -> None:
    with pytest.raises(VocabError, match="not found"):
        AbbreviationDictionary.load(tmp_path / "nope.tsv")


def test_checker_lists_every_problem(tmp_path: Path, mini: Ontology) -> None:
    p = write(
        tmp_path,
        "HP\thyperplastic polyp\tPSV:0000031\tcolorectal\tyes\n"  # line 3: fine
        "HP\tHyperplastic  polyp\tPSV:0000031\tcolorectal\tyes\n"  # 4: duplicate sense
        "TA\ttubular adenoma\tPSV:9999999\tcolorectal\tyes\n"  # 5: unknown id
        "SSA\tsessile serrated adenoma\tPSV:0000025\tcolorectal\tsometimes\n"  # 6: bad flag
        "LGD\tlow-grade dysplasia\tPSV:0000041\tcolorectl\tyes\n",  # 7: unknown context
    )
    problems = check_abbreviations(p, mini, known_contexts={"colorectal", "diagnosis"})
    assert len(problems) == 4, problems
    by_line = {int(re.match(r".*?:(\d+): ", x).group(1)): x for x in problems}
    assert "duplicate sense" in by_line[4] and "first at line 3" in by_line[4]
    assert "unknown concept id 'PSV:9999999'" in by_line[5]
    assert "bad case_sensitive" in by_line[6]
    assert "unknown context 'colorectl'" in by_line[7]
    assert all(x.startswith(f"{p}:") for x in problems)


def test_checker_on_a_sound_file(tmp_path: Path, mini: Ontology) -> None:
    p = write(tmp_path, "HP\thyperplastic polyp\tPSV:0000031\tcolorectal\tyes\n")
    assert check_abbreviations(p, mini, known_contexts={"colorectal"}) == []


def test_test_dictionary_is_sound(mini: Ontology) -> None:
    p = Path(__file__).parent / "data" / "abbreviations.tsv"
    known = {"colorectal", "prostate", "cervix", "duodenum", "lung", "breast", "clinical_history"}
    assert check_abbreviations(p, mini, known_contexts=known) == []


def test_shipped_dictionary_is_sound(shipped_abbreviations: AbbreviationDictionary) -> None:
    assert check_abbreviations(shipped_abbreviations.path) == []


# ----------------------------------------------------------------- sense choice

HP_POLYP = Sense("HP", "hyperplastic polyp", "X:polyp", ("colorectal",))
HP_BUG = Sense("HP", "Helicobacter pylori", "X:bug", ("*",))
ER_RECEPTOR = Sense("ER", "estrogen receptor", "", ("breast",))
ER_ROOM = Sense("ER", "emergency room", "", ("clinical_history",))
CA_GYN = Sense("CA", "carcinoma", "X:ca", ("cervix", "diagnosis"))

# (senses, scheme, section, nearby words, expected expansion, words in the note).
# Contexts are preferences: with no evidence the first-listed sense is read.
CHOICES: list[tuple[tuple[Sense, ...], str | None, str | None, set[str], str, str]] = [
    (
        (HP_POLYP, HP_BUG),
        "colorectal",
        None,
        set(),
        "hyperplastic polyp",
        "HP: chose 'hyperplastic polyp' by scheme colorectal over 'Helicobacter pylori'",
    ),
    ((HP_POLYP, HP_BUG), "prostate", None, set(), "hyperplastic polyp", "first-listed sense"),
    ((HP_BUG, HP_POLYP), "prostate", None, set(), "Helicobacter pylori", "first-listed sense"),
    (
        (HP_POLYP, HP_BUG),
        "colorectal",
        None,
        {"helicobacter", "organisms"},
        "Helicobacter pylori",
        "by nearby 'helicobacter'",
    ),
    (
        (HP_POLYP, HP_BUG),
        "colorectal",
        None,
        {"polyps", "sigmoid"},
        "hyperplastic polyp",
        "scheme colorectal; nearby 'polyp'",
    ),
    ((HP_POLYP, HP_BUG), None, None, set(), "hyperplastic polyp", "first-listed sense"),
    ((ER_RECEPTOR, ER_ROOM), "breast", "diagnosis", set(), "estrogen receptor", "scheme breast"),
    (
        (ER_RECEPTOR, ER_ROOM),
        "colorectal",
        "clinical_history",
        set(),
        "emergency room",
        "section clinical_history",
    ),
    (
        (ER_RECEPTOR, ER_ROOM),
        "colorectal",
        "diagnosis",
        set(),
        "estrogen receptor",
        "first-listed sense",
    ),
    ((CA_GYN,), "cervix", "diagnosis", set(), "carcinoma", ""),  # one sense: no note
    ((CA_GYN,), "lung", None, set(), "carcinoma", ""),  # one sense is read everywhere
]


@pytest.mark.parametrize(
    ("senses", "scheme", "section", "near", "expected", "note"),
    CHOICES,
    ids=[f"{c[0][0].abbr}-{c[1]}-{c[2]}-{sorted(c[3])}" for c in CHOICES],
)
def test_choose_sense(
    senses: tuple[Sense, ...],
    scheme: str | None,
    section: str | None,
    near: set[str],
    expected: str,
    note: str,
) -> None:
    choice = choose_sense(senses[0].abbr, senses, scheme=scheme, section=section, neighbours=near)
    assert choice is not None and choice.sense.expansion == expected
    assert note in choice.note


def test_choose_sense_of_nothing() -> None:
    assert choose_sense("HP", ()) is None


def test_choose_sense_uses_concept_cues() -> None:
    # words of the sense's concept and its ancestors count +1 each
    cues = {HP_POLYP: {"colon", "serrated"}, HP_BUG: {"gastritis", "stomach"}}
    choice = choose_sense("HP", (HP_POLYP, HP_BUG), neighbours={"gastric", "gastritis"}, cues=cues)
    assert choice is not None and choice.sense is HP_BUG
    assert "nearby 'gastritis'" in choice.note


# ----------------------------------------------------------------- definitions

# (text, short form, long form or None).  "(from memory)": an example recalled
# from Schwartz & Hearst, PSB 2003; all others are invented report sentences.
DEFINITIONS: list[tuple[str, str | None, str | None]] = [
    (
        "heat shock transcription factor (HSF)",
        "HSF",
        "heat shock transcription factor",
    ),  # (from memory)
    ("Colon, sigmoid: hyperplastic polyp (HP).", "HP", "hyperplastic polyp"),
    ("A sessile serrated lesion (SSL) without dysplasia.", "SSL", "sessile serrated lesion"),
    (
        "ATYPICAL SMALL ACINAR PROLIFERATION (ASAP), SEE COMMENT",
        "ASAP",
        "ATYPICAL SMALL ACINAR PROLIFERATION",
    ),
    (
        "increased intraepithelial lymphocytes (IELs) are seen",
        "IELs",
        "intraepithelial lymphocytes",
    ),
    (
        "High-grade squamous intraepithelial lesion (HSIL; CIN 2-3)",
        "HSIL",
        "High-grade squamous intraepithelial lesion",
    ),
    (
        "with a focus of ductal carcinoma in situ (DCIS, solid type)",
        "DCIS",
        "ductal carcinoma in situ",
    ),
    ("the Gleason score (GS) is 7", "GS", "Gleason score"),
    ("lesion of the transformation zone (TZ)", "TZ", "transformation zone"),
    ("TSA (traditional serrated adenoma) of the colon", "TSA", "traditional serrated adenoma"),
    # no definition: numbers, words, a long form that does not fit
    ("twelve lymph nodes negative (0/12)", None, None),
    ("tubular adenoma (see comment)", None, None),
    ("small cell lymphoma (ML)", None, None),  # M never starts a word
    ("alpha one two three four five six seven bravo (AB)", None, None),  # too many words
    ("the HP polyp (HP)", None, None),  # the short form inside its own long form
    ("two TAs (TA)", None, None),  # starts with the short form: not a definition (pathsieve rule)
    ("carcinoma (grade 2)", None, None),
    ("(HP) at the start", None, None),
    ("benign colonic mucosa (two fragments), no dysplasia", None, None),  # no capital
]


@pytest.mark.parametrize(("text", "short", "long"), DEFINITIONS, ids=[d[0] for d in DEFINITIONS])
def test_definitions(text: str, short: str | None, long: str | None) -> None:
    found = find_definitions(text)
    if short is None:
        assert found == []
        return
    assert [(d.short, d.long) for d in found] == [(short, long)]
    d = found[0]
    assert text[d.short_start : d.short_end] == d.short
    assert text[d.long_start : d.long_end] == d.long


def test_definitions_in_a_report() -> None:
    from reports import REPORTS

    text = REPORTS["defined_abbreviation"]
    found = {(d.short, d.long) for d in find_definitions(text)}
    assert found == {("TSA", "traditional serrated adenoma"), ("IMC", "intramucosal carcinoma")}


def test_definitions_only_at_given_parentheses() -> None:
    text = "tubular adenoma (TA) and hyperplastic polyp (HP)"
    second = text.index("(HP)")
    assert [d.short for d in find_definitions(text, at=[second])] == ["HP"]
