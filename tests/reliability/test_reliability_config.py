"""Bad configuration: one clear line on stderr, a non-zero exit, nothing written.

Each case runs ``pathsieve label`` in its own subprocess (all started at once,
then checked one by one) in a fresh folder holding only the input: a broken or
missing scheme, an unknown scheme name, a missing or corrupt ontology, an
output that cannot be written, bad option values.  The folder must hold
exactly what it held before: no table, no ``.partial``, no manifest, no parts.
"""

from __future__ import annotations

import os
import shutil
import subprocess
import sys
from dataclasses import dataclass
from pathlib import Path

import pytest

REPO = Path(__file__).resolve().parents[2]
REPORTS = "case_id,text\nC1,DIAGNOSIS: Sigmoid colon: tubular adenoma.\nC2,DIAGNOSIS: Rectum: adenocarcinoma.\n"


def _unwritable(work: Path) -> Path:
    """A folder this process cannot write into (root may write anywhere but /proc)."""
    if os.geteuid() == 0:
        return Path("/proc")
    ro = work / "read-only"
    ro.mkdir()
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


@pytest.fixture(scope="module")
def runs(tmp_path_factory: pytest.TempPathFactory) -> dict[str, tuple[int, str, Path, set[str]]]:
    """Every case, run in parallel: (exit code, stderr, folder, what the folder held before)."""
    started = {}
    for case in CASES:
        work = tmp_path_factory.mktemp(case.name)
        (work / "reports.csv").write_text(REPORTS, encoding="utf-8")
        env = _setup(case, work)
        ro = _unwritable(work)
        before = {p.name for p in work.iterdir()}
        args = [a.format(work=work, ro=ro) for a in case.args]
        source = str(work / "reports.csv")
        if "--input-override" in args:
            i = args.index("--input-override")
            source = args[i + 1]
            del args[i : i + 2]
        argv = [sys.executable, "-m", "pathsieve", "label", source, *args, "--workers", "1"]
        proc = subprocess.Popen(
            argv, env=env, cwd=work, stdout=subprocess.PIPE, stderr=subprocess.PIPE, text=True
        )
        started[case.name] = (proc, work, before)
    out = {}
    for name, (proc, work, before) in started.items():
        _, err = proc.communicate(timeout=300)
        out[name] = (proc.returncode, err, work, before)
    return out


@pytest.mark.parametrize("case", CASES, ids=[c.name for c in CASES])
def test_bad_configuration_is_one_line_and_writes_nothing(
    runs: dict[str, tuple[int, str, Path, set[str]]], case: Case
) -> None:
    code, err, work, before = runs[case.name]
    lines = err.strip().splitlines()
    assert code == 1, err
    assert len(lines) == 1, err  # one line, no traceback
    assert lines[0].startswith("pathsieve: error: "), err
    assert case.expect in lines[0], err
    assert {p.name for p in work.iterdir()} == before  # nothing written
    ro = _unwritable_path(work)
    if ro is not None:
        assert not any(p.name.startswith("pathsieve-") for p in ro.iterdir())


def _unwritable_path(work: Path) -> Path | None:
    ro = work / "read-only"
    return ro if ro.is_dir() else None
