"""Label an archive on a dask.distributed cluster.

When one machine is not enough, ``pathsieve label ... --engine dask`` runs the
same per-chunk function as the local engine (:func:`pathsieve.runner.label_chunk`)
on dask workers, one input partition at a time, and writes partitioned
Parquet: ``<output>/part-00000.parquet``, ``part-00001.parquet``... in input
order, so ``pandas.read_parquet(output)`` equals the one-process table.

How a run goes:

1. The client *plans* partitions from file metadata, never loading reports:
   Parquet row groups; record boundaries of CSV/TSV (reports hold quoted
   newlines, so a byte range must start at a record, found with the same
   ``csv`` dialect the reader uses); line ranges of JSONL; slices of a
   ``.txt`` folder.  Each partition knows its first data row, so error
   messages name the same rows as a local run.
2. A first distributed pass reads the case ids only (a dask dataframe built
   with ``dask.dataframe.from_map``) and counts them, so a duplicate id is
   reported at the same row as in a local run, whatever partition it is in.
3. The labelling pass: each task reads its partition in chunks, labels each
   chunk and appends it to its Parquet part file, then returns its counts.
   The pipeline (ontology, scheme, matcher) is built once per worker process
   and reused for every partition it labels.

Input and output paths must be visible to every worker under the same name
(shared storage); a scheme given as a YAML path likewise.

    >>> label_dask("reports.parquet", "labels/", LabelOptions("colorectal"),
    ...            scheduler="tcp://10.0.0.5:8786")        # doctest: +SKIP
"""

from __future__ import annotations

import csv
import io
import itertools
import logging
import os
import shutil
import threading
from collections.abc import Iterator
from dataclasses import dataclass, replace
from pathlib import Path
from typing import Any

import pandas as pd

from .delimited import is_blank_record
from .errors import ConfigError, InputError
from .export import EVIDENCE_PHI_NOTICE, evidence_schema, label_schema
from .io import (
    CHUNK_ROWS,
    _finish,
    _header_width,
    _warn,
    case_id_of,
    csv_chunks,
    jsonl_chunks,
    sniff_csv,
    txt_frame,
)
from .labeler import Labeler
from .resume import notice_path
from .runner import LabelOptions, RunSummary, check_options, label_chunk

__all__ = [
    "PARTITION_ROWS",
    "Partition",
    "label_dask",
    "pipeline_builds",
    "plan_partitions",
    "worker_pipeline",
]

#: Reports per partition (rounded up to a whole number of chunks).
PARTITION_ROWS = 20_000
_PART = "part-{:05d}.parquet"


@dataclass(frozen=True, slots=True)
class Partition:
    """One unit of cluster work: a slice of one input file (or of a .txt folder).

    ``first_row`` is the 1-based data row of its first report in the whole
    input; ``rows`` the number of reports it holds (-1 when unknown, e.g. a CSV
    whose records could not be scanned ahead: then it is the whole file).
    """

    index: int
    kind: str  # parquet | csv | jsonl | txt
    path: str
    first_row: int
    rows: int
    row_groups: tuple[int, ...] = ()
    start: int = 0  # byte range of a csv/jsonl partition
    end: int = -1
    header: bytes = b""  # csv: the header record, prepended to every byte range
    encoding: str = "utf-8"
    delimiter: str = ","
    width: int = 1  # csv: header width, for rows with extra fields
    first_line: int = 1  # jsonl: file line number of ``start``
    files: tuple[str, ...] = ()  # txt: the files of this slice
    source: str = ""  # the input as the user named it (for error messages)


# ------------------------------------------------------------------ planning (client side)


