"""Label a report export end to end: read in chunks, label, write tables.

Every input row yields exactly one output row (per case) in input order, with
``status`` ok or error; the evidence table holds one row per mention and value.
``workers > 1`` labels chunks in worker processes; the output is identical to a
one-process run (chunks are written back in input order).
"""

from __future__ import annotations

import os
import sys
from collections import Counter
from collections.abc import Iterator
from concurrent.futures import ProcessPoolExecutor
from dataclasses import dataclass, field
from pathlib import Path
from typing import Any

import pandas as pd

from .errors import ConfigError
from .export import EVIDENCE_COLUMNS, UNCERTAIN_MODES
from .io import CHUNK_ROWS, TableWriter, read_reports
from .labeler import Labeler, frame_from_rows

__all__ = ["LabelOptions", "RunSummary", "label_file"]


@dataclass(frozen=True)
class LabelOptions:
    scheme: str
    per: str = "case"
    states: bool = False
    uncertain: str | None = None
    redact: bool = False
    evidence: bool = False


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


_WORKER: dict[str, Any] = {}


def _init_worker(scheme: str) -> None:
    _WORKER["labeler"] = Labeler(scheme)


def _label_chunk(
    args: tuple[LabelOptions, list[tuple[str, str, str]]],
) -> tuple[list[dict[str, Any]], list[dict[str, Any]]]:
    opts, records = args
    labeler: Labeler = _WORKER["labeler"]
    return labeler.label_records(
        records,
        per=opts.per,
        states=opts.states,
        uncertain=opts.uncertain,
        redact=opts.redact,
        evidence=opts.evidence,
    )


def _chunks(
    path: Path, id_col: str, text_col: str, chunk_rows: int
) -> Iterator[list[tuple[str, str, str]]]:
    for chunk in read_reports(path, id_col=id_col, text_col=text_col, chunk_rows=chunk_rows):
        yield list(zip(chunk.case_id, chunk.text, chunk.error, strict=True))


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
) -> RunSummary:
    """Label every report of ``input_path`` into ``output`` (and ``evidence_path``)."""
    if options.per not in ("case", "part"):
        raise ConfigError(f"--per must be case or part, not {options.per!r}")
    if options.uncertain is not None and options.uncertain not in UNCERTAIN_MODES:
        raise ConfigError(f"--uncertain must be one of {', '.join(UNCERTAIN_MODES)}")
    labeler = Labeler(options.scheme)  # fails fast on a bad scheme, before anything is written
    opts = LabelOptions(
        options.scheme,
        options.per,
        options.states,
        options.uncertain,
        options.redact,
        evidence=evidence_path is not None,
    )
    columns = labeler.columns(options.per)
    writer = TableWriter(output)
    ev_writer = TableWriter(evidence_path) if evidence_path is not None else None
    summary = RunSummary(label_keys=labeler.scheme.label_keys)
    bar = _progress(progress)
    pool = None
    try:
        chunks = _chunks(Path(input_path), id_col, text_col, chunk_rows)
        if workers > 1:
            pool = ProcessPoolExecutor(
                workers, initializer=_init_worker, initargs=(options.scheme,)
            )
            results = pool.map(_label_chunk, ((opts, c) for c in chunks))
        else:
            _WORKER["labeler"] = labeler
            results = (_label_chunk((opts, c)) for c in chunks)
        for rows, ev in results:
            df = frame_from_rows(rows, columns, labeler.scheme, states=options.states)
            writer.write(df)
            if ev_writer is not None:
                ev_writer.write(pd.DataFrame(ev, columns=EVIDENCE_COLUMNS))
            _tally(summary, df, options, len(ev))
            if bar is not None:
                bar.update(len(df))
        if summary.rows == 0:
            writer.write(pd.DataFrame(columns=columns))
        writer.close()
        if ev_writer is not None:
            if summary.evidence_rows == 0:
                ev_writer.write(pd.DataFrame(columns=EVIDENCE_COLUMNS))
            ev_writer.close()
    except BaseException:
        writer.abort()
        if ev_writer is not None:
            ev_writer.abort()
        raise
    finally:
        if pool is not None:
            pool.shutdown(cancel_futures=True)
        if bar is not None:
            bar.close()
    return summary


def _tally(summary: RunSummary, df: pd.DataFrame, options: LabelOptions, n_ev: int) -> None:
    summary.rows += len(df)
    summary.cases += df["case_id"].nunique() if options.per == "part" else len(df)
    summary.errors += int((df["status"] == "error").sum())
    summary.evidence_rows += n_ev
    for key in summary.label_keys:
        col = df[key]
        if options.states:
            hit = col.isin(["present", "likely"])
        else:
            hit = pd.to_numeric(col, errors="coerce") >= 0.75
        summary.prevalence[key] += int(hit.sum())


def _progress(enabled: bool) -> Any:
    if not enabled:
        return None
    from tqdm import tqdm

    return tqdm(unit=" cases", file=sys.stderr, mininterval=0.5)


def default_workers() -> int:
    return max(
        1, len(os.sched_getaffinity(0)) if hasattr(os, "sched_getaffinity") else os.cpu_count() or 1
    )
