"""``pathsieve vocab check`` covers every vocabulary data file and names file and line.

Each case copies the shipped vocabulary folder into a temporary directory, breaks
one file in one realistic way, points ``PATHSIEVE_VOCAB`` at the copy and checks
that the one command fails with ``file:line`` of the broken line.  The line is
found in the broken file itself (never written down here), so the cases keep
working when the shipped files grow.
"""

from __future__ import annotations

import shutil
from collections.abc import Iterator
from pathlib import Path

import pytest

from pathsieve.check import ABBREVIATIONS_FILE, LEXICON_CHECKS, check_vocab, vocab_report
from pathsieve.cli import main

REPO = Path(__file__).resolve().parents[2]
VOCAB = REPO / "ontology"
TAB = "\t"


@pytest.fixture(scope="session")
def ontology_cache(tmp_path_factory: pytest.TempPathFactory) -> Path:
    # one compiled-ontology cache for the session: an unchanged OBO is parsed once
    return tmp_path_factory.mktemp("ontology-cache")


@pytest.fixture
def vocab(tmp_path: Path, ontology_cache: Path, monkeypatch: pytest.MonkeyPatch) -> Iterator[Path]:
    """A private copy of the vocabulary folder, active through PATHSIEVE_VOCAB."""
    copy = tmp_path / "ontology"
    shutil.copytree(VOCAB, copy)
    monkeypatch.setenv("PATHSIEVE_VOCAB", str(copy))
    monkeypatch.setenv("PATHSIEVE_CACHE", str(ontology_cache))
    yield copy


def line_of(path: Path, needle: str) -> int:
    """1-based number of the first line of ``path`` that contains ``needle``."""
    for n, line in enumerate(path.read_text(encoding="utf-8").splitlines(), 1):
        if needle in line:
            return n
    raise AssertionError(f"{needle!r} not in {path}")


def break_file(path: Path, old: str | None, new: str) -> None:
    """Replace the first ``old`` with ``new``; with ``old=None`` append ``new``."""
    text = path.read_text(encoding="utf-8")
    if old is None:
        text = text + ("" if text.endswith("\n") else "\n") + new
    else:
        assert old in text, f"{old!r} not in {path}: update this case"
        text = text.replace(old, new, 1)
    path.write_text(text, encoding="utf-8")


def test_shipped_vocabulary_is_sound() -> None:
    report = vocab_report(VOCAB)
    assert report.problems == []
    assert report.schemes == ["breast", "cervix", "colorectal", "duodenum", "lung", "prostate"]
    assert report.summary().startswith("vocab ok: ")


def test_every_vocabulary_file_has_a_checker() -> None:
    """A file added to ontology/ without a checker fails here (and must get one)."""
    covered = {"pathsieve.obo", f"lexicon/{ABBREVIATIONS_FILE}"}
    covered |= {f"lexicon/{name}" for name, _, _ in LEXICON_CHECKS}
    covered |= {f"schemes/{p.name}" for p in (VOCAB / "schemes").glob("*.yaml")}
    present = {p.relative_to(VOCAB).as_posix() for p in VOCAB.rglob("*") if p.is_file()}
    assert present == covered
    report = vocab_report(VOCAB)
    assert sorted(report.lexicons) == sorted(
        [ABBREVIATIONS_FILE, *(name for name, _, _ in LEXICON_CHECKS)]
    )


