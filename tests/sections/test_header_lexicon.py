"""The header lexicon is data: it is checked, reports file:line problems, and can be swapped."""

from __future__ import annotations

from pathlib import Path

import pytest

from pathsieve.errors import VocabError
from pathsieve.parts import find_parts
from pathsieve.records import SECTION_KINDS
from pathsieve.sections import (
    HEADER_FILE,
    HeaderLexicon,
    check_headers,
    default_lexicon,
    find_sections,
)
from pathsieve.vocab import lexicon_path

DATA = Path(__file__).parent / "data"


def test_shipped_lexicon_is_clean() -> None:
    assert check_headers(lexicon_path(HEADER_FILE)) == []


def test_shipped_lexicon_covers_every_kind_with_synonyms() -> None:
    lex = default_lexicon()
    kinds = set(lex.headers.values())
    assert kinds == set(SECTION_KINDS)
    # Several synonyms per kind, incl. British spelling and abbreviations (practice).
    for phrase, kind in [
        ("macroscopic description", "gross"),
        ("dx", "diagnosis"),
        ("hx", "clinical_history"),
        ("clin hx", "clinical_history"),
        ("micro", "microscopic"),
        ("amended diagnosis", "addendum"),
        ("revised diagnosis", "addendum"),
        ("addendum diagnosis", "addendum"),
        ("supplemental report", "addendum"),
        ("specimen(s) submitted", "other"),
        # preliminary diagnoses read like a comment: support, never overriding
        ("frozen section diagnosis", "comment"),
        ("intraoperative consultation", "comment"),
        ("cancer summary", "synoptic"),
    ]:
        assert lex.kind_of(phrase) == kind, phrase
    for kind in SECTION_KINDS:
        assert sum(1 for k in lex.headers.values() if k == kind) >= 3, kind


# (line, fragment of the message) expected from tests/sections/data/broken_headers.yaml
BROKEN = [
    (6, "unknown section kind 'diagnosys'"),
    (10, "'diagnosis' listed under both diagnosis (line 5) and gross"),
    (13, "'note' listed twice under comment (first at line 12)"),
    (14, "contains a colon"),
    (17, "'margins' listed twice (first at line 16)"),
    (19, "part keyword 'part 2' must be one word"),
    (21, "cassette header 'block summary' is not a gross header synonym"),
    (23, "type key 'histologic type' is not a synoptic key"),
    (25, "type head 'squamous carcinoma' must be one word"),
    (26, "unknown top-level key 'surprise'"),
]


def test_check_headers_reports_file_line_problems() -> None:
    path = DATA / "broken_headers.yaml"
    problems = check_headers(path)
    assert len(problems) == len(BROKEN)
    for problem, (line, fragment) in zip(problems, BROKEN, strict=True):
        assert problem.startswith(f"{path}:{line}: "), problem
        assert fragment in problem, problem


def test_loading_a_broken_lexicon_raises_vocab_error_with_location() -> None:
    path = DATA / "broken_headers.yaml"
    with pytest.raises(VocabError) as info:
        HeaderLexicon.load(path)
    err = info.value
    assert err.path == str(path)
    assert err.line == 6
    assert "unknown section kind" in str(err)
    assert str(err).startswith(f"{path}:6: ")


@pytest.mark.parametrize(
    ("content", "line", "fragment"),
    [
        ("headers: [oops\n", 2, "not valid YAML"),
        ("- just\n- a list\n", 1, "must be a mapping"),
        ("version: 1\nheaders:\n  gross: [gross]\nsynoptic_keys: []\n", 1, "'part_keywords'"),
        (
            "headers:\n  gross: gross\nsynoptic_keys: []\npart_keywords: [part]\n",
            2,
            "must be a list of strings",
        ),
        (
            "headers:\n  gross:\n    - [a, b]\nsynoptic_keys: []\npart_keywords: [part]\n",
            3,
            "plain strings",
        ),
        (
            "headers:\n  gross:\n    - ''\nsynoptic_keys: []\npart_keywords: [part]\n",
            3,
            "is empty",
        ),
        (
            "headers:\n  gross:\n    - 2nd look\nsynoptic_keys: []\npart_keywords: [part]\n",
            3,
            "must start with a letter",
        ),
        (
            "version: 2\nheaders: {}\nsynoptic_keys: []\npart_keywords: [part]\n",
            1,
            "unsupported lexicon version",
        ),
    ],
    ids=[
        "bad-yaml",
        "not-a-mapping",
        "missing-key",
        "not-a-list",
        "nested",
        "empty",
        "digit",
        "version",
    ],
)
def test_check_headers_structure_problems(
    tmp_path: Path, content: str, line: int, fragment: str
) -> None:
    path = tmp_path / "headers.yaml"
    path.write_text(content, encoding="utf-8")
    problems = check_headers(path)
    assert problems, content
    assert problems[0].startswith(f"{path}:{line}: "), problems
    assert fragment in problems[0], problems
    with pytest.raises(VocabError):
        HeaderLexicon.load(path)


def test_missing_file_is_a_vocab_error(tmp_path: Path) -> None:
    path = tmp_path / "absent.yaml"
    assert "cannot read header lexicon" in check_headers(path)[0]
    with pytest.raises(VocabError, match="cannot read"):
        HeaderLexicon.load(path)


def test_unknown_kind_in_memory_lexicon_is_rejected() -> None:
    with pytest.raises(VocabError, match="unknown section kind 'impression'"):
        HeaderLexicon({"impression": "impression"}, [], [])


def test_custom_lexicon_drives_sections_and_parts() -> None:
    lex = HeaderLexicon.load(DATA / "mini_headers.yaml")
    text = (
        "Specimen received: two vials.\nBEFUND\nVial 1: Colon, biopsy - adenoma.\n"
        "Vial 2: Rectum, biopsy - normal.\nRemark: none.\nDIAGNOSIS: not a header here\n"
    )
    sections = find_sections(text, lexicon=lex)
    assert [(s.kind, s.header) for s in sections] == [
        ("gross", "Specimen received"),
        ("diagnosis", "BEFUND"),
        ("comment", "Remark"),
    ]
    parts = find_parts(text, sections, lexicon=lex)
    assert [(p.label, p.header) for p in parts] == [
        ("1", "Vial 1: Colon, biopsy -"),
        ("2", "Vial 2: Rectum, biopsy -"),
    ]
    # The default lexicon knows "DIAGNOSIS" but not "Befund".
    assert [s.kind for s in find_sections(text)][-1] == "diagnosis"


def test_default_lexicon_follows_pathsieve_vocab(
    tmp_path: Path, monkeypatch: pytest.MonkeyPatch
) -> None:
    lexdir = tmp_path / "lexicon"
    lexdir.mkdir()
    (lexdir / HEADER_FILE).write_text(
        (DATA / "mini_headers.yaml").read_text(encoding="utf-8"), encoding="utf-8"
    )
    monkeypatch.setenv("PATHSIEVE_VOCAB", str(tmp_path))
    assert [s.kind for s in find_sections("FINDINGS\nBenign.\n")] == ["diagnosis"]
    assert default_lexicon().kind_of("gross description") is None
    monkeypatch.setenv("PATHSIEVE_VOCAB", str(tmp_path / "nowhere"))
    with pytest.raises(VocabError, match="header lexicon not found"):
        default_lexicon()