def plan_partitions(
    path: str | Path,
    *,
    partition_rows: int = PARTITION_ROWS,
    chunk_rows: int = CHUNK_ROWS,
) -> list[Partition]:
    """Cut ``path`` into partitions of about ``partition_rows`` reports.

    Partitions hold whole chunks (``partition_rows`` is rounded up to a
    multiple of ``chunk_rows``), so every chunk a worker reads is a chunk a
    local run reads.
    """
    source = Path(path)
    if not source.exists():
        raise InputError("input not found; check the path", path=source)
    per = max(1, -(-max(partition_rows, 1) // chunk_rows)) * chunk_rows
    if source.is_dir():
        parquet = sorted(p for p in source.iterdir() if p.suffix.lower() == ".parquet")
        if parquet:
            return _plan_parquet(parquet, per, source)
        return _plan_txt(source, per)
    suffix = source.suffix.lower()
    if suffix == ".parquet":
        return _plan_parquet([source], per, source)
    if suffix in (".jsonl", ".ndjson"):
        return _plan_jsonl(source, per)
    if suffix in (".xlsx", ".xls"):
        raise ConfigError(
            f"{source}: the dask engine reads CSV/TSV, JSONL, Parquet or a .txt folder; "
            "save the sheet as CSV or Parquet, or use --engine local"
        )
    return _plan_csv(source, per)


def _plan_parquet(files: list[Path], per: int, source: Path) -> list[Partition]:
    import pyarrow.parquet as pq

    out: list[Partition] = []
    row = 1
    for f in files:
        meta = pq.ParquetFile(f).metadata
        groups: list[int] = []
        count = 0
        for g in range(meta.num_row_groups):
            groups.append(g)
            count += meta.row_group(g).num_rows
            if count >= per:
                out.append(Partition(len(out), "parquet", str(f), row, count, tuple(groups)))
                row += count
                groups, count = [], 0
        if groups or meta.num_row_groups == 0:
            out.append(Partition(len(out), "parquet", str(f), row, count, tuple(groups)))
            row += count
    return [replace(p, source=str(source)) for p in out]


def _plan_txt(folder: Path, per: int) -> list[Partition]:
    files = sorted(p for p in folder.iterdir() if p.suffix.lower() == ".txt" and p.is_file())
    if not files:
        raise InputError("folder holds no .txt files", path=folder)
    return [
        Partition(
            i // per,
            "txt",
            str(folder),
            i + 1,
            len(files[i : i + per]),
            files=tuple(str(p) for p in files[i : i + per]),
            source=str(folder),
        )
        for i in range(0, len(files), per)
    ]


def _plan_csv(source: Path, per: int) -> list[Partition]:
    encoding, delim = sniff_csv(source)
    if encoding == "latin-1":
        _warn(f"{source}: not valid UTF-8; read as Latin-1 (check accented characters)")
    width = _header_width(source, encoding, delim)
    size = source.stat().st_size
    base = Partition(
        0, "csv", str(source), 1, -1, encoding=encoding, delimiter=delim, width=width,
        source=str(source),
    )  # fmt: skip
    if encoding == "utf-16":
        return [base]  # byte ranges cannot be cut at line ends found byte by byte: one partition
    pos = 0

    def lines(fh: Any) -> Iterator[str]:
        # the byte offset after each line the csv reader pulls: a record ends at `pos`
        nonlocal pos
        for raw in fh:
            pos += len(raw)
            yield raw.decode(encoding)

    cuts: list[tuple[int, int]] = []  # (byte offset, rows before it)
    header = b""
    try:
        with source.open("rb") as fh:
            reader = csv.reader(
                lines(fh),
                delimiter=delim,
                quotechar='"',
                doublequote=True,
                skipinitialspace=False,
                quoting=csv.QUOTE_MINIMAL,
                strict=True,
            )
            head_start = 0
            for record in reader:
                if not is_blank_record(record):
                    break
                head_start = pos
            else:
                return [replace(base, rows=0, start=size, end=size)]
            with source.open("rb") as raw:
                raw.seek(head_start)
                header = raw.read(pos - head_start)
            cuts.append((pos, 0))
            rows = 0
            for record in reader:
                if is_blank_record(record):
                    continue
                rows += 1
                if rows % per == 0:
                    cuts.append((pos, rows))
            total = rows
    except (csv.Error, UnicodeDecodeError):
        # records the scanner cannot delimit: one partition, the reader reports any problem
        return [base]
    bounds = [*cuts, (size, total)]
    out: list[Partition] = []
    for (a, before), (b, upto) in itertools.pairwise(bounds):
        if upto > before or not out:
            out.append(
                replace(base, index=len(out), first_row=before + 1, rows=upto - before,
                        start=a, end=b, header=header)
            )  # fmt: skip
    return out


def _plan_jsonl(source: Path, per: int) -> list[Partition]:
    out: list[Partition] = []
    start, line, first_line, rows, pos = 0, 0, 1, 0, 0
    first_row = 1
    with source.open("rb") as fh:
        for raw in fh:
            pos += len(raw)
            # universal newlines, as the reader sees them: a lone CR also ends a line
            pieces = raw.decode("utf-8", errors="replace").replace("\r\n", "\n").split("\r")
            for piece in pieces:
                line += 1
                if piece.strip():
                    rows += 1
            if rows >= per:
                out.append(
                    Partition(len(out), "jsonl", str(source), first_row, rows, start=start,
                              end=pos, first_line=first_line, source=str(source))
                )  # fmt: skip
                first_row += rows
                start, first_line, rows = pos, line + 1, 0
    if rows or not out:
        out.append(
            Partition(len(out), "jsonl", str(source), first_row, rows, start=start, end=pos,
                      first_line=first_line, source=str(source))
        )  # fmt: skip
    return out


# ------------------------------------------------------------------ reading (worker side)


def _raw_chunks(
    p: Partition, id_col: str, text_col: str, chunk_rows: int
) -> Iterator[pd.DataFrame]:
    """The raw chunks of one partition, as the local reader would cut them."""
    path = Path(p.path)
    source = Path(p.source or p.path)
    try:
        if p.kind == "parquet":
            import pyarrow.parquet as pq

            pf = pq.ParquetFile(path, pre_buffer=False)
            names = pf.schema_arrow.names
            wanted = [c for c in (id_col, text_col) if c in names]
            if len(wanted) < 2:
                yield pd.DataFrame(columns=names)
                return
            if p.row_groups:
                for batch in pf.iter_batches(
                    batch_size=chunk_rows, row_groups=list(p.row_groups), columns=wanted
                ):
                    yield batch.to_pandas(integer_object_nulls=True)
        elif p.kind == "csv":
            if p.end == -1:  # unscanned: the whole file, as the local reader reads it
                yield from csv_chunks(path, source, p.encoding, p.delimiter, p.width, chunk_rows)
                return
            with path.open("rb") as fh:
                fh.seek(p.start)
                body = fh.read(p.end - p.start)
            text = (p.header + body).decode(p.encoding)
            buf = io.StringIO(text, newline="\n")  # lines end in LF only, as the reader reads
            yield from csv_chunks(buf, source, p.encoding, p.delimiter, p.width, chunk_rows)
        elif p.kind == "jsonl":
            yield from jsonl_chunks(
                path, chunk_rows, start=p.start, end=p.end, first_line=p.first_line
            )
        elif p.kind == "txt":
            files = [Path(f) for f in p.files]
            for i in range(0, len(files), chunk_rows):
                yield txt_frame(files[i : i + chunk_rows])
        else:  # pragma: no cover - plan_partitions makes only the kinds above
            raise ConfigError(f"unknown partition kind {p.kind!r}")
    except InputError:
        raise
    except (ValueError, OSError, pd.errors.ParserError) as exc:
        raise InputError(f"cannot read input: {exc}", path=source) from exc


def _chunks(
    p: Partition, id_col: str, text_col: str, chunk_rows: int, seen: set[str]
) -> Iterator[pd.DataFrame]:
    """Normalised chunks (case_id, text, row, error) with input-wide row numbers."""
    source = Path(p.source or p.path)
    row = p.first_row
    # a .txt folder has fixed columns: file stem and file text
    ic, tc = ("case_id", "text") if p.kind == "txt" else (id_col, text_col)
    for raw in _raw_chunks(p, id_col, text_col, chunk_rows):
        chunk = _finish(raw, ic, tc, source, row, seen)
        row += len(chunk)
        yield chunk
    if p.rows >= 0 and row - p.first_row != p.rows:
        raise InputError(
            f"partition {p.index} held {row - p.first_row} rows where {p.rows} were planned "
            "(records the planner could not delimit); convert the input to Parquet or use "
            "--engine local",
            path=source,
        )


_ID_META = pd.DataFrame(
    {"case_id": pd.Series([], dtype="str"), "row": pd.Series([], dtype="int64")}
)


def _partition_ids(p: Partition, id_col: str, text_col: str, chunk_rows: int) -> pd.DataFrame:
    """Every row's case id (after trimming; ``row<N>`` for an empty one) and row."""
    if p.kind == "parquet":
        return _parquet_ids(p, id_col, text_col, chunk_rows)
    frames = [c[["case_id", "row"]] for c in _chunks(p, id_col, text_col, chunk_rows, set())]
    if not frames:
        return _ID_META.copy()
    return pd.concat(frames, ignore_index=True)


def _parquet_ids(p: Partition, id_col: str, text_col: str, chunk_rows: int) -> pd.DataFrame:
    """As :func:`_partition_ids`, reading the id column only (the texts are most of the bytes)."""
    import pyarrow.parquet as pq

    pf = pq.ParquetFile(p.path, pre_buffer=False)
    names = pf.schema_arrow.names
    if id_col not in names or text_col not in names:
        # the labelling pass raises the reader's own error for this
        return _ID_META.copy()
    ids: list[str] = []
    if p.row_groups:
        for batch in pf.iter_batches(
            batch_size=chunk_rows, row_groups=list(p.row_groups), columns=[id_col]
        ):
            # through pandas, exactly as the reader converts the column
            ids.extend(map(case_id_of, batch.to_pandas(integer_object_nulls=True)[id_col].tolist()))
    rows = range(p.first_row, p.first_row + len(ids))
    return pd.DataFrame(
        {
            "case_id": pd.Series(
                [cid or f"row{row}" for cid, row in zip(ids, rows, strict=True)], dtype="str"
            ),
            "row": pd.Series(rows, dtype="int64"),
        }
    )


# ------------------------------------------------------------------ the pipeline, once per worker

_LOCK = threading.Lock()
#: Serialises labelling when a worker runs several threads: the pipeline is shared,
#: and threads gain nothing on pure-Python work anyway (run workers with one thread).
_LABEL_LOCK = threading.Lock()
_PIPELINES: dict[str, Labeler] = {}
_BUILDS: dict[str, int] = {}


def worker_pipeline(scheme: str) -> Labeler:
    """This process's pipeline for ``scheme``, built on first use and then reused."""
    with _LOCK:
        labeler = _PIPELINES.get(scheme)
        if labeler is None:
            labeler = Labeler(scheme)
            _PIPELINES[scheme] = labeler
            _BUILDS[scheme] = _BUILDS.get(scheme, 0) + 1
        return labeler


def pipeline_builds() -> dict[str, int]:
    """How many times this process built a pipeline, per scheme (1 each, normally)."""
    return dict(_BUILDS)


def _label_partition(
    p: Partition,
    *,
    options: LabelOptions,
    id_col: str,
    text_col: str,
    chunk_rows: int,
    out_dir: str,
    ev_dir: str | None,
    prior: frozenset[str],
) -> pd.DataFrame:
    """Label one partition into its part file(s); return its counts as one row."""
    import pyarrow as pa
    import pyarrow.parquet as pq

    labeler = worker_pipeline(options.scheme)
    schema = label_schema(
        labeler.scheme, options.per, states=options.states, uncertain=options.uncertain
    )
    ev_schema = evidence_schema(redact=options.redact)
    summary = RunSummary(label_keys=labeler.scheme.label_keys)
    name = _PART.format(p.index)
    writer = pq.ParquetWriter(os.path.join(out_dir, name), schema)
    ev_writer = pq.ParquetWriter(os.path.join(ev_dir, name), ev_schema) if ev_dir else None
    try:
        # ids that occur earlier in the input (other partitions) count as already seen
        seen = set(prior)
        for chunk in _chunks(p, id_col, text_col, chunk_rows, seen):
            records = zip(chunk.case_id, chunk.text, chunk.error, strict=True)
            with _LABEL_LOCK:
                done = label_chunk(labeler, options, records)
            writer.write_table(
                pa.Table.from_pandas(done.labels, schema=schema, preserve_index=False)
            )
            if ev_writer is not None and done.evidence is not None:
                ev_writer.write_table(
                    pa.Table.from_pandas(done.evidence, schema=ev_schema, preserve_index=False)
                )
            summary.add(done.summary)
    finally:
        writer.close()
        if ev_writer is not None:
            ev_writer.close()
    return _summary_frame(p.index, summary)


def _summary_frame(index: int, s: RunSummary) -> pd.DataFrame:
    row: dict[str, Any] = {
        "partition": index,
        "rows": s.rows,
        "cases": s.cases,
        "errors": s.errors,
        "evidence_rows": s.evidence_rows,
    }
    for key in s.label_keys:
        row[f"present:{key}"] = s.prevalence.get(key, 0)
    return pd.DataFrame([row]).astype("int64")


# ------------------------------------------------------------------ the entry point


def _output_dir(path: str | Path, what: str) -> Path:
    out = Path(path)
    if out.suffix.lower() in (".csv", ".jsonl", ".xlsx", ".tsv"):
        raise ConfigError(
            f"{what} {out}: the dask engine writes partitioned Parquet; name a directory "
            "(e.g. labels/ or labels.parquet)"
        )
    if not out.parent.is_dir():
        raise ConfigError(f"output folder {out.parent} does not exist; create it first")
    if not os.access(out.parent, os.W_OK):
        raise ConfigError(f"output folder {out.parent} is not writable")
    if out.exists() and not _replaceable(out):
        raise ConfigError(
            f"{what} {out} exists and is not a pathsieve output directory; choose a new name"
        )
    return out


def _replaceable(path: Path) -> bool:
    if not path.is_dir():
        return False
    return all(p.name.startswith("part-") and p.suffix == ".parquet" for p in path.iterdir())


def _publish(tmp: Path, final: Path) -> None:
    """Swap the finished directory in (an interrupted run never leaves a partial table)."""
    if final.exists():
        shutil.rmtree(final)
    tmp.replace(final)


def _client(scheduler: str | None, workers: int) -> tuple[Any, Any]:
    try:
        from distributed import Client, LocalCluster
    except ImportError as exc:  # pragma: no cover - the cluster extra is not installed
        raise ConfigError(
            "--engine dask needs dask and distributed: pip install 'pathsieve[cluster]'"
        ) from exc
    if scheduler:
        try:
            return Client(scheduler, timeout="30s"), None
        except (OSError, TimeoutError) as exc:
            raise ConfigError(
                f"cannot reach the dask scheduler at {scheduler} ({exc}); check the address "
                "(tcp://HOST:PORT) and that `dask scheduler` is running"
            ) from exc
    # the id count below is a shuffle; its scheduler announces each one at WARNING level
    logging.getLogger("distributed.shuffle._scheduler_plugin").setLevel(logging.ERROR)
    cluster = LocalCluster(
        n_workers=workers,
        threads_per_worker=1,
        processes=True,
        host="127.0.0.1",
        dashboard_address=None,
    )
    return Client(cluster), cluster


def label_dask(
    input_path: str | Path,
    output: str | Path,
    options: LabelOptions,
    *,
    evidence_path: str | Path | None = None,
    id_col: str = "case_id",
    text_col: str = "text",
    scheduler: str | None = None,
    workers: int = 2,
    chunk_rows: int = CHUNK_ROWS,
    partition_rows: int = PARTITION_ROWS,
    client: Any = None,
) -> RunSummary:
    """Label ``input_path`` on a dask cluster into partitioned Parquet directories.

    ``scheduler`` is an existing cluster's address; without it (and without a
    ``client``) a local cluster of ``workers`` processes is started and closed.
    Returns the same counts as :func:`pathsieve.runner.label_file`.
    """
    import dask.dataframe as dd

    check_options(options)
    scheme = options.scheme
    if Path(scheme).suffix.lower() in (".yaml", ".yml"):
        scheme = str(Path(scheme).resolve())  # workers resolve the same file on shared storage
    labeler = Labeler(scheme)  # fails fast on a bad scheme, before a cluster starts
    opts = replace(options, scheme=scheme, evidence=evidence_path is not None)
    out = _output_dir(output, "output")
    ev_out = _output_dir(evidence_path, "evidence") if evidence_path is not None else None
    if ev_out is not None and ev_out.resolve() == out.resolve():
        raise ConfigError("--evidence must name a different directory from -o")
    parts = plan_partitions(input_path, partition_rows=partition_rows, chunk_rows=chunk_rows)

    tmp = out.with_name(out.name + ".partial")
    ev_tmp = ev_out.with_name(ev_out.name + ".partial") if ev_out is not None else None
    for d in (tmp, ev_tmp):
        if d is not None:
            shutil.rmtree(d, ignore_errors=True)
            d.mkdir()
    own: tuple[Any, Any] | None = None  # a client (and local cluster) this call started
    try:
        if client is None:
            client, cluster = _client(scheduler, workers)
            own = (client, cluster)
        # 1. case ids only, counted across the whole input: duplicates are reported
        #    at the same rows as a local run, whichever partitions they fall in
        ids = dd.from_map(
            _partition_ids,
            parts,
            id_col=id_col,
            text_col=text_col,
            chunk_rows=chunk_rows,
            meta=_ID_META,
            enforce_metadata=False,
        )
        counts = ids["case_id"].value_counts()
        repeated = client.compute(counts[counts > 1]).result()
        first_seen: dict[str, int] = {}
        if len(repeated):
            dup_rows = client.compute(ids[ids["case_id"].isin(list(repeated.index))]).result()
            first_seen = dup_rows.groupby("case_id")["row"].min().to_dict()
        # 2. label: one task per partition, each writing its own part file(s)
        priors = [
            frozenset(cid for cid, row in first_seen.items() if row < p.first_row) for p in parts
        ]
        sum_meta = _summary_frame(0, RunSummary(label_keys=labeler.scheme.label_keys)).iloc[:0]
        tasks = dd.from_map(
            _label_one,
            list(zip(parts, priors, strict=True)),
            options=opts,
            id_col=id_col,
            text_col=text_col,
            chunk_rows=chunk_rows,
            out_dir=str(tmp),
            ev_dir=str(ev_tmp) if ev_tmp is not None else None,
            meta=sum_meta,
            enforce_metadata=False,
        )
        counts_df = client.compute(tasks).result()
        _fill_empty(tmp, ev_tmp, labeler, opts, parts)
        _publish(tmp, out)
        if ev_tmp is not None and ev_out is not None:
            notice = notice_path(ev_out)
            if opts.redact:
                notice.unlink(missing_ok=True)
            else:
                notice.write_text(f"{ev_out.name}: {EVIDENCE_PHI_NOTICE}\n", encoding="utf-8")
            _publish(ev_tmp, ev_out)
    except BaseException:
        for d in (tmp, ev_tmp):
            if d is not None:
                shutil.rmtree(d, ignore_errors=True)
        raise
    finally:
        if own is not None:
            own[0].close()
            if own[1] is not None:
                own[1].close()
    summary = RunSummary(label_keys=labeler.scheme.label_keys)
    summary.rows = int(counts_df["rows"].sum())
    summary.cases = int(counts_df["cases"].sum())
    summary.errors = int(counts_df["errors"].sum())
    summary.evidence_rows = int(counts_df["evidence_rows"].sum())
    for key in summary.label_keys:
        summary.prevalence[key] = int(counts_df[f"present:{key}"].sum())
    return summary


def _label_one(item: tuple[Partition, frozenset[str]], **kwargs: Any) -> pd.DataFrame:
    p, prior = item
    return _label_partition(p, prior=prior, **kwargs)


def _fill_empty(
    tmp: Path, ev_tmp: Path | None, labeler: Labeler, opts: LabelOptions, parts: list[Partition]
) -> None:
    """An input with no reports still yields a readable (empty) table."""
    import pyarrow.parquet as pq

    if parts:
        return
    schema = label_schema(labeler.scheme, opts.per, states=opts.states, uncertain=opts.uncertain)
    pq.write_table(schema.empty_table(), tmp / _PART.format(0))
    if ev_tmp is not None:
        pq.write_table(evidence_schema(redact=opts.redact).empty_table(), ev_tmp / _PART.format(0))