# One case per way a file breaks; a case may break several lines of ONE file, and every
# problem must be reported.  (case id, file under the vocabulary folder,
# edits: (text to replace, or None to append; new text),
# expected: (a string on the line the problem must name, a fragment of the message))
Edit = tuple[str | None, str]
Expected = tuple[str, str]
BREAKS: list[tuple[str, str, list[Edit], list[Expected]]] = [
    (
        "obo-syntax",
        "pathsieve.obo",
        [
            (
                'synonym: "chronic active gastritis" EXACT []',
                'synonym: "chronic active gastritis" EXCAT []',
            ),
            ('synonym: "goblet cell metaplasia" EXACT []', "synonym: goblet cell metaplasia"),
        ],
        [
            ('"chronic active gastritis" EXCAT', "invalid synonym scope: EXCAT"),
            ("synonym: goblet cell metaplasia", "malformed synonym"),
        ],
    ),
    (
        "obo-dangling-is-a",
        "pathsieve.obo",
        [(None, "[Term]\nid: PSV:0000990\nname: gastric xanthoma\nis_a: PSV:0009999 ! nowhere\n")],
        [("is_a: PSV:0009999", "PSV:0009999, which is not defined")],
    ),
    (
        "obo-synonym-on-two-concepts",
        "pathsieve.obo",
        [
            (
                None,
                "[Term]\nid: PSV:0000993\nname: gastric xanthoma\n"
                'synonym: "chronic gastritis" EXACT []\nis_a: PSV:0000001 ! disease or finding\n',
            )
        ],
        [('synonym: "chronic gastritis" EXACT []', "'chronic gastritis' belongs to")],
    ),
    (
        "scheme-yaml-syntax",
        "schemes/duodenum.yaml",
        [("  villous_atrophy:\n    description:", "  villous_atrophy:\n\tdescription:")],
        [("\tdescription:", "not valid YAML")],
    ),
    (
        "scheme-content",
        "schemes/duodenum.yaml",
        [
            ("- PSV:0000249  # celiac disease", "- PSV:0999999  # celiac disease"),
            ("\nscheme: duodenum\n", "\nscheme: small_bowel\n"),
            (
                "\nvalues: [marsh_grade",
                "  normal:\n    classes: [PSV:0000193]\n\nvalues: [marsh_grade",
            ),
        ],
        [
            ("PSV:0999999", "not in the ontology"),
            ("scheme: small_bowel", "differs from the file name"),
            ("  normal:", "key 'labels.normal' written twice"),
        ],
    ),
    (
        "scheme-label-key-is-a-column",
        "schemes/duodenum.yaml",
        [
            (
                "  crypt_hyperplasia:\n",
                "  status:\n    classes: [PSV:0000256]\n  crypt_hyperplasia:\n",
            )
        ],
        [("  status:", "fixed or value column"), ("severity: [", "severity does not list status")],
    ),
    (
        "abbreviations",
        "lexicon/abbreviations.tsv",
        [
            (None, f"GXZ{TAB}gastric xanthoma{TAB}*{TAB}no\n"),
            (None, f"GXY{TAB}gastric xanthoma{TAB}PSV:0999999{TAB}*{TAB}no\n"),
            (None, f"IM{TAB}intestinal metaplasia{TAB}PSV:0000355{TAB}stomach{TAB}yes\n"),
            (None, f"GXX{TAB}gastric xanthoma{TAB}{TAB}*{TAB}maybe\n"),
        ],
        [
            ("GXZ", "expected 5 tab-separated columns"),
            ("GXY", "unknown concept id 'PSV:0999999'"),
            ("IM\tintestinal", "unknown context 'stomach'"),
            ("GXX", "bad case_sensitive value 'maybe'"),
        ],
    ),
    (
        "triggers",
        "lexicon/triggers.tsv",
        [
            (None, f"indicative of{TAB}probable{TAB}forward{TAB}-\n"),
            (None, f"in keeping with{TAB}likely{TAB}forward{TAB}few\n"),
            (None, f"suggestive of{TAB}likely{TAB}forward{TAB}-\n"),
        ],
        [
            ("indicative of\tprobable", "unknown category 'probable'"),
            ("in keeping with\tlikely\tforward\tfew", "bad scope 'few'"),
            ("suggestive of\tlikely", "conflicting trigger 'suggestive of'"),
        ],
    ),
    (
        "section-headers",
        "lexicon/section_headers.yaml",
        [
            ("synoptic_keys:", "  impression:\n    - endoscopic impression\n\nsynoptic_keys:"),
            ("  clinical_history:\n", "  clinical_history:\n    - final diagnosis\n"),
        ],
        [
            ("  impression:", "unknown section kind 'impression'"),
            ("    - final diagnosis", "listed under both diagnosis"),
        ],
    ),
    (
        "values",
        "lexicon/values.yaml",
        [("  units: {zero: 0,", "  units: {Zero: 0,")],
        [("{Zero: 0,", "must be written in lower case")],
    ),
    (
        "common-words",
        "lexicon/common_words.txt",
        [(None, "Gastric mucosa\n")],
        [("Gastric mucosa", "bad word 'Gastric mucosa'")],
    ),
]


@pytest.mark.parametrize(
    ("relpath", "edits", "expected"),
    [case[1:] for case in BREAKS],
    ids=[case[0] for case in BREAKS],
)
def test_a_broken_file_fails_with_file_and_line(
    vocab: Path, relpath: str, edits: list[Edit], expected: list[Expected]
) -> None:
    path = vocab / relpath
    for old, new in edits:
        break_file(path, old, new)
    problems = check_vocab()
    text = path.read_text(encoding="utf-8").splitlines()
    for needle, fragment in expected:
        # the problem names a line holding the needle (a wording listed twice may be
        # reported at either listing)
        lines = [n for n, t in enumerate(text, 1) if needle in t]
        assert lines, f"{needle!r} not found after breaking {relpath}"
        located = [p for p in problems if p.startswith(f"{path}:") and fragment in p]
        assert any(p.startswith(f"{path}:{n}: ") for p in located for n in lines), (
            fragment,
            lines,
            problems,
        )


