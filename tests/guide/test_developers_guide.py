"""DEVELOPERS.md is executed, so it cannot rot.

The worked examples of section 3 are fenced blocks whose info string says what
to do with them (the words after the language are invisible when the guide is
rendered):

* ``file=PATH`` - create the file with the block's text;
* ``append=PATH`` - append the block's text (OBO stanzas after a blank line);
* ``diff=PATH`` - apply the hunks (`` `` context, ``-`` removed, ``+`` added;
  ``@@`` separates hunks; each hunk's old lines must occur exactly once);
* ``run`` - run each ``pathsieve ...`` or ``cp A B`` line in this process;
  ``run=process`` - run each line as a real process;
* ``expect=PATH`` - the CSV the commands wrote must hold these rows in these columns;
* ``problem=PATH`` - with the last hunk of the latest diff of PATH undone,
  ``pathsieve vocab check`` reports these lines;
* ``test=PATH`` - a test file; all of them run with pytest after the last step.

Everything happens in a temporary working directory holding a copy of the
vocabulary folder (``PATHSIEVE_VOCAB`` points at it; ``PATHSIEVE_CACHE`` too is
private), in the order the blocks appear in the guide.
"""

from __future__ import annotations

import contextlib
import io
import os
import re
import shlex
import shutil
import subprocess
import sys
from collections.abc import Iterator
from dataclasses import dataclass
from pathlib import Path

import pandas as pd
import pytest

from pathsieve.check import check_vocab
from pathsieve.cli import COMMANDS, main

REPO = Path(__file__).resolve().parents[2]
GUIDE = REPO / "DEVELOPERS.md"
ACTIONS = ("file", "append", "diff", "run", "expect", "problem", "test")

_FENCE_RE = re.compile(r"^```(?P<info>[^\n`]*)\n(?P<body>.*?)^```[ \t]*$", re.MULTILINE | re.DOTALL)


@dataclass(frozen=True)
class Block:
    lang: str
    action: str
    target: str
    body: str
    line: int

    def where(self) -> str:
        return f"DEVELOPERS.md:{self.line} ({self.action}={self.target})"


def guide_blocks(text: str) -> list[Block]:
    """The fenced blocks that carry an action, in document order."""
    out = []
    for m in _FENCE_RE.finditer(text):
        words = m.group("info").split()
        if len(words) < 2:
            continue
        key, _, value = words[1].partition("=")
        assert key in ACTIONS, f"unknown action {key!r} in fence {m.group('info')!r}"
        line = text.count("\n", 0, m.start()) + 1
        out.append(Block(words[0], key, value, m.group("body"), line))
    return out


def split_hunks(body: str) -> list[tuple[list[str], list[str]]]:
    """(old lines, new lines) of each hunk of a diff block."""
    hunks: list[tuple[list[str], list[str]]] = [([], [])]
    for raw in body.splitlines():
        if raw.startswith("@@"):
            hunks.append(([], []))
            continue
        tag, line = raw[:1], raw[1:]
        old, new = hunks[-1]
        assert tag in (" ", "-", "+"), f"diff line must start with ' ', '-' or '+': {raw!r}"
        if tag in (" ", "-"):
            old.append(line)
        if tag in (" ", "+"):
            new.append(line)
    return hunks


def apply_hunk(text: str, old: list[str], new: list[str], where: str) -> str:
    before, after = "\n".join(old) + "\n", "\n".join(new) + "\n"
    count = text.count(before)
    assert count == 1, f"{where}: the hunk's old lines occur {count} times in the file"
    return text.replace(before, after)


