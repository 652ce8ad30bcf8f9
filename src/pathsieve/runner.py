"""Label a report export end to end: read in chunks, label, write tables.

Every input row yields exactly one output row (per case) in input order, with
``status`` ok or error; the evidence table holds one row per mention and value.

Memory stays flat whatever the input size: chunks are read lazily, at most a
few are in flight, and each is written out as soon as it (and every chunk
before it) is labelled.  ``workers > 1`` labels chunks in worker processes;
the output is identical, byte for byte, to a one-process run because chunks
are written back in input order.  ``engine="dask"`` runs the same per-chunk
function on a dask.distributed cluster (see :mod:`pathsieve.cluster`).

A run survives faults: each report has a time budget (an overrun becomes an
error row); each labelled chunk is written to its own part file with a manifest
beside the output (:mod:`pathsieve.resume`), the output appears only when the
run is complete, and ``resume=True`` continues a killed run from its last
completed chunk, giving the output an uninterrupted run gives.

>>> summary = label_file("examples/demo_reports.csv", "/tmp/labels.csv",
...                      LabelOptions("colorectal"), workers=1)
>>> summary.cases > 0
True
"""

from __future__ import annotations

import itertools
import multiprocessing
import os
import sys
from collections import Counter, deque
from collections.abc import Callable, Iterable, Iterator
from concurrent.futures import Future, ProcessPoolExecutor
from dataclasses import asdict, dataclass, field, replace
from pathlib import Path
from typing import Any, TypeVar

import pandas as pd

from .budget import DEFAULT_BUDGET
from .errors import ConfigError, InputError
from .export import EVIDENCE_COLUMNS, UNCERTAIN_MODES, evidence_schema, label_schema
from .io import CHUNK_ROWS, read_reports
from .labeler import Labeler, frame_from_rows
from .resume import ChunkStore, check_output, input_fingerprint

__all__ = ["ENGINES", "LabelOptions", "RunSummary", "default_workers", "label_file"]

ENGINES = ("local", "dask")

_T = TypeVar("_T")
_R = TypeVar("_R")


@dataclass(frozen=True)
class LabelOptions:
    """What to label and how; ``time_budget`` is seconds per report (None: no limit)."""

    scheme: str
    per: str = "case"
    states: bool = False
    uncertain: str | None = None
    redact: bool = False
    evidence: bool = False
    time_budget: float | None = DEFAULT_BUDGET


@dataclass
class RunSummary:
    cases: int = 0
    rows: int = 0
    errors: int = 0
    evidence_rows: int = 0
    prevalence: Counter[str] = field(default_factory=Counter)
    label_keys: tuple[str, ...] = ()

    def text(self) -> str:
        lines = [f"{self.cases} cases, {self.errors} errors, {self.evidence_rows} evidence rows"]
        ok = max(self.cases - self.errors, 1)
        for key in self.label_keys:
            n = self.prevalence.get(key, 0)
            lines.append(f"  {key:<30} {n:>7}  {100 * n / ok:5.1f}% present/likely")
        return "\n".join(lines)

    def add(self, other: RunSummary) -> None:
        """Fold a chunk's (or a partition's) counts into this summary."""
        self.cases += other.cases
        self.rows += other.rows
        self.errors += other.errors
        self.evidence_rows += other.evidence_rows
        self.prevalence.update(other.prevalence)

    def to_dict(self) -> dict[str, Any]:
        """The counts as plain data (a run manifest keeps one per chunk)."""
        return {
            "rows": self.rows,
            "cases": self.cases,
            "errors": self.errors,
            "evidence_rows": self.evidence_rows,
            "prevalence": dict(self.prevalence),
        }

    @classmethod
    def from_dict(cls, data: dict[str, Any], label_keys: tuple[str, ...]) -> RunSummary:
        s = cls(label_keys=label_keys)
        s.rows, s.cases = int(data["rows"]), int(data["cases"])
        s.errors, s.evidence_rows = int(data["errors"]), int(data["evidence_rows"])
        s.prevalence.update({str(k): int(v) for k, v in data["prevalence"].items()})
        return s


@dataclass
class LabelledChunk:
    """One chunk's output tables and counts, built where the chunk was labelled."""

    labels: pd.DataFrame
    evidence: pd.DataFrame | None
    summary: RunSummary


def check_options(options: LabelOptions) -> None:
    if options.per not in ("case", "part"):
        raise ConfigError(f"--per must be case or part, not {options.per!r}")
    if options.uncertain is not None and options.uncertain not in UNCERTAIN_MODES:
        raise ConfigError(f"--uncertain must be one of {', '.join(UNCERTAIN_MODES)}")
    if options.time_budget is not None and not options.time_budget > 0:
        raise ConfigError(
            f"--time-budget must be a positive number of seconds, not {options.time_budget}"
        )


