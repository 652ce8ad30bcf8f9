"""Malformed exports: broken quoting never merges rows, nothing is dropped silently.

A forgiving CSV parser lets one unclosed quote swallow the rows after it into
one field, or to the end of the file, without a word.  pathsieve's reader
(:mod:`pathsieve.delimited`) turns the broken row into an error row naming its
lines and reads the rows after it from their own lines.  The property test
writes random rows with :mod:`csv` (the reference writer), breaks one row's
quoting, and checks that every other row comes back exactly.
"""

from __future__ import annotations

import csv
import io
from pathlib import Path

import pandas as pd
import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from pathsieve import Labeler
from pathsieve.delimited import PROBLEM_COL, key_shape, read_delimited
from pathsieve.errors import InputError
from pathsieve.io import read_reports, sniff_csv
from pathsieve.runner import LabelOptions, label_file


def _read(path: Path) -> pd.DataFrame:
    return pd.concat(list(read_reports(path, chunk_rows=3, warn=lambda m: None)))


HEAD = "case_id,text\n"

# (name, file body after the header, expected ids, expected statuses, line named by the error)
BROKEN = [
    (
        "unclosed-then-quoted-rows",
        'S1,"tubular adenoma."\nS2,"no closing quote\nS3,"adenocarcinoma."\nS4,"polyp."\n',
        ["S1", "S2", "S3", "S4"],
        ["", "error", "", ""],
        "line 3",
    ),
    (
        "unclosed-to-end-of-file",
        'S1,"tubular adenoma."\nS2,"no closing quote\nS3,plain\nS4,plain too\n',
        ["S1", "S2", "S3", "S4"],
        ["", "error", "", ""],
        "line 3",
    ),
    (
        "stray-quote-in-multiline-report",
        'S1,"a"\nS2,"line one\nline "two" three\nend"\nS3,"x"\n',
        ["S1", "S2", "S3"],
        ["", "error", ""],
        "lines 3-5",
    ),
    (
        "stray-quote-text-with-commas",
        'S1,"a"\nS2,"Margins: free, 2 mm\nsee "note" below\n"\nS3,"y"\n',
        ["S1", "S2", "S3"],
        ["", "error", ""],
        "lines 3-5",
    ),
    (
        "undoubled-quote-one-line",
        'S1,"says "no" to it"\nS2,"ok"\n',
        ["S1", "S2"],
        ["error", ""],
        "line 2",
    ),
    (
        "unclosed-last-row",
        'S1,"a"\nS2,"never closed\n',
        ["S1", "S2"],
        ["", "error"],
        "line 3",
    ),
    (
        "two-broken-rows-in-a-row",
        'S1,"a"\nS2,"no close\nS3,"no close either\nS4,"b"\n',
        ["S1", "S2", "S3", "S4"],
        ["", "error", "error", ""],
        "line 3",
    ),
    (
        "quoted-id-holding-the-delimiter",
        '"S,1","a"\n"S,2","a ""fine"" quote and a "stray" one"\n"S,3","b"\n',
        ["S,1", "S,2", "S,3"],
        ["", "error", ""],
        "line 3",
    ),
    (
        "crlf-unclosed",
        'case_id,text\r\nS1,"a"\r\nS2,"no close\r\nS3,"b"\r\n',
        ["S1", "S2", "S3"],
        ["", "error", ""],
        "line 3",
    ),
]


@pytest.mark.parametrize(
    ("body", "ids", "errors", "lines"), [c[1:] for c in BROKEN], ids=[c[0] for c in BROKEN]
)
def test_broken_quoting_is_one_error_row(
    tmp_path: Path, body: str, ids: list[str], errors: list[str], lines: str
) -> None:
    src = tmp_path / "in.csv"
    src.write_text(
        body if body.startswith("case_id") else HEAD + body, encoding="utf-8", newline=""
    )
    df = _read(src)
    assert df["case_id"].tolist() == ids
    got = ["error" if e else "" for e in df["error"]]
    assert got == errors
    bad = df.loc[df["error"] != "", "error"].tolist()
    first_row = errors.index("error") + 1
    assert bad[0].startswith(f"{src}: row {first_row}: {lines}: ")
    assert all("quot" in msg for msg in bad)


