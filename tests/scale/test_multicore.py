"""Multi-core labelling writes exactly what one process writes.

``--workers N`` labels chunks in worker processes; chunks are written back in
input order, so the tables must be byte-identical to a ``--workers 1`` run,
error rows included.  Speed is measured by benchmarks/throughput.py, not here.
"""

from __future__ import annotations

from pathlib import Path

import pandas as pd
import pytest

from pathsieve.cli import main
from pathsieve.runner import LabelOptions, label_file
from shared_paths import benchmark


def _reports(n: int, organ: str) -> pd.DataFrame:
    """Invented reports plus the rows a real export has: no id, a repeated id, no text."""
    df = benchmark("corpus").frame(n, seed=11, organ=organ)[["case_id", "text"]].copy()
    df.loc[5, "case_id"] = ""
    df.loc[n - 3, "case_id"] = df.loc[2, "case_id"]  # a duplicate far from its first use
    df.loc[9, "text"] = "   "
    return df


@pytest.fixture(scope="module")
def export(tmp_path_factory: pytest.TempPathFactory) -> Path:
    path = tmp_path_factory.mktemp("mc") / "reports.csv"
    _reports(100, "mixed").to_csv(path, index=False)
    return path


@pytest.mark.parametrize(
    ("options", "evidence"),
    [
        (LabelOptions("colorectal"), ".jsonl"),
        (LabelOptions("prostate", per="part", states=True), ".jsonl"),
        (LabelOptions("breast", uncertain="soft"), None),
        (LabelOptions("cervix", per="part", redact=True), ".parquet"),
    ],
)
def test_two_workers_write_the_same_bytes(
    export: Path, tmp_path: Path, options: LabelOptions, evidence: str | None
) -> None:
    outputs = {}
    for workers in (1, 2):
        out = tmp_path / f"labels{workers}.csv"
        ev = tmp_path / f"evidence{workers}{evidence}" if evidence else None
        summary = label_file(export, out, options, evidence_path=ev, workers=workers, chunk_rows=17)
        outputs[workers] = (out.read_bytes(), ev.read_bytes() if ev else b"", summary)
    one, two = outputs[1], outputs[2]
    assert one[0] == two[0]
    assert one[1] == two[1]
    assert one[2] == two[2]  # same counts
    table = pd.read_csv(tmp_path / "labels1.csv", keep_default_na=False)
    assert (table["status"] == "error").sum() == 3  # no id, repeated id, no text
    assert one[2].cases == 100
    if evidence:
        assert one[2].evidence_rows > 100


def test_cli_workers_flag(export: Path, tmp_path: Path) -> None:
    for workers in ("1", "2"):
        code = main(
            [
                "label",
                str(export),
                "--scheme",
                "lung",
                "-o",
                str(tmp_path / f"w{workers}.csv"),
                "--evidence",
                str(tmp_path / f"w{workers}.jsonl"),
                "--workers",
                workers,
                "--no-progress",
            ]
        )
        assert code == 0
    assert (tmp_path / "w1.csv").read_bytes() == (tmp_path / "w2.csv").read_bytes()
    assert (tmp_path / "w1.jsonl").read_bytes() == (tmp_path / "w2.jsonl").read_bytes()


def test_parquet_types_do_not_depend_on_the_first_chunk(tmp_path: Path) -> None:
    # the first chunk holds no value flags and no triggers; later chunks do: every
    # chunk must still fit one schema (it is fixed up front, not guessed from chunk 1)
    df = _reports(60, "prostate")
    df.loc[0:9, "text"] = "DIAGNOSIS: Benign prostatic tissue."
    src = tmp_path / "in.csv"
    df.to_csv(src, index=False)
    ev = tmp_path / "ev.parquet"
    label_file(
        src, tmp_path / "out.parquet", LabelOptions("prostate"), evidence_path=ev, chunk_rows=10
    )
    evidence = pd.read_parquet(ev)
    assert len(evidence) > 60
    assert evidence["triggers"].iloc[:5].map(len).sum() == 0  # chunk 1: none
    assert evidence["triggers"].map(len).sum() > 0
    labels = pd.read_parquet(tmp_path / "out.parquet")
    assert labels["adenocarcinoma"].dtype == "float64"
    assert len(labels) == 60
