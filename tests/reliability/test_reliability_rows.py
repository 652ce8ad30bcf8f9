"""Property (hypothesis): whatever the export holds, the label table has exactly
one row per input row, in input order, each ``ok`` or ``error`` with a message.

Random hostile rows (ids empty, padded, repeated or odd; texts of random
Unicode, quotes, delimiters, CR and LF in any mix, NUL, right-to-left marks,
emoji, HTML and RTF remnants) are written as CSV, JSONL or Parquet with the
format's ordinary writer, labelled in chunks of random size, and read back.
"""

from __future__ import annotations

import json
import tempfile
from pathlib import Path

import pandas as pd
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from pathsieve import Labeler
from pathsieve.runner import LabelOptions, label_file

PIECES = [
    "DIAGNOSIS: ", "tubular adenoma", "negative for dysplasia", "adenocarcinoma, ", "A. ",
    '"', '""', ",", ";", "\t", "\r", "\n", "\r\n", "\x00", "\u202e", "\u200f", "😀", "é",
    "<b>", "</p>", "{\\rtf1 ", "\\par ", "&nbsp;", "\u2028", "\x85", " ",
]  # fmt: skip
TEXT = st.lists(st.one_of(st.sampled_from(PIECES), st.text(max_size=8)), max_size=25).map("".join)
ID = st.one_of(
    st.from_regex(r"[A-Z]{2}-[0-9]{3}", fullmatch=True),
    st.sampled_from(["", "  ", " X-1 ", "é-1", "a,b", 'q"1']),
)


def _expected(rows: list[tuple[str, str]]) -> tuple[list[str], list[bool]]:
    """Ids as the reader makes them (trimmed; ``row<N>`` when empty) and which must be ok."""
    ids, ok, seen = [], [], set()
    for n, (cid, text) in enumerate(rows, 1):
        key = cid.strip()
        ids.append(key or f"row{n}")
        ok.append(bool(key) and key not in seen and bool(text.strip()))
        if key:
            seen.add(key)
    return ids, ok


def _write(fmt: str, rows: list[tuple[str, str]], folder: Path) -> Path:
    df = pd.DataFrame(rows, columns=["case_id", "text"])
    path = folder / f"in.{fmt}"
    if fmt == "csv":
        df.to_csv(path, index=False)
    elif fmt == "parquet":
        df.to_parquet(path, index=False)
    else:
        with path.open("w", encoding="utf-8") as fh:
            for cid, text in rows:
                fh.write(json.dumps({"case_id": cid, "text": text}, ensure_ascii=False) + "\n")
    return path


@settings(
    max_examples=40,
    deadline=None,
    suppress_health_check=[HealthCheck.function_scoped_fixture, HealthCheck.too_slow],
)
@given(
    rows=st.lists(st.tuples(ID, TEXT), min_size=1, max_size=14),
    fmt=st.sampled_from(["csv", "jsonl", "parquet"]),
    chunk=st.integers(min_value=1, max_value=5),
)
def test_one_row_per_input_row_in_order(
    colorectal: Labeler, rows: list[tuple[str, str]], fmt: str, chunk: int
) -> None:
    with tempfile.TemporaryDirectory() as tmp:
        folder = Path(tmp)
        src = _write(fmt, rows, folder)
        out = folder / "out.csv"
        label_file(
            src,
            out,
            LabelOptions("colorectal"),
            evidence_path=folder / "ev.jsonl",
            chunk_rows=chunk,
            labeler=colorectal,
        )
        df = pd.read_csv(out, dtype=str, keep_default_na=False)
        ids, ok = _expected(rows)
        assert df["case_id"].tolist() == ids
        assert df["status"].tolist() == ["ok" if o else "error" for o in ok]
        assert all(e for s, e in zip(df["status"], df["error"], strict=True) if s == "error")
