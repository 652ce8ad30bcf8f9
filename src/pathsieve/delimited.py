"""Records of a delimited export (CSV/TSV), with broken quoting caught, not merged.

Report exports quote their text field, because reports hold line breaks and
commas.  One unescaped quote inside such a field (``"patient says "no" to…"``)
or a quote that is never closed makes a forgiving parser run on into the
following lines: the rows after it disappear into one overlong field, or to
the end of the file, and nothing says so.

This reader parses with Python's :mod:`csv` in strict mode, which notices the
moment the quoting stops making sense (a closing quote followed by a letter, or
the end of the file inside quotes).  The record that broke becomes an error
row, named by its first line; its following lines are parsed again from the
line after it, so the rows it swallowed come back as rows of their own.  Lines
that, read again, do not look like records are counted into the broken row,
whose error names every line it covers: fewer fields than the header, or a
first field not shaped like those of the sound rows (``HV25-S000001`` has the
shape ``a9-a9``; before any sound row, one without a digit or with a space).
Nothing is merged silently: each input line ends up in exactly one row, or in
one error row that names it.

The limit of the approach: a line of report text inside a broken row that
happens to look exactly like a record (the header's number of fields, and a
first field shaped like the case ids) is read as a row of its own.

A carriage return inside a line is text, not a line end, in a file whose lines
end in LF or CRLF (csv writers quote a field only for their own line end, so a
lone CR often stands unquoted); a file with CRs and no LF at all has CR line
ends.

Everything else follows the strict :mod:`csv` reading that partition planning
(:mod:`pathsieve.cluster`) uses, so both count the same rows: a line with no
field or one blank field is skipped; a row with extra fields keeps its first
columns (with a warning); a row with missing fields is padded with empty ones.

>>> import io
>>> text = 'case_id,text\\nA1,"fine"\\nA2,"never closed\\nA3,"fine again"\\n'
>>> lines = io.StringIO(text, newline="\\n")
>>> chunk = next(read_delimited(lines, delimiter=",", chunk_rows=10))
>>> chunk["case_id"].tolist(), [bool(p) for p in chunk[PROBLEM_COL]]
(['A1', 'A2', 'A3'], [False, True, False])
"""

from __future__ import annotations

import csv
import re
from collections import deque
from collections.abc import Callable, Iterable, Iterator
from dataclasses import dataclass

import pandas as pd

from .errors import InputError

__all__ = ["LINE_COL", "PROBLEM_COL", "is_blank_record", "key_shape", "read_delimited"]

#: Internal column: the first physical line of each row (1-based).
LINE_COL = "\x00line"
#: Internal column: why a row could not be read ("" for a sound row).
PROBLEM_COL = "\x00problem"

# a 5 MB report in one field is legitimate; the csv default limit is 128 KiB
csv.field_size_limit(max(csv.field_size_limit(), 2**31 - 1))

#: Longest first field that still looks like the start of a record when resynchronising.
_MAX_KEY = 64
#: Distinct first-field shapes remembered; past this the shape tells nothing.
_MAX_SHAPES = 64
_SHAPE_RUNS = re.compile(r"[^\W\d_]+|\d+|\s+")


def key_shape(key: str) -> str:
    """The shape of a first field: runs of letters -> ``a``, digits -> ``9``, spaces -> `` ``.

    >>> key_shape("HV25-S000001"), key_shape("tubular adenoma")
    ('a9-a9', 'a a')
    """

    def run(m: re.Match[str]) -> str:
        c = m.group(0)[0]
        return "9" if c.isdigit() else " " if c.isspace() else "a"

    return _SHAPE_RUNS.sub(run, key.strip())


def is_blank_record(record: list[str]) -> bool:
    """The rule for a skipped line: no field, or one blank field."""
    return len(record) == 0 or (len(record) == 1 and not record[0].strip())


#: Stands in for a carriage return inside a line while :mod:`csv` parses it (and for
#: itself, doubled); a private-use character, so almost never present to begin with.
_CR_MARK = "\uf8ff"
_UNMARK = re.compile(_CR_MARK + "(.)", re.DOTALL)


def _mark_cr(line: str, crlf: bool) -> str:
    """Hide the carriage returns inside a line from :mod:`csv` (with ``crlf``, not the
    CR of its CRLF ending)."""
    end = 2 if crlf and line.endswith("\r\n") else 1 if line.endswith("\n") else 0
    body = line[: len(line) - end]
    if "\r" not in body and _CR_MARK not in body:
        return line
    body = body.replace(_CR_MARK, _CR_MARK * 2).replace("\r", _CR_MARK + "r")
    return body + line[len(line) - end :]


