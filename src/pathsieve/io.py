"""Reading report exports and writing label tables.

Inputs: CSV/TSV (delimiter and encoding sniffed: UTF-8, UTF-16 with its byte
order mark, or a Latin-1 fallback that is reported), JSONL, Parquet, Excel, or
a folder of ``.txt`` files (file stem = case id).  Reading is chunked; every
input row yields exactly one record, marked with an error when its id or text
is unusable (no id, a repeated id, no text, a CSV row whose quoting is broken, a
JSONL line that is not a JSON object), so nothing is lost.  Error messages name
the file, row and line, never the report text.  Outputs are written to a
temporary file and renamed when complete.
"""

from __future__ import annotations

import codecs
import csv
import hashlib
import io
import json
import os
import re
import sys
from collections.abc import Callable, Iterator
from pathlib import Path
from typing import Any

import pandas as pd

from .delimited import LINE_COL, PROBLEM_COL, read_delimited
from .errors import ConfigError, InputError

__all__ = [
    "CHUNK_ROWS",
    "OUTPUT_SUFFIXES",
    "SeenIds",
    "TableWriter",
    "case_id_of",
    "csv_chunks",
    "jsonl_chunks",
    "read_reports",
    "sniff_csv",
    "txt_frame",
]

CHUNK_ROWS = 2000
OUTPUT_SUFFIXES = (".csv", ".parquet", ".jsonl")
_TEXT_SUFFIXES = {".csv", ".tsv", ".txt", ".jsonl", ".ndjson", ".parquet", ".xlsx", ".xls"}


def _warn(message: str) -> None:
    print(f"pathsieve: {message}", file=sys.stderr)


def _is_utf8(path: Path, block: int = 1 << 20) -> bool:
    """Whether the whole file decodes as UTF-8, read in blocks (memory stays flat)."""
    import codecs

    decoder = codecs.getincrementaldecoder("utf-8")()
    try:
        with path.open("rb") as fh:
            while data := fh.read(block):
                decoder.decode(data)
            decoder.decode(b"", final=True)
    except UnicodeDecodeError:
        return False
    return True