def test_terms_beyond_the_ontology_checker(vocab: Path) -> None:
    """No name, isolated, an ABBREVIATION synonym with no row or shadowed by other senses."""
    obo = vocab / "pathsieve.obo"
    break_file(
        obo,
        None,
        '\n[Term]\nid: PSV:0000991\nsynonym: "gastric xanthoma" EXACT []\n'
        "is_a: PSV:0000001 ! disease or finding\n"
        "\n[Term]\nid: PSV:0000992\nname: gastric lipid island\n"
        "\n[Term]\nid: PSV:0000994\nname: gastric siderosis\n"
        'synonym: "GSZ" EXACT ABBREVIATION []\nis_a: PSV:0000001 ! disease or finding\n'
        # the dictionary lists HP with two other senses only: this synonym would be shadowed
        "\n[Term]\nid: PSV:0000995\nname: gastric fundic cyst\n"
        'synonym: "HP" EXACT ABBREVIATION []\nis_a: PSV:0000001 ! disease or finding\n',
    )
    problems = check_vocab()
    for needle, fragment in [
        ("id: PSV:0000991", "[Term] PSV:0000991 has no name"),
        ("id: PSV:0000992", "[Term] PSV:0000992 is isolated"),
        ('"GSZ" EXACT ABBREVIATION', "has no row for 'GSZ'"),
        ('"HP" EXACT ABBREVIATION', "so this synonym is never read"),
    ]:
        line = line_of(obo, needle)
        assert any(p.startswith(f"{obo}:{line}: ") and fragment in p for p in problems), (
            needle,
            problems,
        )


def test_missing_files_are_named(vocab: Path) -> None:
    lexicons = [ABBREVIATIONS_FILE, *(name for name, _, _ in LEXICON_CHECKS)]
    for name in lexicons:
        (vocab / "lexicon" / name).unlink()
    problems = check_vocab()
    for name in lexicons:
        path = vocab / "lexicon" / name
        assert any(p.startswith(f"{path}: ") for p in problems), (name, problems)
    (vocab / "pathsieve.obo").unlink()
    assert any(p.startswith(f"{vocab / 'pathsieve.obo'}: ") for p in check_vocab())


def test_missing_or_misnamed_scheme_files(vocab: Path) -> None:
    (vocab / "schemes" / "lung.yaml").rename(vocab / "schemes" / "lung.yml")
    problems = check_vocab()
    assert any(p.startswith(f"{vocab / 'schemes' / 'lung.yml'}: ") for p in problems), problems
    shutil.rmtree(vocab / "schemes")
    assert any("schemes folder not found" in p for p in check_vocab())


def test_several_broken_files_are_all_reported(vocab: Path) -> None:
    """One run lists every problem, even with a broken ontology (lexicons need no ontology)."""
    obo = vocab / "pathsieve.obo"
    triggers = vocab / "lexicon" / "triggers.tsv"
    words = vocab / "lexicon" / "common_words.txt"
    break_file(obo, "[Term]\nid: PSV:0000002\n", "[Trem]\nid: PSV:0000002\n")
    break_file(triggers, None, f"indicative of{TAB}probable{TAB}forward{TAB}-\n")
    break_file(words, None, "Gastric\n")
    report = vocab_report()
    assert any(p.startswith(f"{obo}:{line_of(obo, '[Trem]')}: ") for p in report.problems), (
        report.problems
    )
    line = line_of(triggers, "indicative of\tprobable")
    assert any(p.startswith(f"{triggers}:{line}: ") for p in report.problems), report.problems
    line = line_of(words, "Gastric")
    assert any(p.startswith(f"{words}:{line}: ") for p in report.problems), report.problems
    assert report.notes and "once the ontology problems are fixed" in report.notes[0]


def test_an_outside_scheme_file_is_checked_against_the_vocabulary(
    vocab: Path, tmp_path: Path
) -> None:
    mine = tmp_path / "my_duodenum.yaml"
    text = (vocab / "schemes" / "duodenum.yaml").read_text(encoding="utf-8")
    mine.write_text(text.replace("PSV:0000256", "PSV:0888888"), encoding="utf-8")
    problems = check_vocab(schemes=[mine])
    assert [p for p in problems if p.startswith(f"{mine}:{line_of(mine, 'PSV:0888888')}: ")]
    # the scheme name of a copy kept outside the folder may stay "duodenum"
    assert not [p for p in problems if "differs from the file name" in p]


def test_the_command_line(vocab: Path, tmp_path: Path, capsys: pytest.CaptureFixture[str]) -> None:
    assert main(["vocab", "check"]) == 0
    out = capsys.readouterr().out
    assert out.startswith("vocab ok: ") and str(vocab) in out
    triggers = vocab / "lexicon" / "triggers.tsv"
    break_file(triggers, None, f"indicative of{TAB}probable{TAB}forward{TAB}-\n")
    assert main(["vocab", "check"]) == 1
    err = capsys.readouterr().err
    line = line_of(triggers, "indicative of\tprobable")
    assert f"{triggers}:{line}: unknown category 'probable'" in err
    assert err.rstrip().endswith(f"vocab check: 1 problem(s) in {vocab}")
    # --vocab wins over the environment
    assert main(["vocab", "check", "--vocab", str(VOCAB)]) == 0
    assert main(["vocab", "check", "--vocab", str(tmp_path / "nowhere")]) == 1
    assert "vocabulary folder not found" in capsys.readouterr().err
