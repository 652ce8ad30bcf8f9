"""Atomic outputs and ``--resume``: a killed run never leaves a table that looks
complete, and resuming it gives, byte for byte, what an uninterrupted run gives.

The headline test runs ``pathsieve label`` in a subprocess, SIGKILLs its whole
process group once the manifest shows a completed chunk, and resumes.  The
others interrupt a run in-process (an exception raised when chunk N is
labelled) to check each rule of the manifest quickly.
"""

from __future__ import annotations

import json
import os
import signal
import subprocess
import sys
import time
from collections.abc import Callable
from pathlib import Path
from typing import Any

import pandas as pd
import pytest

import pathsieve.runner as runner
from pathsieve import Labeler
from pathsieve.cli import main
from pathsieve.errors import ConfigError, InputError
from pathsieve.resume import ChunkStore, notice_path, store_paths
from pathsieve.runner import LabelOptions, label_file

CHUNK = 4


@pytest.fixture
def labeler(colorectal: Labeler) -> Labeler:
    return colorectal


@pytest.fixture(scope="module")
def export(tmp_path_factory: pytest.TempPathFactory, make_reports: Callable[..., Any]) -> Path:
    path = tmp_path_factory.mktemp("resume") / "reports.csv"
    make_reports(30).to_csv(path, index=False)
    return path


class Interrupt(KeyboardInterrupt):
    """What a Ctrl-C (or any crash) in the middle of a run raises."""


def _interrupt_at(monkeypatch: pytest.MonkeyPatch, n: int) -> None:
    """Make the n-th chunk (1-based) of the next run raise before it is written."""
    real = runner.label_chunk
    calls = {"n": 0}

    def flaky(*args: Any, **kwargs: Any) -> Any:
        calls["n"] += 1
        if calls["n"] == n:
            raise Interrupt
        return real(*args, **kwargs)

    monkeypatch.setattr(runner, "label_chunk", flaky)


def _run(src: Path, out: Path, ev: Path | None, labeler: Labeler, **kw: Any) -> runner.RunSummary:
    opts = kw.pop("options", LabelOptions("colorectal"))
    return label_file(
        src, out, opts, evidence_path=ev, workers=1, chunk_rows=CHUNK, labeler=labeler, **kw
    )


def _leftovers(folder: Path) -> set[str]:
    return {p.name for p in folder.iterdir()}


@pytest.mark.parametrize(("fmt", "ev_fmt"), [(".csv", ".jsonl"), (".parquet", ".parquet")])
def test_interrupted_then_resumed_equals_uninterrupted(
    tmp_path: Path,
    export: Path,
    labeler: Labeler,
    monkeypatch: pytest.MonkeyPatch,
    fmt: str,
    ev_fmt: str,
) -> None:
    ref, ref_ev = tmp_path / f"ref{fmt}", tmp_path / f"ref_ev{ev_fmt}"
    full = _run(export, ref, ref_ev, labeler)
    out, ev = tmp_path / f"out{fmt}", tmp_path / f"ev{ev_fmt}"
    _interrupt_at(monkeypatch, 4)  # three chunks done, the fourth interrupted
    with pytest.raises(Interrupt):
        _run(export, out, ev, labeler)
    # no table that looks complete; the parts and the manifest wait for --resume
    assert not out.exists() and not ev.exists()
    manifest, parts = store_paths(out)
    assert len(json.loads(manifest.read_text())["chunks"]) == 3
    assert len([p for p in parts.iterdir() if p.suffix == fmt]) == 3
    monkeypatch.undo()
    resumed = _run(export, out, ev, labeler, resume=True)
    assert out.read_bytes() == ref.read_bytes()
    assert ev.read_bytes() == ref_ev.read_bytes()
    assert resumed.text() == full.text()  # the whole run's counts, not just the rest
    assert _leftovers(tmp_path) == {ref.name, ref_ev.name, out.name, ev.name} | {
        notice_path(ref_ev).name,
        notice_path(ev).name,
    }


def test_resume_skips_completed_chunks(
    tmp_path: Path, export: Path, labeler: Labeler, monkeypatch: pytest.MonkeyPatch
) -> None:
    out = tmp_path / "out.csv"
    _interrupt_at(monkeypatch, 5)
    with pytest.raises(Interrupt):
        _run(export, out, None, labeler)
    monkeypatch.undo()
    labelled: list[int] = []
    real = runner.label_chunk

    def counting(lab: Labeler, opts: LabelOptions, records: Any) -> Any:
        records = list(records)
        labelled.append(len(records))
        return real(lab, opts, records)

    monkeypatch.setattr(runner, "label_chunk", counting)
    _run(export, out, None, labeler, resume=True)
    # 30 rows in chunks of 4: 8 chunks, 4 already done
    assert labelled == [4, 4, 4, 2]
    assert len(pd.read_csv(out)) == 30