class Walkthrough:
    """Applies the guide's blocks in a working directory."""

    def __init__(self, work: Path) -> None:
        self.work = work
        self.last_diff: dict[str, list[tuple[list[str], list[str]]]] = {}
        self.tests: list[Path] = []

    def do(self, block: Block) -> None:
        getattr(self, f"_{block.action}")(block)

    def _file(self, b: Block) -> None:
        path = self.work / b.target
        assert not path.exists(), f"{b.where()}: the guide creates a file that already exists"
        path.parent.mkdir(parents=True, exist_ok=True)
        path.write_text(b.body, encoding="utf-8")

    def _append(self, b: Block) -> None:
        path = self.work / b.target
        text = path.read_text(encoding="utf-8")
        if not text.endswith("\n"):
            text += "\n"
        if b.lang == "obo":
            text += "\n"  # a stanza starts after a blank line
        path.write_text(text + b.body, encoding="utf-8")

    def _diff(self, b: Block) -> None:
        path = self.work / b.target
        text = path.read_text(encoding="utf-8")
        hunks = split_hunks(b.body)
        for old, new in hunks:
            text = apply_hunk(text, old, new, b.where())
        path.write_text(text, encoding="utf-8")
        self.last_diff[b.target] = hunks

    def _run(self, b: Block) -> None:
        for line in b.body.splitlines():
            argv = shlex.split(line, comments=True)
            if not argv:
                continue
            if argv[0] == "cp":
                assert len(argv) == 3, f"{b.where()}: cp takes two paths"
                shutil.copy(self.work / argv[1], self.work / argv[2])
                continue
            assert argv[0] == "pathsieve", f"{b.where()}: cannot run {line!r}"
            assert argv[1] in COMMANDS, f"{b.where()}: no command {argv[1]!r}"
            if b.target == "process":
                run = subprocess.run(
                    [sys.executable, "-m", "pathsieve", *argv[1:]],
                    cwd=self.work,
                    capture_output=True,
                    text=True,
                    env=os.environ.copy(),
                    timeout=300,
                )
                assert run.returncode == 0, f"{b.where()}: {line}\n{run.stderr}"
                assert "Traceback" not in run.stderr
                if argv[1:3] == ["vocab", "check"]:
                    assert run.stdout.startswith("vocab ok: "), run.stdout
            else:
                out, err = io.StringIO(), io.StringIO()
                with (
                    contextlib.chdir(self.work),
                    contextlib.redirect_stdout(out),
                    contextlib.redirect_stderr(err),
                ):
                    status = main(argv[1:])
                assert status == 0, f"{b.where()}: {line}\n{err.getvalue()}"

    def _expect(self, b: Block) -> None:
        expected = pd.read_csv(io.StringIO(b.body), dtype=str, keep_default_na=False)
        produced = pd.read_csv(self.work / b.target, dtype=str, keep_default_na=False)
        missing = set(expected.columns) - set(produced.columns)
        assert not missing, f"{b.where()}: columns {missing} not in the output"
        got = produced[list(expected.columns)]
        assert got.to_dict("records") == expected.to_dict("records"), (
            f"{b.where()}: the label table differs from the guide\n{got.to_csv(index=False)}"
        )

    def _problem(self, b: Block) -> None:
        path = self.work / b.target
        hunks = self.last_diff[b.target]
        done = path.read_text(encoding="utf-8")
        old, new = hunks[-1]
        path.write_text(apply_hunk(done, new, old, b.where()), encoding="utf-8")
        try:
            problems = check_vocab()
        finally:
            path.write_text(done, encoding="utf-8")
        for line in b.body.splitlines():
            assert f"{self.work}/{line}" in problems, f"{b.where()}: {line!r} not in {problems}"

    def _test(self, b: Block) -> None:
        path = self.work / b.target
        assert b.target.startswith("tests/") and path.name.startswith("test_"), b.where()
        path.parent.mkdir(parents=True, exist_ok=True)
        path.write_text(b.body, encoding="utf-8")
        self.tests.append(path)


class _Outcomes:
    """A pytest plugin recording the outcome of every test of a nested run."""

    def __init__(self) -> None:
        self.passed: list[str] = []
        self.failed: list[str] = []

    def pytest_runtest_logreport(self, report: pytest.TestReport) -> None:
        if report.when == "call" and report.passed:
            self.passed.append(report.nodeid)
        elif report.failed:
            self.failed.append(f"{report.nodeid}: {report.longreprtext[-1500:]}")


@pytest.fixture
def work(tmp_path: Path, monkeypatch: pytest.MonkeyPatch) -> Iterator[Path]:
    shutil.copytree(REPO / "ontology", tmp_path / "ontology")
    monkeypatch.setenv("PATHSIEVE_VOCAB", str(tmp_path / "ontology"))
    monkeypatch.setenv("PATHSIEVE_CACHE", str(tmp_path / "cache"))
    _forget_default_pipelines()
    yield tmp_path
    _forget_default_pipelines()  # never leave a pipeline built on this vocabulary behind


def _forget_default_pipelines() -> None:
    # pathsieve.read() keeps one pipeline per process; a fresh process would build it anew
    from pathsieve import pipeline

    pipeline._default_nlp.cache_clear()


def test_the_guide_has_the_worked_examples() -> None:
    blocks = guide_blocks(GUIDE.read_text(encoding="utf-8"))
    actions = {(b.action, b.target) for b in blocks}
    assert ("file", "ontology/schemes/stomach.yaml") in actions
    assert ("run", "process") in actions
    assert ("expect", "stomach_labels.csv") in actions
    for target in ("pathsieve.obo", "lexicon/abbreviations.tsv", "lexicon/triggers.tsv"):
        assert any(b.target == f"ontology/{target}" for b in blocks), target
    assert any(b.target == "ontology/lexicon/section_headers.yaml" for b in blocks)
    assert sum(b.action == "test" for b in blocks) >= 6


