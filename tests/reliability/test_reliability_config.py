"""Bad configuration: one clear line on stderr, a non-zero exit, nothing written.

Each case runs ``pathsieve label`` in a fresh folder holding only the input: a
broken or missing scheme, an unknown scheme name, a missing or corrupt
ontology, an output that cannot be written, bad option values.  The folder
must hold exactly what it held before: no table, no ``.partial``, no manifest,
no parts.  Every case runs through the command's ``main``; four of them also
run as real processes (started at once), so exit status and stderr are those
a shell sees.
"""

from __future__ import annotations

import os
import shutil
import subprocess
import sys
from dataclasses import dataclass
from pathlib import Path

import pytest

from pathsieve.cli import main

REPO = Path(__file__).resolve().parents[2]
REPORTS = "case_id,text\nC1,DIAGNOSIS: Sigmoid colon: tubular adenoma.\nC2,DIAGNOSIS: Rectum: adenocarcinoma.\n"


def _unwritable(work: Path) -> Path:
    """A folder this process cannot write into (root may write anywhere but /proc)."""
    if os.geteuid() == 0:
        return Path("/proc")
    ro = work / "read-only"
    ro.mkdir(exist_ok=True)
    ro.chmod(0o500)
    return ro


@dataclass
class Case:
    name: str
    args: list[str]  # after `pathsieve label reports.csv`; {work}, {ro} are filled in
    expect: str  # a piece of the one error line
    env: dict[str, str] | None = None
    setup: str = ""


CASES = [
    Case("unknown-scheme", ["--scheme", "stomachs", "-o", "{work}/out.csv"], "unknown scheme 'stomachs'"),
    Case("missing-scheme-file", ["--scheme", "{work}/nope.yaml", "-o", "{work}/out.csv"], "scheme file not found"),
    Case("scheme-not-yaml", ["--scheme", "{work}/broken.yaml", "-o", "{work}/out.csv"], "broken.yaml", setup="broken-yaml"),
    Case("scheme-unknown-class", ["--scheme", "{work}/unknown.yaml", "-o", "{work}/out.csv"], "PSV:9999999", setup="unknown-class"),
    Case("ontology-missing", ["--scheme", "colorectal", "-o", "{work}/out.csv"], "ontology file not found", setup="vocab-no-obo"),
    Case("ontology-corrupt", ["--scheme", "colorectal", "-o", "{work}/out.csv"], "pathsieve.obo", setup="vocab-bad-obo"),
    Case("output-folder-missing", ["--scheme", "colorectal", "-o", "{work}/no/such/out.csv"], "does not exist"),
    Case("output-unwritable", ["--scheme", "colorectal", "-o", "{ro}/pathsieve-out.csv"], "pathsieve-out.csv"),
    Case("evidence-unwritable", ["--scheme", "colorectal", "-o", "{work}/out.csv", "--evidence", "{ro}/pathsieve-ev.jsonl"], "pathsieve-ev.jsonl"),
    Case("output-suffix", ["--scheme", "colorectal", "-o", "{work}/out.txt"], "must end in"),
    Case("output-is-a-folder", ["--scheme", "colorectal", "-o", "{work}/folder.csv"], "is a folder", setup="folder"),
    Case("evidence-same-as-output", ["--scheme", "colorectal", "-o", "{work}/out.csv", "--evidence", "{work}/out.csv"], "different file"),
    Case("input-missing", ["--scheme", "colorectal", "-o", "{work}/out.csv", "--input-override", "{work}/none.csv"], "input not found"),
    Case("text-column-missing", ["--scheme", "colorectal", "-o", "{work}/out.csv", "--text-col", "report"], "column 'report' not found"),
    Case("negative-budget", ["--scheme", "colorectal", "-o", "{work}/out.csv", "--time-budget", "-1"], "--time-budget"),
    Case("zero-chunk-rows", ["--scheme", "colorectal", "-o", "{work}/out.csv", "--chunk-rows", "0"], "--chunk-rows"),
    Case("scheduler-without-dask", ["--scheme", "colorectal", "-o", "{work}/out.csv", "--scheduler", "tcp://127.0.0.1:1"], "--scheduler needs --engine dask"),
]  # fmt: skip


