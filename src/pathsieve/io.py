"""Reading report exports and writing label tables.

Inputs: CSV/TSV (delimiter and encoding sniffed: UTF-8, with a Latin-1 fallback
that is reported), JSONL, Parquet, Excel, or a folder of ``.txt`` files (file
stem = case id).  Reading is chunked; every input row yields exactly one
record, marked with an error when its id or text is unusable, so nothing is
lost.  Outputs are written to a temporary file and renamed when complete.
"""

from __future__ import annotations

import csv
import io
import json
import os
import sys
from collections.abc import Callable, Iterator
from pathlib import Path
from typing import Any

import pandas as pd

from .errors import ConfigError, InputError

__all__ = [
    "OUTPUT_SUFFIXES",
    "TableWriter",
    "read_reports",
    "sniff_csv",
]

CHUNK_ROWS = 2000
OUTPUT_SUFFIXES = (".csv", ".parquet", ".jsonl")
_TEXT_SUFFIXES = {".csv", ".tsv", ".txt", ".jsonl", ".ndjson", ".parquet", ".xlsx", ".xls"}


def _warn(message: str) -> None:
    print(f"pathsieve: {message}", file=sys.stderr)


def sniff_csv(path: Path) -> tuple[str, str]:
    """Guess (encoding, delimiter) of a delimited text file."""
    head = path.read_bytes()[:65536]
    try:
        sample = head.decode("utf-8")
        encoding = "utf-8"
    except UnicodeDecodeError as exc:
        # a multi-byte character cut at the sample's end is not an encoding problem
        if exc.start >= len(head) - 4:
            sample = head[: exc.start].decode("utf-8")
            encoding = "utf-8"
        else:
            sample = head.decode("latin-1")
            encoding = "latin-1"
    if encoding == "utf-8":
        try:
            path.read_bytes().decode("utf-8")
        except UnicodeDecodeError:
            encoding = "latin-1"
    if path.suffix.lower() == ".tsv":
        return encoding, "\t"
    try:
        delim = csv.Sniffer().sniff(sample.split("\n", 20)[0] + "\n", delimiters=",\t;|").delimiter
    except csv.Error:
        delim = ","
    return encoding, delim


def _finish(
    df: pd.DataFrame, id_col: str, text_col: str, source: Path, first_row: int, seen: set[str]
) -> pd.DataFrame:
    """Normalise a raw chunk into case_id, text, row, error columns."""
    cols = list(df.columns)
    for col in (id_col, text_col):
        if col not in cols:
            raise InputError(
                f"column {col!r} not found (columns: {', '.join(map(str, cols))}); "
                f"pass --id-col/--text-col",
                path=source,
            )
    ids = df[id_col]
    texts = df[text_col]
    records = []
    for i, (cid, text) in enumerate(zip(ids.tolist(), texts.tolist(), strict=True)):
        row = first_row + i
        error = ""
        case_id = (
            "" if cid is None or (isinstance(cid, float) and pd.isna(cid)) else str(cid).strip()
        )
        if isinstance(text, bytes):
            text = text.decode("utf-8", errors="replace")
        if text is None or (isinstance(text, float) and pd.isna(text)):
            text = ""
        text = str(text)
        if not case_id:
            case_id = f"row{row}"
            error = f"{source}: row {row}: empty {id_col!r}; the row was given id {case_id}"
        elif case_id in seen:
            error = f"{source}: row {row}: duplicate case id {case_id!r}; ids must be unique"
        elif not text.strip():
            error = f"{source}: row {row}: column {text_col!r} is empty"
        seen.add(case_id)
        records.append((case_id, text, row, error))
    return pd.DataFrame.from_records(records, columns=["case_id", "text", "row", "error"])


def read_reports(
    path: str | Path,
    *,
    id_col: str = "case_id",
    text_col: str = "text",
    chunk_rows: int = CHUNK_ROWS,
    warn: Callable[[str], None] = _warn,
) -> Iterator[pd.DataFrame]:
    """Yield chunks with columns ``case_id, text, row, error`` (row is 1-based data row).

    >>> next(read_reports("examples/demo_reports.csv")).columns.tolist()
    ['case_id', 'text', 'row', 'error']
    """
    source = Path(path)
    if not source.exists():
        raise InputError("input not found; check the path", path=source)
    seen: set[str] = set()
    if source.is_dir():
        yield from _read_folder(source, chunk_rows, seen)
        return
    suffix = source.suffix.lower()
    row = 1
    for raw in _raw_chunks(source, suffix, id_col, text_col, chunk_rows, warn):
        chunk = _finish(raw, id_col, text_col, source, row, seen)
        row += len(chunk)
        yield chunk


def _raw_chunks(
    source: Path,
    suffix: str,
    id_col: str,
    text_col: str,
    chunk_rows: int,
    warn: Callable[[str], None],
) -> Iterator[pd.DataFrame]:
    try:
        if suffix == ".parquet":
            import pyarrow.parquet as pq

            pf = pq.ParquetFile(source)
            names = pf.schema_arrow.names
            wanted = [c for c in (id_col, text_col) if c in names]
            if len(wanted) < 2:
                yield pd.DataFrame(columns=names)
                return
            for batch in pf.iter_batches(batch_size=chunk_rows, columns=wanted):
                yield batch.to_pandas()
        elif suffix in (".jsonl", ".ndjson"):
            yield from _read_jsonl(source, chunk_rows)
        elif suffix in (".xlsx", ".xls"):
            df = pd.read_excel(source, dtype=str)
            for i in range(0, max(len(df), 1), chunk_rows):
                yield df.iloc[i : i + chunk_rows]
        else:
            encoding, delim = sniff_csv(source)
            if encoding != "utf-8":
                warn(f"{source}: not valid UTF-8; read as Latin-1 (check accented characters)")
            width = _header_width(source, encoding, delim)
            reader = pd.read_csv(
                source,
                sep=delim,
                dtype=str,
                keep_default_na=False,
                encoding=encoding,
                chunksize=chunk_rows,
                on_bad_lines=lambda bad: _bad_line(source, bad, width, warn),
                engine="python",
            )
            yield from reader
    except InputError:
        raise
    except (ValueError, OSError, pd.errors.ParserError) as exc:
        raise InputError(f"cannot read input: {exc}", path=source) from exc