def test_walk_through_the_worked_examples(work: Path) -> None:
    """Every block of section 3, literally and in order; then the tests the guide shows."""
    walk = Walkthrough(work)
    for block in guide_blocks(GUIDE.read_text(encoding="utf-8")):
        walk.do(block)
    assert check_vocab() == []
    outcomes = _Outcomes()
    (work / "pytest.ini").write_text("[pytest]\n", encoding="utf-8")
    status = pytest.main(
        [
            "-q",
            "-p",
            "no:cacheprovider",
            "-p",
            "no:xdist",
            "-p",
            "no:randomly",
            "--rootdir",
            str(work),
            "-c",
            str(work / "pytest.ini"),
            *map(str, walk.tests),
        ],
        plugins=[outcomes],
    )
    assert not outcomes.failed, "\n".join(outcomes.failed)
    assert status == 0 and len(outcomes.passed) >= 15, (status, outcomes.passed)


# ----------------------------------------------------------------- what the prose claims


def test_named_files_exist() -> None:
    """Every module, script and vocabulary file the guide names exists."""
    text = GUIDE.read_text(encoding="utf-8")
    roots = [REPO, REPO / "src" / "pathsieve", REPO / "src" / "pathsieve" / "values"]
    roots += [REPO / "ontology", REPO / "ontology" / "lexicon", REPO / "benchmarks"]
    created = {b.target for b in guide_blocks(text) if b.action in ("file", "test")}
    names = set(re.findall(r"[\w./<>-]+\.py\b", text))
    names |= set(re.findall(r"`([\w./<>-]+\.(?:yaml|tsv|txt|obo|md))`", text))
    checked = []
    for name in sorted(names):
        if "<" in name or name in created or name.startswith(("my_", "stomach")):
            continue
        assert any((root / name).exists() for root in roots), f"DEVELOPERS.md names {name}"
        checked.append(name)
    assert len(checked) >= 45, checked


def test_test_areas_and_stage_components() -> None:
    from spacy.language import Language

    import pathsieve.pipeline  # noqa: F401  (registers the components)

    text = GUIDE.read_text(encoding="utf-8")
    areas = sorted(p.name for p in (REPO / "tests").iterdir() if p.is_dir() and p.name[0] != ".")
    listed = re.search(r"Tests live in `tests/<area>/test_<thing>.py`: (.*?)\. Markers", text, re.S)
    assert listed is not None
    listed_areas = sorted(re.findall(r"`(\w+)`", listed.group(1)))
    assert listed_areas == [a for a in areas if a != "__pycache__"], (
        "the test areas changed: update the list in DEVELOPERS.md section 5"
    )
    components = [f for f in Language.factories if f.startswith("pathsieve_")]
    assert "six registered components" in text and len(components) == 6
    assert "vocab check" in (REPO / "Makefile").read_text(encoding="utf-8")


# ----------------------------------------------------------------- section 7, pinned


@pytest.mark.xfail(
    strict=True,
    raises=AssertionError,
    reason="known limitation (DEVELOPERS.md section 7): once this passes, update that section",
)
def test_a_sense_without_concept_keeps_its_section() -> None:
    from pathsieve.abbreviations import AbbreviationDictionary
    from pathsieve.matcher import ConceptMatcher
    from pathsieve.ontology import load_ontology

    senses = AbbreviationDictionary.from_rows(
        [
            ("IM", "intestinal metaplasia", "PSV:0000355", "diagnosis,microscopic,comment", "yes"),
            ("IM", "intramuscular", "", "clinical_history", "yes"),
        ]
    )
    text = (
        "CLINICAL HISTORY: Vitamin B12 given IM.\n"
        "FINAL DIAGNOSIS: Stomach, antrum, biopsy: chronic gastritis with focal IM.\n"
    )
    history_end = text.index("FINAL")
    matcher = ConceptMatcher(load_ontology(REPO / "ontology" / "pathsieve.obo"), senses)
    found = matcher.find(
        text, section_at=lambda at: "clinical_history" if at < history_end else "diagnosis"
    )
    assert [m.start > history_end for m in found if m.text == "IM"] == [True]


@pytest.mark.xfail(
    strict=True,
    raises=AssertionError,
    reason="known limitation (DEVELOPERS.md sections 4 and 7): once this passes, update them",
)
@pytest.mark.parametrize("header", ["diagnóstico", "größe der probe"])
def test_non_ascii_header_synonyms(tmp_path: Path, header: str) -> None:
    from pathsieve.sections import check_headers

    text = (REPO / "ontology" / "lexicon" / "section_headers.yaml").read_text(encoding="utf-8")
    lexicon = tmp_path / "section_headers.yaml"
    lexicon.write_text(
        text.replace("  diagnosis:\n", f"  diagnosis:\n    - {header}\n", 1), "utf-8"
    )
    assert check_headers(lexicon) == []