def label_chunk(
    labeler: Labeler, options: LabelOptions, records: Iterable[tuple[str, str, str]]
) -> LabelledChunk:
    """Label (case_id, text, error) records into table frames and counts.

    The one per-chunk function of every engine: the local loop, worker
    processes and dask workers all call it, so their outputs cannot drift apart.
    """
    rows, ev = labeler.label_records(
        records,
        per=options.per,
        states=options.states,
        uncertain=options.uncertain,
        redact=options.redact,
        evidence=options.evidence,
        time_budget=options.time_budget,
    )
    df = frame_from_rows(rows, labeler.columns(options.per), labeler.scheme, states=options.states)
    evidence = pd.DataFrame(ev, columns=EVIDENCE_COLUMNS) if options.evidence else None
    return LabelledChunk(df, evidence, tally(df, options, labeler.scheme.label_keys, len(ev)))


def tally(
    df: pd.DataFrame, options: LabelOptions, label_keys: tuple[str, ...], n_ev: int
) -> RunSummary:
    """Counts of one label-table chunk (a case's parts never straddle chunks)."""
    s = RunSummary(label_keys=label_keys)
    s.rows = len(df)
    s.cases = int(df["case_id"].nunique()) if options.per == "part" else len(df)
    s.errors = int((df["status"] == "error").sum())
    s.evidence_rows = n_ev
    for key in label_keys:
        col = df[key]
        if options.states and options.uncertain is None:
            hit = col.isin(["present", "likely"])
        else:
            hit = pd.to_numeric(col, errors="coerce") >= 0.75
        s.prevalence[key] += int(hit.sum())
    return s


# ------------------------------------------------------------------ worker processes

_WORKER: dict[str, Any] = {}


def _init_worker(scheme: str) -> None:
    # A forked worker inherits the parent's pipeline (already built): keep it.
    if _WORKER.get("scheme") != scheme or "labeler" not in _WORKER:
        _WORKER["labeler"] = Labeler(scheme)
        _WORKER["scheme"] = scheme


def _label_in_worker(args: tuple[LabelOptions, list[tuple[str, str, str]]]) -> LabelledChunk:
    opts, records = args
    return label_chunk(_WORKER["labeler"], opts, records)


def _ordered_map(
    pool: ProcessPoolExecutor, fn: Callable[[_T], _R], items: Iterator[_T], depth: int
) -> Iterator[_R]:
    """``pool.map`` that reads ``items`` lazily: at most ``depth`` are in flight.

    (``Executor.map`` submits the whole input at once, which would hold every
    chunk, and every result, in memory.)
    """
    pending: deque[Future[_R]] = deque()
    for item in items:
        pending.append(pool.submit(fn, item))
        if len(pending) >= depth:
            yield pending.popleft().result()
    while pending:
        yield pending.popleft().result()


def _pool(workers: int, scheme: str, labeler: Labeler) -> ProcessPoolExecutor:
    """Worker processes; forked where the platform allows, so they start at once
    with the parent's pipeline instead of building their own."""
    method = "spawn"
    if "fork" in multiprocessing.get_all_start_methods() and sys.platform.startswith("linux"):
        _WORKER.update(labeler=labeler, scheme=scheme)
        method = "fork"
    ctx = multiprocessing.get_context(method)
    pool = ProcessPoolExecutor(
        workers, mp_context=ctx, initializer=_init_worker, initargs=(scheme,)
    )
    # start the workers now, while this process has no other threads (e.g. a progress bar's)
    pool.submit(os.getpid).result()
    return pool


def _chunks(
    path: Path, id_col: str, text_col: str, chunk_rows: int
) -> Iterator[list[tuple[str, str, str]]]:
    for chunk in read_reports(path, id_col=id_col, text_col=text_col, chunk_rows=chunk_rows):
        yield list(zip(chunk.case_id, chunk.text, chunk.error, strict=True))


# ------------------------------------------------------------------ the entry point


