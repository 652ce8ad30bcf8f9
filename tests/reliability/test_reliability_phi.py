"""Report text (protected health information) stays out of logs and messages.

Every report here carries a unique marker; each one is built to take an error
path (a time-budget overrun, broken quoting, a repeated id, extra fields, a
Latin-1 file, JSONL that is not an object, an exception inside the pipeline).
The marker must never appear on stderr, in a log record or in the label table.
``--redact-evidence`` evidence must not hold it either; unredacted evidence and
the review page are marked as holding report text.
"""

from __future__ import annotations

import json
import logging
import subprocess
import sys
from pathlib import Path
from typing import Any

import pandas as pd
import pyarrow.parquet as pq
import pytest

from pathsieve import Labeler
from pathsieve.export import EVIDENCE_PHI_NOTICE
from pathsieve.resume import notice_path
from pathsieve.review import PHI_NOTICE, render_review
from pathsieve.runner import LabelOptions, label_file

MARK = "ZEBRAQUOKKA"  # appears in no vocabulary and no message


def _csv_with_every_error_path(path: Path) -> None:
    """A Latin-1 export whose rows each take an error path, all holding the marker."""
    big = f"DIAGNOSIS: {MARK}-1 tubular adenoma. " + "Sigmoid colon, biopsy: adenoma; " * 12_000
    body = (
        "case_id,text\n"
        f'P1,"DIAGNOSIS: Rectum, biopsy: adenocarcinoma. {MARK}-0 é"\n'
        f'P2,"{big}"\n'  # 390,000 characters: overruns a 0.5 s budget
        f'P3,"DIAGNOSIS: {MARK}-3 a quote "inside" not doubled"\n'
        f'P4,"DIAGNOSIS: {MARK}-4 tubular adenoma.",extra,{MARK}-4b\n'
        f'P1,"DIAGNOSIS: {MARK}-5 the id again"\n'
        'P6,""\n'
        f'P7,"DIAGNOSIS: {MARK}-7 never closed\n'
        f"P8,DIAGNOSIS: {MARK}-8 hyperplastic polyp.\n"
    )
    path.write_bytes(body.encode("latin-1"))


def _start_cli(*args: str) -> subprocess.Popen[str]:
    return subprocess.Popen(
        [sys.executable, "-m", "pathsieve", "label", *args, "--workers", "1"],
        stdout=subprocess.PIPE,
        stderr=subprocess.PIPE,
        text=True,
    )


@pytest.fixture(scope="module")
def cli_run(tmp_path_factory: pytest.TempPathFactory) -> dict[str, Any]:
    work = tmp_path_factory.mktemp("phi")
    src = work / "reports.csv"
    _csv_with_every_error_path(src)
    jsonl = work / "reports.jsonl"
    jsonl.write_text(
        json.dumps({"case_id": "J1", "text": f"DIAGNOSIS: adenoma {MARK}-j1"}) + "\n"
        f'{{"case_id": "J2", "text": "{MARK}-j2 cut off\n'
        f'["{MARK}-j3", "a list, not an object"]\n'
        f'"{MARK}-j4"\n',
        encoding="utf-8",
    )
    started = {
        "csv": _start_cli(
            str(src), "--scheme", "colorectal", "-o", str(work / "labels.csv"),
            "--evidence", str(work / "evidence.jsonl"), "--redact-evidence",
            "--time-budget", "0.5", "--chunk-rows", "3",
        ),
        "jsonl": _start_cli(
            str(jsonl), "--scheme", "colorectal", "-o", str(work / "labels-j.csv"),
            "--evidence", str(work / "evidence-j.parquet"), "--redact-evidence",
        ),
    }  # fmt: skip
    runs = {}
    for name, proc in started.items():  # both run at once
        out, err = proc.communicate(timeout=300)
        runs[name] = subprocess.CompletedProcess(proc.args, proc.returncode, out, err)
    return {"work": work, "runs": runs}


def test_cli_error_paths_were_taken(cli_run: dict[str, Any]) -> None:
    """The rows really went down the error paths this file is about."""
    work = cli_run["work"]
    df = pd.read_csv(work / "labels.csv", dtype=str, keep_default_na=False)
    assert df["case_id"].tolist() == ["P1", "P2", "P3", "P4", "P1", "P6", "P7", "P8"]
    errors = dict(enumerate(df["error"]))
    assert "exceeded the time budget of 0.5 s" in errors[1]
    assert "not doubled" in errors[2]
    assert "duplicate case id" in errors[4]
    assert "is empty" in errors[5]
    assert "never closed" in errors[6]
    assert df["status"].tolist() == ["ok", "error", "error", "ok", "error", "error", "error", "ok"]
    err = cli_run["runs"]["csv"].stderr
    assert "Latin-1" in err and "more fields than the header" in err
    dj = pd.read_csv(work / "labels-j.csv", dtype=str, keep_default_na=False)
    assert dj["status"].tolist() == ["ok", "error", "error", "error"]
    assert "line 2 is not valid JSON" in dj["error"][1]
    assert "holds a JSON list" in dj["error"][2]


