"""review: page data, safe embedding, case filters, CLI (the browser tests drive the page)."""

from __future__ import annotations

import argparse
import html
import json
import re
from pathlib import Path

import pandas as pd
import pytest

from pathsieve.cli import review as cli_review
from pathsieve.errors import ConfigError, InputError
from pathsieve.review import PHI_NOTICE, embed_json, render_review, review_data
from pathsieve.validate import CAUTION, SchemeKeys

DATA = Path(__file__).parent / "data"
PROSTATE = SchemeKeys(
    "prostate",
    ("adenocarcinoma", "atypical_glands", "hgpin", "benign"),
    ("gleason_score", "grade_group", "pt"),
)
FILES = (
    DATA / "reports_prostate.csv",
    DATA / "labels_prostate.csv",
    DATA / "evidence_prostate.jsonl",
)


def _embedded(page: str) -> dict:
    m = re.search(r'<script type="application/json" id="ps-data">(.*?)</script>', page, re.S)
    assert m is not None
    return json.loads(m.group(1))


@pytest.mark.parametrize(
    "text",
    [
        "</script><b>bold</b>",
        "</SCRIPT >",
        "<!-- <script>",
        "a & b &amp; c",
        "line\u2028separator\u2029",
        'quote " and backslash \\',
    ],
)
def test_embed_json_round_trips_and_cannot_close_the_script(text: str) -> None:
    embedded = embed_json({"t": text})
    assert "<" not in embedded and ">" not in embedded and "&" not in embedded
    assert "\u2028" not in embedded and "\u2029" not in embedded
    assert json.loads(embedded) == {"t": text}


def test_page_is_self_contained_and_escapes_report_text() -> None:
    page = render_review(*FILES, scheme=PROSTATE)
    # the report of PS-1006 holds "</script><b>bold?</b> & more"
    assert "</script><b>" not in page
    assert page.count("</script>") == 2  # the data block and the code block, nothing else
    data = _embedded(page)
    text = next(c["text"] for c in data["cases"] if c["id"] == "PS-1006")
    assert "</script><b>bold?</b> & more" in text and "<b>&amp;</b>" in text
    # no placeholder left, nothing fetched from the network
    for mark in (
        "<!--DATA-->",
        "/*JS*/",
        "/*CSS*/",
        "<!--TITLE-->",
        "<!--CAUTION-->",
        "<!--PHI-->",
    ):
        assert mark not in page
    assert not re.search(r"""(src|href)\s*=\s*["']?(https?:)?//""", page)
    assert "@import" not in page and "url(" not in page
    assert "default-src 'none'" in page  # the page may not connect anywhere
    # both cautions are on the page
    assert html.escape(CAUTION) in page and html.escape(PHI_NOTICE) in page


def test_page_data_per_case() -> None:
    review = review_data(*FILES, scheme=PROSTATE)
    cases = {c["id"]: c for c in review.data["cases"]}
    assert list(cases) == [f"PS-100{i}" for i in range(1, 7)]
    c3 = cases["PS-1003"]
    assert c3["labels"] == {
        "adenocarcinoma": "uncertain",
        "atypical_glands": "likely",
        "hgpin": "unmentioned",
        "benign": "unmentioned",
    }
    assert c3["primary"] == "atypical_glands"
    # spans point at the original text; triggers ride along
    for span in c3["spans"]:
        assert not span.get("bad")
    uncertain = next(s for s in c3["spans"] if s["certainty"] == "uncertain")
    assert c3["text"][uncertain["s"] : uncertain["e"]] == "adenocarcinoma"
    trig = uncertain["triggers"][0]
    assert c3["text"][trig[0] : trig[1]] == "suspicious for" and trig[2] == "uncertain"
    # section and part boundaries come from pathsieve's own readers
    assert [s[2] for s in c3["sections"]] == ["diagnosis", "comment"]
    assert [p[2] for p in c3["parts"]] == ["A"]
    assert cases["PS-1004"]["values"] == {
        "gleason_score": "4+4=8",
        "grade_group": "4",
        "pt": "pT3a",
    }
    assert (
        cases["PS-1006"]["status"] == "error"
        and cases["PS-1006"]["error"] == "could not decode text"
    )
    hist = next(s for s in cases["PS-1005"]["spans"] if s["temporality"] == "historical")
    assert hist["decides"] is False and hist["experiencer"] == "other"
    assert review.bad_offsets == 0


