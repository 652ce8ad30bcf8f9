"""The dask engine labels exactly what one process labels.

A real ``distributed.LocalCluster`` (two worker processes, loopback only)
labels CSV, Parquet, JSONL and a .txt folder cut into several partitions; the
partitioned Parquet it writes must equal the one-process table row for row,
error rows (no id, a repeated id in a later partition, no text) included.
"""

from __future__ import annotations

from collections.abc import Iterator
from pathlib import Path
from typing import Any

import pandas as pd
import pytest

from pathsieve.cli import main
from pathsieve.cluster import label_dask, pipeline_builds, plan_partitions
from pathsieve.errors import ConfigError
from pathsieve.runner import LabelOptions, label_file
from shared_paths import benchmark

distributed = pytest.importorskip("distributed")

N = 100
PARTITION_ROWS = 40
CHUNK_ROWS = 20


@pytest.fixture(scope="module")
def client() -> Iterator[Any]:
    cluster = distributed.LocalCluster(
        n_workers=2,
        threads_per_worker=1,
        processes=True,
        host="127.0.0.1",
        dashboard_address=None,
    )
    client = distributed.Client(cluster)
    yield client
    client.close()
    cluster.close()


@pytest.fixture(scope="module")
def inputs(tmp_path_factory: pytest.TempPathFactory) -> dict[str, Path]:
    root = tmp_path_factory.mktemp("dask")
    df = benchmark("corpus").frame(N, seed=5, organ="mixed")[["case_id", "text"]].copy()
    df.loc[3, "case_id"] = ""
    df.loc[N - 2, "case_id"] = df.loc[1, "case_id"]  # repeated four partitions later
    df.loc[60, "text"] = ""
    paths = {"csv": root / "reports.csv", "jsonl": root / "reports.jsonl"}
    df.to_csv(paths["csv"], index=False)
    df.to_json(paths["jsonl"], orient="records", lines=True, force_ascii=False)
    pq = benchmark("corpus").write_corpus(
        root / "reports.parquet", N, seed=6, organ="mixed", chunk_rows=25
    )
    paths["parquet"] = pq
    folder = root / "txt"
    folder.mkdir()
    for cid, text in zip(df.case_id[:60], df.text[:60], strict=True):
        if cid:
            (folder / f"{cid}.txt").write_text(text, encoding="utf-8")
    paths["txt"] = folder
    return paths


def _local(src: Path, tmp: Path, options: LabelOptions) -> tuple[pd.DataFrame, pd.DataFrame]:
    label_file(src, tmp / "one.parquet", options, evidence_path=tmp / "one_ev.parquet")
    return pd.read_parquet(tmp / "one.parquet"), pd.read_parquet(tmp / "one_ev.parquet")


def _parts(directory: Path) -> pd.DataFrame:
    files = sorted(directory.glob("part-*.parquet"))
    assert files, f"no part files in {directory}"
    return pd.concat([pd.read_parquet(f) for f in files], ignore_index=True)


@pytest.mark.parametrize(
    ("kind", "options"),
    [
        ("csv", LabelOptions("colorectal")),
        ("parquet", LabelOptions("breast", per="part")),
        ("jsonl", LabelOptions("prostate", states=True)),
        ("txt", LabelOptions("lung", uncertain="drop")),
    ],
)
def test_cluster_output_equals_one_process(
    client: Any, inputs: dict[str, Path], tmp_path: Path, kind: str, options: LabelOptions
) -> None:
    src = inputs[kind]
    parts = plan_partitions(src, partition_rows=PARTITION_ROWS, chunk_rows=CHUNK_ROWS)
    assert len(parts) >= 2
    summary = label_dask(
        src,
        tmp_path / "labels",
        options,
        evidence_path=tmp_path / "evidence",
        client=client,
        chunk_rows=CHUNK_ROWS,
        partition_rows=PARTITION_ROWS,
    )
    labels, evidence = _local(src, tmp_path, options)
    pd.testing.assert_frame_equal(_parts(tmp_path / "labels"), labels)
    pd.testing.assert_frame_equal(_parts(tmp_path / "evidence"), evidence)
    # pandas reads the directory back in input order too
    pd.testing.assert_frame_equal(pd.read_parquet(tmp_path / "labels"), labels)
    assert summary.evidence_rows == len(evidence)
    assert summary.rows == len(labels)
    if kind in ("csv", "jsonl"):
        errors = labels.loc[labels["status"] == "error", "error"].tolist()
        assert len(errors) == 3
        assert any(f"row {N - 1}: duplicate case id" in e for e in errors)
    assert not (tmp_path / "labels.partial").exists()