@pytest.mark.parametrize("which", ["csv", "jsonl"])
def test_marker_never_in_stderr_or_tables(cli_run: dict[str, Any], which: str) -> None:
    proc = cli_run["runs"][which]
    assert proc.returncode == 0, proc.stderr
    assert MARK not in proc.stderr and MARK not in proc.stdout
    work = cli_run["work"]
    for name in ("labels.csv", "evidence.jsonl") if which == "csv" else ("labels-j.csv",):
        assert MARK.encode() not in (work / name).read_bytes(), name


def test_redacted_evidence_has_offsets_and_ids_only(cli_run: dict[str, Any]) -> None:
    work = cli_run["work"]
    rows = [json.loads(line) for line in (work / "evidence.jsonl").open(encoding="utf-8")]
    assert rows, "the ok reports have evidence"
    for r in rows:
        assert r["text"] == "" and r["note"] == ""
        assert all(t["text"] == "" for t in r["triggers"])
        assert r["start"] < r["end"]
        assert r["concept_id"] or r["value_key"]
    table = pq.read_table(work / "evidence-j.parquet")
    assert MARK not in table.to_pandas().to_json()
    note = json.loads(table.schema.metadata[b"pathsieve"])
    assert note["contains_report_text"] is False
    # redacted evidence gets no PHI notice
    assert not notice_path(work / "evidence.jsonl").exists()


def test_exception_messages_are_not_copied(
    tmp_path: Path, caplog: pytest.LogCaptureFixture
) -> None:
    """An exception whose message quotes the report: the error row names its type only."""
    lab = Labeler("colorectal")

    def explode(text: str) -> Any:
        logging.getLogger("pathsieve").debug("reading a report")  # a log line, text-free
        raise ValueError(f"cannot read {text!r}")

    lab._read = explode
    lab._read_for_labels = explode
    src = tmp_path / "in.csv"
    pd.DataFrame({"case_id": ["E1"], "text": [f"DIAGNOSIS: {MARK} adenoma"]}).to_csv(
        src, index=False
    )
    out = tmp_path / "out.csv"
    with caplog.at_level(logging.DEBUG):
        label_file(
            src, out, LabelOptions("colorectal"), evidence_path=tmp_path / "ev.jsonl", labeler=lab
        )
    df = pd.read_csv(out, dtype=str, keep_default_na=False)
    assert df["error"].tolist() == ["case E1: ValueError while labelling"]
    assert MARK not in caplog.text
    assert MARK.encode() not in out.read_bytes()


@pytest.mark.parametrize("suffix", [".jsonl", ".parquet"])
def test_unredacted_evidence_is_marked(tmp_path: Path, suffix: str, colorectal: Labeler) -> None:
    src = tmp_path / "in.csv"
    pd.DataFrame({"case_id": ["M1"], "text": ["DIAGNOSIS: Rectum: adenocarcinoma."]}).to_csv(
        src, index=False
    )
    ev = tmp_path / f"evidence{suffix}"
    label_file(
        src, tmp_path / "out.csv", LabelOptions("colorectal"), evidence_path=ev, labeler=colorectal
    )
    notice = notice_path(ev)
    assert notice.read_text(encoding="utf-8").startswith(f"{ev.name}: {EVIDENCE_PHI_NOTICE}")
    assert "protected health information" in EVIDENCE_PHI_NOTICE
    if suffix == ".parquet":
        note = json.loads(pq.read_schema(ev).metadata[b"pathsieve"])
        assert note["contains_report_text"] is True
        assert note["notice"] == EVIDENCE_PHI_NOTICE
    # the same evidence, redacted, takes the notice away
    label_file(src, tmp_path / "out.csv", LabelOptions("colorectal", redact=True), evidence_path=ev)
    assert not notice.exists()


def test_review_page_is_marked(tmp_path: Path) -> None:
    reports = pd.DataFrame(
        {"case_id": ["R1"], "text": [f"DIAGNOSIS: Rectum: adenocarcinoma {MARK}."]}
    )
    lab = Labeler("colorectal")
    res = lab.label_text(reports["text"][0], case_id="R1")
    page = render_review(
        reports, res.labels, res.evidence.to_dict(orient="records"), scheme="colorectal"
    )
    assert PHI_NOTICE in page
    assert "protected health information" in PHI_NOTICE