def _header_width(source: Path, encoding: str, delim: str) -> int:
    with source.open("r", encoding=encoding, newline="") as fh:
        header = next(csv.reader(fh, delimiter=delim), [])
    return max(len(header), 1)


def _bad_line(source: Path, bad: list[str], width: int, warn: Callable[[str], None]) -> list[str]:
    """Keep a row with extra fields (its first columns) rather than lose it."""
    warn(
        f"{source}: a row with {len(bad)} fields (header has {width}) was read from its first columns"
    )
    return (bad + [""] * width)[:width]


def _read_jsonl(source: Path, chunk_rows: int) -> Iterator[pd.DataFrame]:
    rows: list[dict[str, Any]] = []
    with source.open("r", encoding="utf-8", errors="replace") as fh:
        for n, line in enumerate(fh, 1):
            if not line.strip():
                continue
            try:
                obj = json.loads(line)
                if not isinstance(obj, dict):
                    raise ValueError("not an object")
            except ValueError as exc:
                raise InputError(
                    f"line {n} is not a JSON object ({exc})", path=source, line=n
                ) from exc
            rows.append(obj)
            if len(rows) >= chunk_rows:
                yield pd.DataFrame(rows)
                rows = []
    if rows:
        yield pd.DataFrame(rows)


def _read_folder(folder: Path, chunk_rows: int, seen: set[str]) -> Iterator[pd.DataFrame]:
    files = sorted(p for p in folder.iterdir() if p.suffix.lower() == ".txt" and p.is_file())
    if not files:
        raise InputError("folder holds no .txt files", path=folder)
    for i in range(0, len(files), chunk_rows):
        batch = files[i : i + chunk_rows]
        texts = []
        for p in batch:
            data = p.read_bytes()
            try:
                texts.append(data.decode("utf-8"))
            except UnicodeDecodeError:
                _warn(f"{p}: not valid UTF-8; read as Latin-1")
                texts.append(data.decode("latin-1"))
        raw = pd.DataFrame({"case_id": [p.stem for p in batch], "text": texts})
        yield _finish(raw, "case_id", "text", folder, i + 1, seen)


class TableWriter:
    """Write a table in chunks to .csv, .parquet or .jsonl, atomically.

    Rows go to ``<out>.partial`` and the file is renamed to ``<out>`` only on a
    clean close, so an interrupted run never leaves a table that looks complete.
    """

    def __init__(self, path: str | Path) -> None:
        self.path = Path(path)
        self.suffix = self.path.suffix.lower()
        if self.suffix not in OUTPUT_SUFFIXES:
            raise ConfigError(f"output {self.path} must end in {', '.join(OUTPUT_SUFFIXES)}")
        parent = self.path.parent
        if not parent.is_dir():
            raise ConfigError(f"output folder {parent} does not exist; create it first")
        if not os.access(parent, os.W_OK):
            raise ConfigError(f"output folder {parent} is not writable")
        self.tmp = self.path.with_name(self.path.name + ".partial")
        self._parquet: Any = None
        self._schema: Any = None
        self._fh: io.TextIOBase | None = None
        self._header_done = False
        self.rows = 0

    def write(self, df: pd.DataFrame) -> None:
        if self.suffix == ".parquet":
            import pyarrow as pa
            import pyarrow.parquet as pq

            if self._parquet is None:
                table = pa.Table.from_pandas(df, preserve_index=False)
                self._schema = table.schema
                self._parquet = pq.ParquetWriter(self.tmp, self._schema)
            else:
                table = pa.Table.from_pandas(df, schema=self._schema, preserve_index=False)
            self._parquet.write_table(table)
        else:
            if self._fh is None:
                self._fh = open(self.tmp, "w", encoding="utf-8", newline="")  # noqa: SIM115
            if self.suffix == ".csv":
                df.to_csv(self._fh, index=False, header=not self._header_done, lineterminator="\n")
                self._header_done = True
            else:
                for rec in df.to_dict(orient="records"):
                    self._fh.write(json.dumps(_jsonable(rec), ensure_ascii=False) + "\n")
        self.rows += len(df)

    def close(self) -> None:
        if self._parquet is not None:
            self._parquet.close()
        if self._fh is not None:
            self._fh.close()
        if not self.tmp.exists():
            self.tmp.write_text("")  # an empty input still yields a (header-less) file
        self.tmp.replace(self.path)

    def abort(self) -> None:
        if self._parquet is not None:
            self._parquet.close()
        if self._fh is not None:
            self._fh.close()
        self.tmp.unlink(missing_ok=True)

    def __enter__(self) -> TableWriter:
        return self

    def __exit__(self, exc_type: object, *_: object) -> None:
        if exc_type is None:
            self.close()
        else:
            self.abort()


def _jsonable(rec: dict[str, Any]) -> dict[str, Any]:
    out = {}
    for k, v in rec.items():
        if isinstance(v, float) and v != v:
            out[k] = None
        elif hasattr(v, "tolist"):
            out[k] = v.tolist()
        else:
            out[k] = v
    return out