def test_old_output_stays_until_the_new_one_is_complete(
    tmp_path: Path, export: Path, labeler: Labeler, monkeypatch: pytest.MonkeyPatch
) -> None:
    out = tmp_path / "out.csv"
    out.write_text("an earlier, complete table\n")
    _interrupt_at(monkeypatch, 2)
    with pytest.raises(Interrupt):
        _run(export, out, None, labeler)
    assert out.read_text() == "an earlier, complete table\n"


def test_without_resume_an_interrupted_run_starts_over(
    tmp_path: Path,
    export: Path,
    labeler: Labeler,
    monkeypatch: pytest.MonkeyPatch,
    capsys: pytest.CaptureFixture[str],
) -> None:
    out = tmp_path / "out.csv"
    _interrupt_at(monkeypatch, 3)
    with pytest.raises(Interrupt):
        _run(export, out, None, labeler)
    monkeypatch.undo()
    _run(export, out, None, labeler)
    assert "2 finished chunk(s)" in capsys.readouterr().err
    assert len(pd.read_csv(out)) == 30
    assert _leftovers(tmp_path) == {"out.csv"}


@pytest.mark.parametrize(
    ("change", "named"),
    [
        ("input", "input"),
        ("options", "options"),
        ("chunk_rows", "chunk_rows"),
        ("evidence", "evidence"),
    ],
)
def test_resume_refuses_a_different_run(
    tmp_path: Path,
    export: Path,
    labeler: Labeler,
    monkeypatch: pytest.MonkeyPatch,
    change: str,
    named: str,
) -> None:
    src = tmp_path / "reports.csv"
    src.write_bytes(export.read_bytes())
    out = tmp_path / "out.csv"
    _interrupt_at(monkeypatch, 3)
    with pytest.raises(Interrupt):
        _run(src, out, None, labeler)
    monkeypatch.undo()
    kw: dict[str, Any] = {"resume": True}
    ev = None
    if change == "input":
        with src.open("a") as fh:
            fh.write("RL-new,DIAGNOSIS: adenoma.\n")
    elif change == "options":
        kw["options"] = LabelOptions("colorectal", states=True)
    elif change == "evidence":
        ev = tmp_path / "ev.jsonl"
    with pytest.raises(ConfigError, match=f"--resume: .*{named}.* changed"):
        if change == "chunk_rows":
            label_file(
                src, out, LabelOptions("colorectal"), chunk_rows=5, labeler=labeler, resume=True
            )
        else:
            _run(src, out, ev, labeler, **kw)
    assert not out.exists()


def test_damaged_part_is_refused(
    tmp_path: Path, export: Path, labeler: Labeler, monkeypatch: pytest.MonkeyPatch
) -> None:
    out = tmp_path / "out.csv"
    _interrupt_at(monkeypatch, 3)
    with pytest.raises(Interrupt):
        _run(export, out, None, labeler)
    monkeypatch.undo()
    part = sorted(store_paths(out)[1].glob("*.csv"))[1]
    part.write_bytes(part.read_bytes()[:-10])  # a torn write
    with pytest.raises(ConfigError, match="missing or damaged"):
        _run(export, out, None, labeler, resume=True)


def test_half_written_part_is_discarded(
    tmp_path: Path, export: Path, labeler: Labeler, monkeypatch: pytest.MonkeyPatch
) -> None:
    """A part written but not yet in the manifest (killed in between) is redone."""
    out = tmp_path / "out.csv"
    ref = tmp_path / "ref.csv"
    _run(export, ref, None, labeler)
    _interrupt_at(monkeypatch, 3)
    with pytest.raises(Interrupt):
        _run(export, out, None, labeler)
    monkeypatch.undo()
    parts = store_paths(out)[1]
    (parts / "000002.csv").write_text("case_id\nnot in the manifest\n")
    (parts / "000003.csv.partial").write_text("torn")
    _run(export, out, None, labeler, resume=True)
    assert out.read_bytes() == ref.read_bytes()