def _setup(case: Case, work: Path) -> dict[str, str]:
    env = dict(os.environ)
    env["PATHSIEVE_CACHE"] = str(work.parent / f"{work.name}-cache")  # caches live elsewhere
    if case.setup == "broken-yaml":
        (work / "broken.yaml").write_text("scheme: x\nlabels: [unclosed\n")
    elif case.setup == "unknown-class":
        text = (REPO / "ontology" / "schemes" / "colorectal.yaml").read_text()
        first = text.index("PSV:")
        (work / "unknown.yaml").write_text(text[:first] + "PSV:9999999" + text[first + 11 :])
    elif case.setup.startswith("vocab"):
        vocab = work.parent / f"{work.name}-vocab"
        shutil.copytree(REPO / "ontology", vocab)
        obo = vocab / "pathsieve.obo"
        if case.setup == "vocab-no-obo":
            obo.unlink()
        else:
            obo.write_text(
                obo.read_text()[:5000] + "\n[Term]\nid: PSV:0000001\nis_a: PSV:nowhere\n"
            )
        env["PATHSIEVE_VOCAB"] = str(vocab)
    elif case.setup == "folder":
        (work / "folder.csv").mkdir()
    return env


def _argv(case: Case, work: Path) -> list[str]:
    ro = _unwritable(work)
    args = [a.format(work=work, ro=ro) for a in case.args]
    source = str(work / "reports.csv")
    if "--input-override" in args:
        i = args.index("--input-override")
        source = args[i + 1]
        del args[i : i + 2]
    return ["label", source, *args, "--workers", "1"]


def _prepare(case: Case, root: Path) -> tuple[Path, dict[str, str], set[str]]:
    work = root / case.name
    work.mkdir()
    (work / "reports.csv").write_text(REPORTS, encoding="utf-8")
    env = _setup(case, work)
    _unwritable(work)
    return work, env, {p.name for p in work.iterdir()}


def _check(case: Case, code: int, err: str, work: Path, before: set[str]) -> None:
    lines = err.strip().splitlines()
    assert code == 1, err
    assert len(lines) == 1, err  # one line, no traceback
    assert lines[0].startswith("pathsieve: error: "), err
    assert case.expect in lines[0], err
    assert {p.name for p in work.iterdir()} == before  # nothing written
    ro = work / "read-only"
    if ro.is_dir():
        assert not any(ro.iterdir())


@pytest.mark.parametrize("case", CASES, ids=[c.name for c in CASES])
def test_bad_configuration_is_one_line_and_writes_nothing(
    case: Case,
    tmp_path: Path,
    monkeypatch: pytest.MonkeyPatch,
    capsys: pytest.CaptureFixture[str],
) -> None:
    """The command as a notebook or a job runner calls it: ``pathsieve.cli.main``."""
    work, env, before = _prepare(case, tmp_path)
    for key in ("PATHSIEVE_VOCAB", "PATHSIEVE_CACHE"):
        if key in env:
            monkeypatch.setenv(key, env[key])
    monkeypatch.chdir(work)
    code = main(_argv(case, work))
    captured = capsys.readouterr()
    assert captured.out == ""
    _check(case, code, captured.err, work, before)


SUBPROCESS = ["unknown-scheme", "ontology-corrupt", "output-unwritable", "text-column-missing"]


def test_bad_configuration_in_a_real_process(tmp_path: Path) -> None:
    """The same through the installed entry point, in processes of their own (run at once)."""
    started = []
    for case in (c for c in CASES if c.name in SUBPROCESS):
        work, env, before = _prepare(case, tmp_path)
        argv = [sys.executable, "-m", "pathsieve", *_argv(case, work)]
        proc = subprocess.Popen(
            argv, env=env, cwd=work, stdout=subprocess.PIPE, stderr=subprocess.PIPE, text=True
        )
        started.append((case, proc, work, before))
    for case, proc, work, before in started:
        out, err = proc.communicate(timeout=300)
        assert out == ""
        _check(case, proc.returncode, err, work, before)