def label_file(
    input_path: str | Path,
    output: str | Path,
    options: LabelOptions,
    *,
    evidence_path: str | Path | None = None,
    id_col: str = "case_id",
    text_col: str = "text",
    workers: int = 1,
    chunk_rows: int = CHUNK_ROWS,
    progress: bool = False,
    engine: str = "local",
    scheduler: str | None = None,
    labeler: Labeler | None = None,
    resume: bool = False,
) -> RunSummary:
    """Label every report of ``input_path`` into ``output`` (and ``evidence_path``).

    ``engine="dask"`` labels on a dask.distributed cluster (``scheduler`` is its
    address, e.g. ``tcp://10.0.0.5:8786``; without one a local cluster of
    ``workers`` processes is started) and writes partitioned Parquet: ``output``
    and ``evidence_path`` name directories.  ``labeler`` reuses a pipeline
    already built for ``options.scheme``.  ``resume`` continues a killed local
    run from its last completed chunk (same input, options and ``chunk_rows``).
    """
    check_options(options)
    if engine not in ENGINES:
        raise ConfigError(f"--engine must be one of {', '.join(ENGINES)}, not {engine!r}")
    if workers < 1:
        raise ConfigError(f"--workers must be at least 1, not {workers}")
    if chunk_rows < 1:
        raise ConfigError(f"--chunk-rows must be at least 1, not {chunk_rows}")
    if engine == "dask":
        if resume:
            raise ConfigError(
                "--resume works with --engine local; the dask engine retries the partitions "
                "of a failed worker itself"
            )
        from .cluster import label_dask

        return label_dask(
            input_path,
            output,
            options,
            evidence_path=evidence_path,
            id_col=id_col,
            text_col=text_col,
            scheduler=scheduler,
            workers=workers,
            chunk_rows=chunk_rows,
        )
    if scheduler is not None:
        raise ConfigError("--scheduler needs --engine dask")
    # everything that can be refused is refused before anything is written
    check_output(output)
    if evidence_path is not None:
        check_output(evidence_path, "evidence")
    if not Path(input_path).exists():
        raise InputError("input not found; check the path", path=input_path)
    labeler = labeler if labeler is not None else Labeler(options.scheme)
    opts = replace(options, evidence=evidence_path is not None)
    columns = labeler.columns(options.per)
    keys = labeler.scheme.label_keys
    store = ChunkStore(
        output,
        evidence_path,
        identity=_identity(input_path, labeler, opts, evidence_path, id_col, text_col, chunk_rows),
        resume=resume,
        schema=label_schema(
            labeler.scheme, options.per, states=options.states, uncertain=options.uncertain
        ),
        evidence_schema=evidence_schema(redact=options.redact),
        evidence_has_text=not options.redact,
    )
    summary = RunSummary(label_keys=keys)
    for done in store.chunks:
        summary.add(RunSummary.from_dict(done, keys))
    if store.done:
        print(
            f"pathsieve: resuming {output} after {store.done} completed chunk(s) "
            f"({summary.rows} rows)",
            file=sys.stderr,
        )
    pool = None
    bar = None
    try:
        # completed chunks are read again (duplicate ids are counted across the whole
        # input) but not labelled again
        chunks = itertools.islice(
            _chunks(Path(input_path), id_col, text_col, chunk_rows), store.done, None
        )
        results: Iterator[LabelledChunk]
        if workers > 1:
            pool = _pool(workers, options.scheme, labeler)
            results = _ordered_map(pool, _label_in_worker, ((opts, c) for c in chunks), 2 * workers)
        else:
            results = (label_chunk(labeler, opts, c) for c in chunks)
        bar = _progress(progress)  # after the fork: the bar's monitor thread stays here
        if bar is not None:
            bar.update(summary.rows)
        for chunk in results:
            store.add(chunk.labels, chunk.evidence, chunk.summary.to_dict())
            summary.add(chunk.summary)
            if bar is not None:
                bar.update(len(chunk.labels))
        store.finish(pd.DataFrame(columns=columns), pd.DataFrame(columns=EVIDENCE_COLUMNS))
    except BaseException:
        # completed chunks stay on disk for --resume; a run that failed before
        # completing any (a wrong --text-col, say) leaves nothing behind
        store.close(keep=store.done > 0)
        raise
    finally:
        if pool is not None:
            pool.shutdown(cancel_futures=True)
            _WORKER.clear()
        if bar is not None:
            bar.close()
    return summary


def _identity(
    input_path: str | Path,
    labeler: Labeler,
    options: LabelOptions,
    evidence_path: str | Path | None,
    id_col: str,
    text_col: str,
    chunk_rows: int,
) -> dict[str, Any]:
    """What must not change between a run and its resumption."""
    from . import __version__
    from .vocab import file_digest, vocab_dir

    scheme = labeler.scheme
    vocab = sorted(p for p in vocab_dir().rglob("*") if p.is_file())
    return {
        "pathsieve": __version__,
        "input": input_fingerprint(input_path),
        "scheme": scheme.name,
        "scheme_file": file_digest(Path(scheme.path)),
        "ontology": scheme.ontology.digest,
        "vocabulary": file_digest(*vocab) if vocab else "",
        "options": {k: v for k, v in asdict(options).items() if k != "scheme"},
        "evidence": str(Path(evidence_path).resolve()) if evidence_path is not None else None,
        "columns": [id_col, text_col],
        "chunk_rows": chunk_rows,
    }


def _progress(enabled: bool) -> Any:
    if not enabled:
        return None
    from tqdm import tqdm

    return tqdm(unit=" cases", file=sys.stderr, mininterval=0.5)


def default_workers() -> int:
    """All the cores this process may use."""
    return max(
        1, len(os.sched_getaffinity(0)) if hasattr(os, "sched_getaffinity") else os.cpu_count() or 1
    )