def test_resume_after_interrupted_join(
    tmp_path: Path, export: Path, labeler: Labeler, monkeypatch: pytest.MonkeyPatch
) -> None:
    """Killed while joining the parts: every chunk is done, only the join is redone."""
    out, ref = tmp_path / "out.csv", tmp_path / "ref.csv"
    _run(export, ref, None, labeler)

    def torn(self: ChunkStore, *args: Any) -> None:
        tmp = self.output.with_name(self.output.name + ".partial")
        tmp.write_text("case_id,status\nhalf")
        raise Interrupt

    monkeypatch.setattr(ChunkStore, "_join", torn)
    with pytest.raises(Interrupt):
        _run(export, out, None, labeler)
    assert not out.exists()
    monkeypatch.undo()
    labelled: list[int] = []
    real = runner.label_chunk
    monkeypatch.setattr(
        runner,
        "label_chunk",
        lambda *a: labelled.append(1) or real(*a),  # type: ignore[func-returns-value]
    )
    _run(export, out, None, labeler, resume=True)
    assert labelled == []
    assert out.read_bytes() == ref.read_bytes()


def test_failure_before_any_chunk_leaves_nothing(
    tmp_path: Path, export: Path, labeler: Labeler
) -> None:
    out = tmp_path / "out.csv"
    with pytest.raises(InputError, match="column 'report' not found"):
        _run(export, out, tmp_path / "ev.jsonl", labeler, text_col="report")
    assert _leftovers(tmp_path) == set()


def test_resume_with_nothing_to_resume_starts(
    tmp_path: Path, export: Path, labeler: Labeler, capsys: pytest.CaptureFixture[str]
) -> None:
    out = tmp_path / "out.csv"
    _run(export, out, None, labeler, resume=True)
    assert "nothing to resume" in capsys.readouterr().err
    assert len(pd.read_csv(out)) == 30


def test_a_second_run_on_the_same_output_is_refused(tmp_path: Path) -> None:
    out = tmp_path / "out.csv"
    first = ChunkStore(out, None, identity={"run": 1})
    try:
        with pytest.raises(ConfigError, match="another pathsieve run is writing"):
            ChunkStore(out, None, identity={"run": 1})
    finally:
        first.close(keep=False)
    assert _leftovers(tmp_path) == set()


def test_dask_engine_refuses_resume(tmp_path: Path, export: Path) -> None:
    with pytest.raises(ConfigError, match="--resume works with --engine local"):
        label_file(export, tmp_path / "o", LabelOptions("colorectal"), engine="dask", resume=True)


# ------------------------------------------------------------------ kill -9, for real


def _wait_for_chunks(manifest: Path, proc: subprocess.Popen[bytes], at_least: int) -> int:
    deadline = time.monotonic() + 120
    while time.monotonic() < deadline:
        if proc.poll() is not None:
            return -1  # finished (or failed) before it could be killed
        try:
            done = len(json.loads(manifest.read_text())["chunks"])
        except (OSError, ValueError, KeyError):
            done = 0
        if done >= at_least:
            return done
        time.sleep(0.02)
    raise AssertionError("the run showed no completed chunk within 120 s")


def test_kill_9_mid_run_then_resume_is_byte_identical(
    tmp_path: Path, make_reports: Callable[..., Any], labeler: Labeler
) -> None:
    # 24 long reports (about 8 generated reports each) in chunks of 2: slow enough to kill
    src = tmp_path / "reports.csv"
    make_reports(24, seed=9, join=8).to_csv(src, index=False)
    ref, ref_ev = tmp_path / "ref.csv", tmp_path / "ref_ev.jsonl"
    label_file(
        src, ref, LabelOptions("colorectal"), evidence_path=ref_ev, chunk_rows=2, labeler=labeler
    )
    out, ev = tmp_path / "out.csv", tmp_path / "ev.jsonl"
    argv = [
        sys.executable, "-m", "pathsieve", "label", str(src), "--scheme", "colorectal",
        "-o", str(out), "--evidence", str(ev), "--chunk-rows", "2", "--workers", "2",
        "--no-progress",
    ]  # fmt: skip
    proc = subprocess.Popen(
        argv, stdout=subprocess.DEVNULL, stderr=subprocess.PIPE, start_new_session=True
    )
    manifest, parts = store_paths(out)
    try:
        done = _wait_for_chunks(manifest, proc, 1)
        assert done > 0, f"the run ended before it could be killed: {proc.stderr.read()!r}"  # type: ignore[union-attr]
        os.killpg(proc.pid, signal.SIGKILL)  # the run and its worker processes, no clean-up
    finally:
        proc.wait(30)
        if proc.stderr is not None:
            proc.stderr.close()
    assert proc.returncode == -signal.SIGKILL
    chunks = len(json.loads(manifest.read_text())["chunks"])
    assert 1 <= chunks < 12, chunks
    assert not out.exists() and not ev.exists()  # nothing that looks complete
    code = main([*argv[3:], "--resume"])
    assert code == 0
    assert out.read_bytes() == ref.read_bytes()
    assert ev.read_bytes() == ref_ev.read_bytes()
    assert not manifest.exists() and not parts.exists()