def _unmark(field: str) -> str:
    if _CR_MARK not in field:
        return field
    return _UNMARK.sub(lambda m: "\r" if m.group(1) == "r" else _CR_MARK, field)


class _Lines:
    """Physical lines with their numbers; lines can be pushed back to be read again.

    With ``cr_is_text`` (a file whose lines end in LF or CRLF), a carriage
    return inside a line is report text, not a line end: writers quote a field
    only for the characters of their own line terminator, so a lone CR often
    stands unquoted in a field.  The first line tells the terminator: if it ends
    in CRLF, so do all (a CR before LF is the ending); if in LF, a CR before LF
    is text.  Such lines reach :mod:`csv` with the CR
    hidden (:func:`_mark_cr`); :attr:`marked` says the record's fields must be
    restored (:func:`_unmark`).
    """

    def __init__(self, lines: Iterable[str], first: int, *, cr_is_text: bool) -> None:
        self._it = iter(lines)
        self._fresh = first
        self._cr_is_text = cr_is_text
        self._crlf: bool | None = None
        self._back: deque[tuple[int, str]] = deque()
        self.taken: list[tuple[int, str]] = []  # the lines of the record being read
        self.marked = False
        self.fresh_read = 0
        self.reread = 0

    def __iter__(self) -> _Lines:
        return self

    def start_record(self) -> None:
        self.taken = []
        self.marked = False

    def __next__(self) -> str:
        if self._back:
            no, line = self._back.popleft()
            self.reread += 1
        else:
            line = next(self._it)
            if self._cr_is_text:
                if self._crlf is None:
                    self._crlf = line.endswith("\r\n")
                line = _mark_cr(line, self._crlf)
            no = self._fresh
            self._fresh += 1
            self.fresh_read += 1
        if _CR_MARK in line:
            self.marked = True
        self.taken.append((no, line))
        return line

    def push_back(self, lines: list[tuple[int, str]]) -> None:
        self._back.extendleft(reversed(lines))

    def may_reread(self, n: int) -> bool:
        # re-reading is bounded (a file of unclosed quotes would otherwise be quadratic);
        # past the bound the broken row simply covers its lines
        return self.reread + n <= 4 * self.fresh_read + 100_000


@dataclass
class _Broken:
    fields: list[str]
    first: int
    last: int
    reason: str

    def message(self) -> str:
        span = self.first if self.last == self.first else f"{self.first}-{self.last}"
        lines = f"line{'s' if self.last != self.first else ''} {span}"
        return (
            f"{lines}: {self.reason}; the row was not labelled and the rows after it were "
            "read from their own lines (fix the quoting: a quote inside a quoted field is "
            'written twice, "")'
        )


def _reason(exc: csv.Error) -> str:
    text = str(exc)
    if "expected after" in text:
        return "a quote inside a quoted field is not doubled"
    if "end of data" in text:
        return "a quoted field is never closed"
    return "the line cannot be read as CSV"


def _salvage(line: str, delimiter: str) -> list[str]:
    """The fields of the first line of a broken record, as well as they can be told."""
    text = _unmark(line.rstrip("\r\n"))
    try:  # the forgiving reading of this one line
        return next(csv.reader([text], delimiter=delimiter, strict=False))
    except (csv.Error, StopIteration):
        return [f.strip().strip('"') for f in text.split(delimiter)]


def _header_names(record: list[str]) -> list[str]:
    """Column names as pandas makes them: blank -> ``Unnamed: i``, repeats -> ``name.1``."""
    names: list[str] = []
    seen: dict[str, int] = {}
    for i, raw in enumerate(record):
        name = raw.lstrip("\ufeff") if i == 0 else raw
        name = name or f"Unnamed: {i}"
        if name in seen:
            seen[name] += 1
            name = f"{name}.{seen[name]}"
            while name in seen:
                name += ".1"
        seen.setdefault(name, 0)
        names.append(name)
    return names