@pytest.mark.parametrize(
    ("body", "ids", "texts"),
    [
        # extra fields: the first columns are kept
        (
            'k1,"a"\nk2,plain text,extra,columns\nk3,"q, c"\n',
            ["k1", "k2", "k3"],
            ["a", "plain text", "q, c"],
        ),
        # blank and whitespace-only lines between rows are skipped
        ("k1,a\n\n   \n\t\nk2,b\n", ["k1", "k2"], ["a", "b"]),
        # line ends inside quotes kept as written; the header's LF ends every line, so a
        # CR before an LF is text (csv writers quote a field only for their own line end)
        ('k1,"x\r\ny\rz\nw"\nk2,b\nk3,c\r\r\n', ["k1", "k2", "k3"], ["x\r\ny\rz\nw", "b", "c\r\r"]),
        ("k1,a\rb\nk2,c\r\n", ["k1", "k2"], ["a\rb", "c\r"]),
        # a CRLF header: CRLF ends every line, CRs elsewhere are text
        (
            'case_id,text\r\nk1,"x\r\ny"\r\nk2,b\r\r\nk3,c\rd\r\n',
            ["k1", "k2", "k3"],
            ["x\r\ny", "b\r", "c\rd"],
        ),
        # NUL, right-to-left marks, emoji, HTML and RTF remnants inside a field
        (
            'k1,"\x00a\u202eb 😀 <b>x</b> {\\rtf1 \\par}"\n',
            ["k1"],
            ["\x00a\u202eb 😀 <b>x</b> {\\rtf1 \\par}"],
        ),
        # doubled quotes are quotes
        ('k1,"he said ""no"""\n', ["k1"], ['he said "no"']),
    ],
    ids=[
        "extra-columns",
        "blank-lines",
        "line-endings",
        "lone-cr",
        "crlf-file",
        "odd-characters",
        "doubled-quotes",
    ],
)
def test_sound_oddities_keep_every_row(
    tmp_path: Path, body: str, ids: list[str], texts: list[str]
) -> None:
    src = tmp_path / "in.csv"
    src.write_text(
        body if body.startswith("case_id") else HEAD + body, encoding="utf-8", newline=""
    )
    df = _read(src)
    assert df["case_id"].tolist() == ids
    assert df["text"].tolist() == texts
    assert (df["error"] == "").all()


def test_pandas_written_lone_cr_round_trips(tmp_path: Path) -> None:
    # pandas (like csv.writer with "\n" line ends) leaves a field holding only "\r" unquoted
    texts = ["line one\rline two", "plain", "\r", "a\r\rb\r"]
    src = tmp_path / "in.csv"
    pd.DataFrame({"case_id": ["c1", "c2", "c3", "c4"], "text": texts}).to_csv(src, index=False)
    assert b'"' not in src.read_bytes()  # really unquoted
    df = _read(src)
    assert df["case_id"].tolist() == ["c1", "c2", "c3", "c4"]
    assert df["text"].tolist() == texts


def test_old_macintosh_line_ends(tmp_path: Path) -> None:
    # no LF anywhere: CR alone ends each line
    src = tmp_path / "in.csv"
    src.write_bytes(b'case_id,text\rk1,a\rk2,"b\rc"\r')
    df = _read(src)
    assert df["case_id"].tolist() == ["k1", "k2"]
    assert df["text"].tolist() == ["a", "b\rc"]


def test_missing_text_field_is_an_error_row(tmp_path: Path) -> None:
    src = tmp_path / "in.csv"
    src.write_text(HEAD + "k1\nk2,b\n", encoding="utf-8")
    df = _read(src)
    assert df["case_id"].tolist() == ["k1", "k2"]
    assert "column 'text' is empty" in df["error"].iloc[0]


def test_five_megabyte_field_is_one_row(tmp_path: Path) -> None:
    # the csv module's default field limit is 128 KiB; a long report is not a broken row
    big = "DIAGNOSIS: adenoma. " * 250_000
    src = tmp_path / "in.csv"
    pd.DataFrame({"case_id": ["b1", "b2"], "text": [big, "short"]}).to_csv(src, index=False)
    df = _read(src)
    assert df["case_id"].tolist() == ["b1", "b2"]
    assert len(df["text"].iloc[0]) == len(big) == 5_000_000
    assert (df["error"] == "").all()


@pytest.mark.parametrize(
    ("data", "encoding"),
    [
        ("case_id,text\nz1,Adénocarcinome\n".encode("latin-1"), "latin-1"),
        ("case_id,text\nz1,Adénocarcinome\n".encode("utf-16"), "utf-16"),  # with its BOM
        ("\ufeffcase_id,text\nz1,Adénocarcinome\n".encode(), "utf-8"),
    ],
    ids=["latin-1", "utf-16", "utf-8-bom"],
)
def test_encodings(tmp_path: Path, data: bytes, encoding: str) -> None:
    src = tmp_path / "in.csv"
    src.write_bytes(data)
    assert sniff_csv(src)[0] == encoding
    df = _read(src)
    assert df["case_id"].tolist() == ["z1"]
    assert df["text"].tolist() == ["Adénocarcinome"]