def test_offsets_become_utf16_for_the_browser() -> None:
    text = "Note \U0001f9ea\U0001f9ea: HSIL."
    start = text.index("HSIL")
    review = review_data(
        pd.DataFrame({"case_id": ["u"], "text": [text]}),
        pd.DataFrame({"case_id": ["u"], "hsil": [1.0]}),
        [{"case_id": "u", "labels": ["hsil"], "text": "HSIL", "start": start, "end": start + 4}],
        scheme=SchemeKeys("cervix", ("hsil",)),
    )
    span = review.data["cases"][0]["spans"][0]
    # two astral characters ahead: each is two UTF-16 code units
    assert (span["s"], span["e"]) == (start + 2, start + 6)
    utf16 = text.encode("utf-16-le")
    assert utf16[2 * span["s"] : 2 * span["e"]].decode("utf-16-le") == "HSIL"


def test_bad_offsets_are_counted_not_drawn() -> None:
    review = review_data(
        pd.DataFrame({"case_id": ["b"], "text": ["DIAGNOSIS: LSIL."]}),
        pd.DataFrame({"case_id": ["b"], "lsil": [1.0]}),
        [
            {"case_id": "b", "labels": ["lsil"], "text": "HSIL", "start": 11, "end": 15},
            {"case_id": "b", "labels": ["lsil"], "text": "LSIL", "start": 11, "end": 99},
            {"case_id": "b", "labels": ["lsil"], "text": "LSIL", "start": 11, "end": 15},
        ],
        scheme=SchemeKeys("cervix", ("lsil",)),
    )
    spans = review.data["cases"][0]["spans"]
    assert review.bad_offsets == 2
    assert [s.get("bad", False) for s in spans].count(True) == 2


def test_case_filter_from_a_sample(tmp_path: Path) -> None:
    sample = tmp_path / "sample.csv"
    pd.DataFrame(
        {
            "case_id": ["PS-1004", "PS-1002", "PS-7777"],
            "stratum": ["hgpin:present", "benign:present", "x:present"],
        }
    ).to_csv(sample, index=False)
    review = review_data(*FILES, scheme=PROSTATE, cases=sample)
    assert [c["id"] for c in review.data["cases"]] == ["PS-1004", "PS-1002"]
    assert review.data["cases"][0]["stratum"] == "hgpin:present"
    assert review.missing_labels == ("PS-7777",)
    assert review.data["missing"]["labels"] == ["PS-7777"]
    only = review_data(*FILES, scheme=PROSTATE, cases=["PS-1005"])
    assert [c["id"] for c in only.data["cases"]] == ["PS-1005"]


def test_per_part_labels_roll_up_for_the_page() -> None:
    labels = pd.DataFrame(
        {"case_id": ["m", "m"], "part": ["A", "B"], "hsil": [0.0, 0.5], "lsil": [1.0, None]}
    )
    review = review_data(
        pd.DataFrame({"case_id": ["m"], "text": ["A. Cervix: LSIL. B. Cervix: possible HSIL."]}),
        labels,
        None,
        scheme=SchemeKeys("cervix", ("hsil", "lsil")),
    )
    case = review.data["cases"][0]
    assert case["labels"] == {"hsil": "uncertain", "lsil": "present"}
    assert case["part_labels"] == {
        "A": {"hsil": "absent", "lsil": "present"},
        "B": {"hsil": "uncertain", "lsil": "unmentioned"},
    }


@pytest.mark.parametrize(
    ("kwargs", "message"),
    [
        ({"cases": ["nobody"]}, "no case is in both"),
        ({"scheme": SchemeKeys("cervix", ("hsil",))}, "none of scheme 'cervix'"),
    ],
)
def test_input_errors(kwargs: dict, message: str) -> None:
    args = {"scheme": PROSTATE, **kwargs}
    with pytest.raises(InputError, match=message):
        review_data(*FILES, **args)


def _parser() -> argparse.ArgumentParser:
    parser = argparse.ArgumentParser(prog="pathsieve")
    cli_review.register(parser.add_subparsers())
    return parser


def test_cli_writes_the_page(tmp_path: Path, capsys: pytest.CaptureFixture[str]) -> None:
    sample = tmp_path / "sample.csv"
    pd.DataFrame(
        {"case_id": ["PS-1003", "PS-1001"], "stratum": ["a:uncertain", "a:present"]}
    ).to_csv(sample, index=False)
    out = tmp_path / "page" / "review.html"
    args = _parser().parse_args(
        ["review", "--reports", str(FILES[0]), "--labels", str(FILES[1]), "--evidence",
         str(FILES[2]), "--scheme", "prostate", "--cases", str(sample), "-o", str(out)]
    )  # fmt: skip
    assert args.func(args) == 0
    page = out.read_text(encoding="utf-8")
    assert [c["id"] for c in _embedded(page)["cases"]] == ["PS-1003", "PS-1001"]
    printed = capsys.readouterr().out
    assert "2 case(s)" in printed and "protected health information" in printed
    args.output = str(tmp_path / "review.txt")
    with pytest.raises(ConfigError, match=r"\.html"):
        args.func(args)
