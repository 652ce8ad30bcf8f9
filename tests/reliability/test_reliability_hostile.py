"""Hostile input: no crash, no lost row, every evidence offset exact.

Property tests (hypothesis) throw random unicode, control characters, NUL
bytes, right-to-left marks, emoji, HTML/RTF remnants and mixed line endings at
the labeller; the run-level tests check that the output has exactly one row per
input case, in input order, each ok or error.
"""

from __future__ import annotations

from pathlib import Path

import pandas as pd
import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from pathsieve import Labeler
from pathsieve.runner import LabelOptions, label_file

FRAGMENTS = [
    "FINAL DIAGNOSIS:",
    "A. Sigmoid colon, polypectomy: ",
    "tubular adenoma",
    "negative for high-grade dysplasia",
    "adenocarcinoma",
    "suspicious for",
    "Gleason score 3+4=7",
    "pT3 pN1a",
    "2/15 lymph nodes",
    "\x00",
    "\u202e",
    "\u200f",
    "😀",
    "\r\n",
    "\r",
    "\n\n",
    "<b>",
    "</script>",
    "{\\rtf1\\ansi ",
    "\\par ",
    "&nbsp;",
    "\t",
    "ﬁ",
    "Ⅲ",
    "İ",
    "ß",
]

hostile_text = st.lists(
    st.one_of(st.sampled_from(FRAGMENTS), st.text(max_size=20)), max_size=30
).map("".join)


@pytest.fixture(scope="module")
def labeler() -> Labeler:
    return Labeler("colorectal")


@settings(
    max_examples=150, deadline=None, suppress_health_check=[HealthCheck.function_scoped_fixture]
)
@given(text=hostile_text)
def test_hostile_text_never_crashes_and_offsets_hold(labeler: Labeler, text: str) -> None:
    rows, evidence = labeler.label_records([("c1", text, "")])
    assert len(rows) == 1
    assert rows[0]["status"] in ("ok", "error")
    for ev in evidence:
        assert text[ev["start"] : ev["end"]] == ev["text"]
        for trig in ev["triggers"]:
            assert text[trig["start"] : trig["end"]] == trig["text"]


@pytest.mark.parametrize(
    "text",
    [
        "",
        "   \n\t  ",
        "a" * 1_000_000,  # a million-character line with no spaces
        "\x00" * 5000 + "adenocarcinoma",
        "1+" * 200_000,
        "A. " * 50_000,
        ":" * 100_000,
    ],
    ids=["empty", "whitespace", "no-spaces", "nul", "plus", "parts", "colons"],
)
def test_extreme_texts_yield_one_row(labeler: Labeler, text: str) -> None:
    rows, _ = labeler.label_records([("c1", text, "")])
    assert len(rows) == 1 and rows[0]["case_id"] == "c1"


def _write_csv(path: Path, rows: list[tuple[str, str]]) -> None:
    pd.DataFrame(rows, columns=["case_id", "text"]).to_csv(path, index=False)


def test_run_keeps_every_row_in_order(tmp_path: Path) -> None:
    rows = [
        ("r1", "DIAGNOSIS: adenocarcinoma."),
        ("r2", ""),  # empty text -> error row
        ("r3", "   "),
        ("r1", "duplicate id"),  # duplicate -> error row
        ("", "no id"),  # missing id -> error row with a made-up id
        ("r6", "\x00\u202e😀 tubular adenoma\r\nnegative for HGD"),
    ]
    src = tmp_path / "in.csv"
    _write_csv(src, rows)
    out = tmp_path / "out.csv"
    label_file(src, out, LabelOptions("colorectal"), workers=1)
    df = pd.read_csv(out, dtype=str, keep_default_na=False)
    assert len(df) == len(rows)
    assert df["case_id"].tolist()[:4] == ["r1", "r2", "r3", "r1"]
    assert df["status"].tolist() == ["ok", "error", "error", "error", "error", "ok"]
    assert all(df.loc[df.status == "error", "error"].str.len() > 0)


def test_malformed_csv_rows_are_not_lost(tmp_path: Path) -> None:
    src = tmp_path / "bad.csv"
    src.write_text(
        'case_id,text\nk1,"DIAGNOSIS: tubular adenoma."\nk2,plain text,extra,columns\n'
        'k3,"quoted, with comma"\n',
        encoding="utf-8",
    )
    out = tmp_path / "out.csv"
    label_file(src, out, LabelOptions("colorectal"), workers=1)
    df = pd.read_csv(out, dtype=str, keep_default_na=False)
    assert df["case_id"].tolist() == ["k1", "k2", "k3"]


def test_latin1_input_is_read_and_reported(
    tmp_path: Path, capsys: pytest.CaptureFixture[str]
) -> None:
    src = tmp_path / "latin1.csv"
    src.write_bytes("case_id,text\nz1,Adénocarcinome; tubular adenoma\n".encode("latin-1"))
    out = tmp_path / "out.csv"
    label_file(src, out, LabelOptions("colorectal"), workers=1)
    df = pd.read_csv(out, dtype=str, keep_default_na=False)
    assert df["case_id"].tolist() == ["z1"] and df["status"].tolist() == ["ok"]
    assert "Latin-1" in capsys.readouterr().err