@pytest.mark.parametrize(
    ("data", "message"),
    [
        (b"", "empty"),
        (b'"case_id,text\nz1,x\n', "header"),
    ],
    ids=["empty-file", "broken-header"],
)
def test_unusable_files_are_one_clear_error(tmp_path: Path, data: bytes, message: str) -> None:
    src = tmp_path / "in.csv"
    src.write_bytes(data)
    with pytest.raises(InputError, match=message):
        _read(src)


def test_header_only_file_is_an_empty_table(tmp_path: Path, colorectal: Labeler) -> None:
    src = tmp_path / "in.csv"
    src.write_text(HEAD, encoding="utf-8")
    out = tmp_path / "out.csv"
    summary = label_file(src, out, LabelOptions("colorectal"), workers=1, labeler=colorectal)
    assert summary.cases == 0
    assert out.read_text(encoding="utf-8").startswith("case_id,status,error")


def test_run_reports_a_broken_row_and_labels_the_rest(tmp_path: Path, colorectal: Labeler) -> None:
    src = tmp_path / "in.csv"
    src.write_text(
        HEAD + 'S1,"DIAGNOSIS: tubular adenoma."\nS2,"DIAGNOSIS: no close\n'
        'S3,"DIAGNOSIS: adenocarcinoma."\n',
        encoding="utf-8",
    )
    out = tmp_path / "out.csv"
    label_file(src, out, LabelOptions("colorectal"), workers=1, labeler=colorectal)
    df = pd.read_csv(out, dtype=str, keep_default_na=False)
    assert df["case_id"].tolist() == ["S1", "S2", "S3"]
    assert df["status"].tolist() == ["ok", "error", "ok"]
    assert df["adenocarcinoma"].tolist()[2] == "1.0"


# ------------------------------------------------------------------ property: break one row

# report-like text: words, commas, quotes, line breaks; a line never starts with an
# accession-shaped token followed by a comma, so it cannot pass for a row of its own
_WORDS = st.sampled_from(
    ["tubular adenoma", "negative", "for", "dysplasia", ",", ", 2 mm", '"no"', "\n", "\r\n",
     "margin", "A.", "(B)", ";", "😀", "\u202e", "<b>", "\\par"]
)  # fmt: skip
_TEXT = st.lists(_WORDS, min_size=1, max_size=12).map(lambda w: "report " + " ".join(w))


@settings(max_examples=60, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(
    texts=st.lists(_TEXT, min_size=2, max_size=12),
    which=st.sets(st.integers(min_value=0, max_value=11), min_size=1, max_size=2),
    how=st.sampled_from(["drop-closing-quote", "stray-quote"]),
    quoting=st.sampled_from([csv.QUOTE_ALL, csv.QUOTE_NONNUMERIC]),
)
def test_one_broken_row_never_takes_others_with_it(
    texts: list[str], which: set[int], how: str, quoting: int
) -> None:
    broken = {w % len(texts) for w in which}
    ids = [f"P{i:05d}" for i in range(len(texts))]
    lines = []
    for i, (cid, text) in enumerate(zip(ids, texts, strict=True)):
        buf = io.StringIO()
        csv.writer(buf, quoting=quoting, lineterminator="\n").writerow([cid, text])
        row = buf.getvalue()
        if i in broken and how == "drop-closing-quote":
            row = row[: row.rindex('"')] + row[row.rindex('"') + 1 :]
        elif i in broken:
            cut = row.index(',"') + 3  # inside the quoted text, after its first character
            row = row[:cut] + '"x' + row[cut:]
        lines.append(row)
    data = "case_id,text\n" + "".join(lines)
    frames = list(read_delimited(io.StringIO(data, newline="\n"), delimiter=",", chunk_rows=5))
    assert all(len(f) == 5 for f in frames[:-1])  # whole chunks
    df = pd.concat(frames, ignore_index=True)
    assert df["case_id"].tolist() == ids  # one row per input row, in order, none merged
    problems = df[PROBLEM_COL].tolist()
    assert [bool(p) for p in problems] == [i in broken for i in range(len(ids))]
    for i in range(len(ids)):
        if i not in broken:
            assert df["text"].iloc[i] == texts[i]


@pytest.mark.parametrize(
    ("key", "shape"),
    [("HV25-S000001", "a9-a9"), ("S-12", "a-9"), ("tubular adenoma", "a a"), ("row 7", "a 9")],
)
def test_key_shape(key: str, shape: str) -> None:
    assert key_shape(key) == shape