def read_delimited(
    lines: Iterable[str],
    *,
    delimiter: str,
    chunk_rows: int,
    source: object = None,
    first_line: int = 1,
    cr_is_text: bool = True,
    warn: Callable[[str], None] | None = None,
) -> Iterator[pd.DataFrame]:
    """Chunks of at most ``chunk_rows`` rows: the header's columns (as strings),
    plus :data:`LINE_COL` and :data:`PROBLEM_COL`.

    ``lines`` are physical lines with their endings.  ``cr_is_text``: the lines
    end in LF (a file opened with ``newline="\\n"``) and a carriage return
    inside one is text; otherwise CR alone ends lines (``newline="\\r"``, an
    old Macintosh export).  The header is the first non-blank record.
    """
    src = _Lines(lines, first_line, cr_is_text=cr_is_text)
    reader = csv.reader(
        src,
        delimiter=delimiter,
        quotechar='"',
        doublequote=True,
        skipinitialspace=False,
        quoting=csv.QUOTE_MINIMAL,
        strict=True,
    )
    names: list[str] | None = None
    width = 1
    rows: list[list[str]] = []
    line_nos: list[int] = []
    problems: list[str] = []
    broken: _Broken | None = None
    shapes: set[str] = set()  # the shapes of sound rows' first fields (accession numbers...)
    wide_rows = 0
    yielded = False

    def emit(fields: list[str], line: int, problem: str) -> None:
        nonlocal wide_rows
        if len(fields) > width and not problem:  # a broken row's split is only a guess
            wide_rows += 1
        rows.append((fields + [""] * width)[:width])
        line_nos.append(line)
        problems.append(problem)

    def looks_like_record(rec: list[str]) -> bool:
        # after a break, a line starts a row again only if it has at least the header's
        # fields and a first field shaped like those of the sound rows so far (report
        # text seldom is)
        key = rec[0].strip()
        if len(rec) < width or not 0 < len(key) <= _MAX_KEY:
            return False
        if not shapes:  # the first row broke: nothing learnt yet; ids hold digits, no spaces
            return any(c.isdigit() for c in key) and not any(c.isspace() for c in key)
        return len(shapes) >= _MAX_SHAPES or key_shape(key) in shapes

    def frame(n: int) -> pd.DataFrame:
        """The first ``n`` rows collected, as a chunk (removed from the lists)."""
        assert names is not None
        df = pd.DataFrame(rows[:n], columns=names, dtype=object)
        df[LINE_COL] = line_nos[:n]
        df[PROBLEM_COL] = problems[:n]
        del rows[:n], line_nos[:n], problems[:n]
        return df

    while True:
        if len(rows) >= chunk_rows:  # whole chunks, however many rows one line gave
            yield frame(chunk_rows)
            yielded = True
        src.start_record()
        try:
            rec = next(reader)
        except StopIteration:
            break
        except csv.Error as exc:
            taken = src.taken
            if not taken:  # pragma: no cover - csv raises only after reading a line
                raise InputError(f"cannot read input: {exc}", path=source) from exc
            if names is None:
                raise InputError(
                    f"line {taken[0][0]}: the header row cannot be read as CSV ({_reason(exc)})",
                    path=source,
                    line=taken[0][0],
                ) from exc
            fields = _salvage(taken[0][1], delimiter)
            if broken is not None and looks_like_record(fields):
                # a second broken row right after the first: each is a row of its own
                emit(broken.fields, broken.first, broken.message())
                broken = None
            if broken is None:
                broken = _Broken(fields, taken[0][0], taken[0][0], _reason(exc))
            else:
                broken.last = taken[0][0]
            rest = taken[1:]
            if rest and src.may_reread(len(rest)):
                src.push_back(rest)
            else:
                broken.last = taken[-1][0]
            continue
        first, last = src.taken[0][0], src.taken[-1][0]
        if src.marked:
            rec = [_unmark(f) for f in rec]
        if is_blank_record(rec):
            continue
        if names is None:
            names = _header_names(rec)
            width = len(names)
            continue
        if broken is not None:
            if not looks_like_record(rec):
                broken.last = last
                continue
            emit(broken.fields, broken.first, broken.message())
            broken = None
        elif len(shapes) < _MAX_SHAPES:
            shapes.add(key_shape(rec[0]))
        emit(rec, first, "")
    if broken is not None:
        emit(broken.fields, broken.first, broken.message())
    if names is None:
        raise InputError("the file is empty (no header row)", path=source)
    while len(rows) > chunk_rows:
        yield frame(chunk_rows)
        yielded = True
    if rows or not yielded:
        yield frame(len(rows))  # a header and no rows: the columns are still checked
    if wide_rows and warn is not None:
        warn(
            f"{source}: {wide_rows} row(s) had more fields than the header's {width}; "
            "they were read from their first columns"
        )