def test_pipeline_is_built_once_per_worker(
    client: Any, inputs: dict[str, Path], tmp_path: Path
) -> None:
    label_dask(
        inputs["csv"],
        tmp_path / "out",
        LabelOptions("duodenum"),
        client=client,
        chunk_rows=CHUNK_ROWS,
        partition_rows=CHUNK_ROWS,  # 8 partitions on 2 workers
    )
    builds = client.run(pipeline_builds)
    assert len(builds) == 2
    assert all(b.get("duodenum", 0) <= 1 for b in builds.values())
    assert sum(b.get("duodenum", 0) for b in builds.values()) >= 1


def test_cli_on_an_existing_cluster(client: Any, inputs: dict[str, Path], tmp_path: Path) -> None:
    out = tmp_path / "labels.parquet"
    code = main(
        [
            "label",
            str(inputs["parquet"]),
            "--scheme",
            "cervix",
            "-o",
            str(out),
            "--engine",
            "dask",
            "--scheduler",
            client.scheduler.address,
            "--no-progress",
        ]
    )
    assert code == 0
    assert out.is_dir()
    labels, _ = _local(inputs["parquet"], tmp_path, LabelOptions("cervix"))
    pd.testing.assert_frame_equal(pd.read_parquet(out), labels)


@pytest.mark.parametrize(
    ("output", "message"),
    [("labels.csv", "partitioned Parquet"), ("missing/labels", "does not exist")],
)
def test_bad_outputs_fail_before_work(
    client: Any, inputs: dict[str, Path], tmp_path: Path, output: str, message: str
) -> None:
    with pytest.raises(ConfigError, match=message):
        label_dask(inputs["csv"], tmp_path / output, LabelOptions("colorectal"), client=client)


def test_csv_partitions_start_at_records(tmp_path: Path) -> None:
    # quoted newlines and blank lines: a partition must never start inside a report
    rows = ["case_id,text", "", 'a1,"DIAGNOSIS:\n\nTubular adenoma."', "", "a2,plain"]
    rows += [f'a{i},"line one\nline, two"' for i in range(3, 12)]
    src = tmp_path / "r.csv"
    src.write_text("\n".join(rows) + "\n\n", encoding="utf-8")
    parts = plan_partitions(src, partition_rows=4, chunk_rows=2)
    assert [(p.first_row, p.rows) for p in parts] == [(1, 4), (5, 4), (9, 3)]
    body = src.read_bytes()
    for p in parts:
        assert body[p.start :].lstrip()[:1] == b"a"  # blank lines may lead
    assert parts[0].header == b"case_id,text\n"


def test_parquet_integer_ids_and_repeats(client: Any, tmp_path: Path) -> None:
    # ids read from the id column alone must be the ids the reader makes of the whole row:
    # a nullable integer column holds 7.0-style values, a missing id becomes row<N>
    import pyarrow as pa
    import pyarrow.parquet as pq

    texts = [r.text for r in benchmark("corpus").generate(70, seed=8, organ="lung")]
    ids: list[int | None] = list(range(1000, 1070))
    ids[4] = None
    ids[60] = ids[10]  # repeated three partitions later
    src = tmp_path / "ints.parquet"
    table = pa.table({"case_id": pa.array(ids, pa.int64()), "text": texts})
    pq.write_table(table, src, row_group_size=20)
    summary = label_dask(
        src,
        tmp_path / "labels",
        LabelOptions("lung"),
        client=client,
        chunk_rows=CHUNK_ROWS,
        partition_rows=CHUNK_ROWS,
    )
    labels, _ = _local(src, tmp_path, LabelOptions("lung"))
    pd.testing.assert_frame_equal(_parts(tmp_path / "labels"), labels)
    assert summary.errors == 2
    assert any("row 61: duplicate case id" in e for e in labels["error"])