def sniff_csv(path: Path) -> tuple[str, str]:
    """Guess (encoding, delimiter) of a delimited text file.

    UTF-16 is recognised by its byte order mark (spreadsheet programs' "Unicode
    text" export); otherwise UTF-8 if the whole file decodes, else Latin-1.
    """
    with path.open("rb") as fh:
        head = fh.read(65536)
    if head.startswith((codecs.BOM_UTF16_LE, codecs.BOM_UTF16_BE)):
        sample = head[: len(head) // 2 * 2].decode("utf-16", errors="replace")
        delims = "\t" if path.suffix.lower() == ".tsv" else _sniff_delimiter(sample)
        return "utf-16", delims
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
    if encoding == "utf-8" and not _is_utf8(path):
        encoding = "latin-1"
    if path.suffix.lower() == ".tsv":
        return encoding, "\t"
    return encoding, _sniff_delimiter(sample)


def _sniff_delimiter(sample: str) -> str:
    try:
        return csv.Sniffer().sniff(sample.split("\n", 20)[0] + "\n", delimiters=",\t;|").delimiter
    except csv.Error:
        return ","


class SeenIds:
    """The case ids read so far, for duplicate detection in constant memory per id.

    A set of a million id strings takes some 90 MB; here the ids of earlier
    chunks are kept as 128-bit BLAKE2 digests in one sorted array (16 bytes an
    id; two different ids sharing a digest is beyond any realistic archive),
    and only the current chunk's ids as strings, until :meth:`seal`.

    >>> seen = SeenIds(); seen.add("S-1"); seen.seal()
    >>> "S-1" in seen, "S-2" in seen
    (True, False)
    """

    def __init__(self) -> None:
        import numpy as np

        self._np = np
        self._sealed = np.empty(0, dtype="S16")
        self._chunk: set[str] = set()

    @staticmethod
    def _digest(cid: str) -> bytes:
        return hashlib.blake2b(cid.encode("utf-8", "surrogatepass"), digest_size=16).digest()

    def __contains__(self, cid: object) -> bool:
        if cid in self._chunk:
            return True
        if not isinstance(cid, str) or not len(self._sealed):
            return False
        d = self._digest(cid)
        i = int(self._np.searchsorted(self._sealed, d))
        # numpy hands back fixed-width bytes without their trailing NULs; digests are all
        # 16 bytes long, so equal once stripped means equal
        return i < len(self._sealed) and bytes(self._sealed[i]) == d.rstrip(b"\0")

    def add(self, cid: str) -> None:
        self._chunk.add(cid)

    def seal(self) -> None:
        """Fold the current chunk's ids into the digest array."""
        if not self._chunk:
            return
        np = self._np
        new = np.sort(np.array([self._digest(c) for c in self._chunk], dtype="S16"))
        # merge into the sorted array: one copy, not a re-sort of everything seen
        self._sealed = np.insert(self._sealed, np.searchsorted(self._sealed, new), new)
        self._chunk = set()


def case_id_of(cid: Any) -> str:
    """A raw id cell as a case id: trimmed text, "" when missing (the row then gets ``row<N>``)."""
    return "" if cid is None or (isinstance(cid, float) and pd.isna(cid)) else str(cid).strip()


_SURROGATE = re.compile("[\ud800-\udfff]")


def _clean(value: str) -> str:
    """Lone surrogates (a JSON ``"\\ud800"`` escape) become U+FFFD: one character for one,
    so offsets hold, and the text can be written as UTF-8."""
    return _SURROGATE.sub("\ufffd", value) if _SURROGATE.search(value) else value


def _finish(
    df: pd.DataFrame,
    id_col: str,
    text_col: str,
    source: Path,
    first_row: int,
    seen: set[str] | SeenIds,
) -> pd.DataFrame:
    """Normalise a raw chunk into case_id, text, row, error columns."""
    cols = list(df.columns)
    problems = df[PROBLEM_COL].tolist() if PROBLEM_COL in cols else [""] * len(df)
    for col in (id_col, text_col):
        if col not in cols:
            if len(df) and all(problems):
                df = df.assign(**{col: ""})  # only unreadable rows: nothing to look for
                continue
            shown = [str(c) for c in cols if c not in (PROBLEM_COL, LINE_COL)]
            raise InputError(
                f"column {col!r} not found (columns: {', '.join(shown)}); pass --id-col/--text-col",
                path=source,
            )
    ids = df[id_col]
    texts = df[text_col]
    records = []
    for i, (cid, text) in enumerate(zip(ids.tolist(), texts.tolist(), strict=True)):
        row = first_row + i
        error = ""
        case_id = _clean(case_id_of(cid))
        if isinstance(text, bytes):
            text = text.decode("utf-8", errors="replace")
        if text is None or (isinstance(text, float) and pd.isna(text)):
            text = ""
        text = _clean(str(text))
        # (no line numbers here: a cluster partition counts lines from its own start)
        where = f"row {row}"
        if problems[i]:
            case_id = case_id or f"row{row}"
            error = f"{source}: row {row}: {problems[i]}"
            text = ""
        elif not case_id:
            case_id = f"row{row}"
            error = f"{source}: {where}: empty {id_col!r}; the row was given id {case_id}"
        elif case_id in seen:
            error = f"{source}: {where}: duplicate case id {case_id!r}; ids must be unique"
        elif not text.strip():
            error = f"{source}: {where}: column {text_col!r} is empty"
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
    seen = SeenIds()
    if source.is_dir():
        yield from _read_folder(source, chunk_rows, seen)
        return
    suffix = source.suffix.lower()
    row = 1
    for raw in _raw_chunks(source, suffix, id_col, text_col, chunk_rows, warn):
        chunk = _finish(raw, id_col, text_col, source, row, seen)
        seen.seal()
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

            # no pre-buffering: its read cache keeps every row group read so far (memory
            # would grow with the file)
            pf = pq.ParquetFile(source, pre_buffer=False)
            names = pf.schema_arrow.names
            wanted = [c for c in (id_col, text_col) if c in names]
            if len(wanted) < 2:
                yield pd.DataFrame(columns=names)
                return
            for batch in pf.iter_batches(batch_size=chunk_rows, columns=wanted):
                # integers stay integers beside a null: an id reads "7", never "7.0"
                # (which would depend on whether its chunk happened to hold a null)
                yield batch.to_pandas(integer_object_nulls=True)
        elif suffix in (".jsonl", ".ndjson"):
            yield from jsonl_chunks(source, chunk_rows)
        elif suffix in (".xlsx", ".xls"):
            df = pd.read_excel(source, dtype=str)
            for i in range(0, max(len(df), 1), chunk_rows):
                yield df.iloc[i : i + chunk_rows]
        else:
            encoding, delim = sniff_csv(source)
            if encoding == "latin-1":
                warn(f"{source}: not valid UTF-8; read as Latin-1 (check accented characters)")
            width = _header_width(source, encoding, delim)
            yield from csv_chunks(source, source, encoding, delim, width, chunk_rows, warn)
    except InputError:
        raise
    except (ValueError, OSError, pd.errors.ParserError) as exc:
        raise InputError(f"cannot read input: {exc}", path=source) from exc


def csv_chunks(
    data: Path | io.StringIO,
    source: Path,
    encoding: str,
    delim: str,
    width: int,
    chunk_rows: int,
    warn: Callable[[str], None] = _warn,
) -> Iterator[pd.DataFrame]:
    """Raw chunks of a delimited file (or of a slice of one, header first, as text).

    One reader for every engine (:func:`pathsieve.delimited.read_delimited`), so
    the cluster engine, which parses byte ranges of a file, reads exactly the
    rows a whole-file run does.  ``width`` is the header's (kept for callers; the
    reader takes it from the header it reads).
    """
    if isinstance(data, Path):
        with data.open("r", encoding=encoding, newline="") as fh:
            head = fh.read(65536)
        # lines end in LF (or CRLF), and a lone CR is text; a file with CRs and no LF at
        # all is an old Macintosh export, whose lines end in CR
        cr_lines = "\n" not in head and "\r" in head
        with data.open("r", encoding=encoding, newline="\r" if cr_lines else "\n") as fh:
            yield from read_delimited(
                fh,
                delimiter=delim,
                chunk_rows=chunk_rows,
                source=source,
                cr_is_text=not cr_lines,
                warn=warn,
            )
    else:  # a cluster partition's text, split at LF (``newline="\\n"``)
        yield from read_delimited(
            data, delimiter=delim, chunk_rows=chunk_rows, source=source, warn=warn
        )


def _header_width(source: Path, encoding: str, delim: str) -> int:
    with source.open("r", encoding=encoding, newline="") as fh:
        header = next(csv.reader(fh, delimiter=delim), [])
    return max(len(header), 1)


def jsonl_chunks(
    source: Path, chunk_rows: int, *, start: int = 0, end: int | None = None, first_line: int = 1
) -> Iterator[pd.DataFrame]:
    """Chunks of a JSONL file, or of the lines in bytes ``[start, end)`` of it.

    A line that is not a JSON object becomes a row of its own, with a problem
    that :func:`_finish` turns into an error naming the line (never its text).
    """
    rows: list[dict[str, Any]] = []
    with source.open("rb") as raw:
        raw.seek(start)
        data: Any = raw if end is None else io.BytesIO(raw.read(end - start))
        fh = io.TextIOWrapper(data, encoding="utf-8", errors="replace", newline=None)
        for n, line in enumerate(fh, first_line):
            if not line.strip():
                continue
            try:
                obj = json.loads(line)
            except ValueError as exc:
                # json's message gives a position, never the document
                obj = {PROBLEM_COL: f"line {n} is not valid JSON ({exc}); fix or remove it"}
            if not isinstance(obj, dict):
                obj = {PROBLEM_COL: f"line {n} holds a JSON {type(obj).__name__}, not an object"}
            obj.setdefault(PROBLEM_COL, "")
            rows.append(obj)
            if len(rows) >= chunk_rows:
                yield _json_frame(rows)
                rows = []
    if rows:
        yield _json_frame(rows)


def _json_frame(rows: list[dict[str, Any]]) -> pd.DataFrame:
    # object columns keep each value as parsed: an integer id reads "7", never "7.0"
    # because another row of its chunk lacks the id
    return pd.DataFrame(rows, dtype=object)


def _read_folder(folder: Path, chunk_rows: int, seen: SeenIds) -> Iterator[pd.DataFrame]:
    files = sorted(p for p in folder.iterdir() if p.suffix.lower() == ".txt" and p.is_file())
    if not files:
        raise InputError("folder holds no .txt files", path=folder)
    for i in range(0, len(files), chunk_rows):
        batch = files[i : i + chunk_rows]
        chunk = _finish(txt_frame(batch), "case_id", "text", folder, i + 1, seen)
        seen.seal()
        yield chunk


def txt_frame(files: list[Path]) -> pd.DataFrame:
    """``case_id`` (file stem) and ``text`` of some .txt files (UTF-8, else Latin-1)."""
    texts = []
    for p in files:
        data = p.read_bytes()
        try:
            texts.append(data.decode("utf-8"))
        except UnicodeDecodeError:
            _warn(f"{p}: not valid UTF-8; read as Latin-1")
            texts.append(data.decode("latin-1"))
    return pd.DataFrame({"case_id": [p.stem for p in files], "text": texts})


class TableWriter:
    """Write a table in chunks to .csv, .parquet or .jsonl, atomically.

    Rows go to ``<out>.partial`` and the file is renamed to ``<out>`` only on a
    clean close, so an interrupted run never leaves a table that looks complete.
    """

    def __init__(self, path: str | Path, *, schema: Any = None) -> None:
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
        self._schema: Any = schema  # a pyarrow schema fixes Parquet column types up front
        self._fh: io.TextIOBase | None = None
        self._header_done = False
        self.rows = 0

    def write(self, df: pd.DataFrame) -> None:
        if self.suffix == ".parquet":
            import pyarrow as pa
            import pyarrow.parquet as pq

            if self._schema is None:
                table = pa.Table.from_pandas(df, preserve_index=False)
                self._schema = table.schema
            else:
                table = pa.Table.from_pandas(df, schema=self._schema, preserve_index=False)
            if self._parquet is None:
                self._parquet = pq.ParquetWriter(self.tmp, table.schema)
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


def _jsonable(rec: dict[Any, Any]) -> dict[Any, Any]:
    out: dict[Any, Any] = {}
    for k, v in rec.items():
        if isinstance(v, float) and v != v:
            out[k] = None
        elif hasattr(v, "tolist"):
            out[k] = v.tolist()
        else:
            out[k] = v
    return out
