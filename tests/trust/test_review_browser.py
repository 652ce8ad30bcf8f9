"""The review page in a real headless browser (Debian's chromium, never a downloaded one).

Load the page from a file, filter, navigate with the keyboard, mark labels,
download the gold CSV, feed it to ``validate``; and the whole loop
label -> sample -> review -> marks -> validate on the demo reports.
"""

from __future__ import annotations

import csv
import io
import struct
import zlib
from collections.abc import Iterator
from pathlib import Path
from typing import Any

import pandas as pd
import pytest

from pathsieve.review import render_review
from pathsieve.validate import SchemeKeys, validate

pytestmark = pytest.mark.browser

CHROMIUM = Path("/usr/bin/chromium")
ARGS = [
    "--headless",
    "--no-sandbox",
    "--disable-gpu",
    "--disable-quic",
    "--no-first-run",
    "--disable-background-networking",
    "--disable-component-update",
    "--disable-sync",
]
DATA = Path(__file__).parent / "data"
REPO = Path(__file__).resolve().parents[2]
PROSTATE = SchemeKeys(
    "prostate",
    ("adenocarcinoma", "atypical_glands", "hgpin", "benign"),
    ("gleason_score", "grade_group", "pt"),
)


@pytest.fixture(scope="module")
def browser() -> Iterator[Any]:
    if not CHROMIUM.exists():
        pytest.skip("no /usr/bin/chromium (apt-get install chromium); browser tests need it")
    sync_api = pytest.importorskip("playwright.sync_api")
    with sync_api.sync_playwright() as p:
        b = p.chromium.launch(executable_path=str(CHROMIUM), args=ARGS)
        yield b
        b.close()


@pytest.fixture
def page(browser: Any) -> Iterator[Any]:
    context = browser.new_context(accept_downloads=True, viewport={"width": 1400, "height": 900})
    pg = context.new_page()
    pg.set_default_timeout(5000)
    errors: list[str] = []
    pg.on("pageerror", lambda e: errors.append(str(e)))
    pg.on("console", lambda m: errors.append(m.text) if m.type == "error" else None)
    # the page must never touch the network
    pg.route(
        "http*://**", lambda route: (errors.append(f"network: {route.request.url}"), route.abort())
    )
    yield pg
    context.close()
    assert errors == [], errors


def _open(pg: Any, path: Path, case: str = "") -> None:
    pg.goto(path.as_uri() + (f"#{case}" if case else ""))
    pg.wait_for_selector("body[data-ready='1']", timeout=5000)


def _png_pixels(data: bytes) -> tuple[int, int, list[bytes]]:
    """Decode an 8-bit RGB/RGBA PNG into rows of pixel bytes (zlib + struct only)."""
    assert data[:8] == b"\x89PNG\r\n\x1a\n"
    pos, idat, width = 8, b"", 0
    height = bpp = 0
    while pos < len(data):
        (length,) = struct.unpack(">I", data[pos : pos + 4])
        kind = data[pos + 4 : pos + 8]
        body = data[pos + 8 : pos + 8 + length]
        pos += 12 + length
        if kind == b"IHDR":
            width, height, depth, colour = struct.unpack(">IIBB", body[:10])
            assert depth == 8 and colour in (2, 6), (depth, colour)
            bpp = 3 if colour == 2 else 4
        elif kind == b"IDAT":
            idat += body
    raw = zlib.decompress(idat)
    stride = width * bpp
    rows: list[bytes] = []
    prev = bytearray(stride)
    for y in range(height):
        f = raw[y * (stride + 1)]
        line = bytearray(raw[y * (stride + 1) + 1 : (y + 1) * (stride + 1)])
        for i in range(stride):
            a = line[i - bpp] if i >= bpp else 0
            b = prev[i]
            c = prev[i - bpp] if i >= bpp else 0
            if f == 1:
                line[i] = (line[i] + a) & 255
            elif f == 2:
                line[i] = (line[i] + b) & 255
            elif f == 3:
                line[i] = (line[i] + (a + b) // 2) & 255
            elif f == 4:
                p = a + b - c
                pa, pb, pc = abs(p - a), abs(p - b), abs(p - c)
                pred = a if pa <= pb and pa <= pc else b if pb <= pc else c
                line[i] = (line[i] + pred) & 255
        rows.append(bytes(line))
        prev = line
    return width, bpp, rows


def _check_not_blank(png: bytes) -> int:
    width, bpp, rows = _png_pixels(png)
    colours = set()
    for row in rows[::7]:
        for x in range(0, width * bpp, bpp * 5):
            colours.add(row[x : x + 3])
    # a rendered page with highlights has many colours; a blank one has one or two
    assert len(colours) > 40, len(colours)
    return len(colours)


def _review_page(tmp_path: Path) -> Path:
    page = render_review(
        DATA / "reports_prostate.csv",
        DATA / "labels_prostate.csv",
        DATA / "evidence_prostate.jsonl",
        scheme=PROSTATE,
    )
    out = tmp_path / "review.html"
    out.write_text(page, encoding="utf-8")
    return out


def _h1(pg: Any) -> str:
    return str(pg.inner_text("#case-head h1"))


def test_review_page_in_browser(page: Any, tmp_path: Path) -> None:
    path = _review_page(tmp_path)
    _open(page, path)
    # the cautions are visible
    assert page.is_visible("text=not diagnoses")
    assert page.is_visible("text=protected health information")
    assert _h1(page) == "PS-1001"

    # filter by label and state: adenocarcinoma uncertain is PS-1003 alone
    page.select_option("#f-label", "adenocarcinoma")
    page.select_option("#f-state", "uncertain")
    assert page.inner_text("#f-count") == "1 of 6 cases match"
    assert page.locator("#case-list li").all_inner_texts()[0].count("PS-1003") == 1
    assert _h1(page) == "PS-1003"
    # by state alone: any label absent -> PS-1002 and PS-1005 (adenocarcinoma negated)
    page.select_option("#f-label", "*")
    page.select_option("#f-state", "absent")
    assert [t.split()[1] for t in page.locator("#case-list li").all_inner_texts()] == [
        "PS-1002",
        "PS-1005",
    ]
    page.select_option("#f-state", "*")
    assert page.inner_text("#f-count") == "6 of 6 cases match"

    # the uncertain mention is highlighted from its offsets, with colour and a text marker
    _open(page, path, "PS-1003")
    mark = page.locator("#report mark.st-uncertain")
    assert mark.inner_text() == "adenocarcinoma"
    assert page.locator("#report sup.st-uncertain").inner_text() == "[?]"
    assert page.locator("#report .trig").first.inner_text() in ("suspicious", "suspicious for")
    assert page.locator("#report .sec-tag").all_inner_texts() == ["§ DIAGNOSIS", "§ COMMENT"]
    assert page.locator("#report .part-tag").all_inner_texts() == ["part A"]

    # keyboard: j/k move between cases
    page.keyboard.press("j")
    assert _h1(page) == "PS-1004"
    page.keyboard.press("k")
    assert _h1(page) == "PS-1003"

    # adenocarcinoma (row 0) is wrong: x proposes "present" (the prediction was negative)
    page.keyboard.press("x")
    row = page.locator("#label-table tr[data-key='adenocarcinoma']")
    assert row.locator("td.out").inner_text() == "→ present"
    # atypical_glands: set the correct state with a digit (5 = absent)
    page.keyboard.press("ArrowDown")
    page.keyboard.press("5")
    assert (
        page.locator("#label-table tr[data-key='atypical_glands'] td.out").inner_text()
        == "→ absent"
    )
    # the rest of the case is right
    page.keyboard.press("A")
    assert page.locator("#label-table tr[data-key='hgpin'] td.out").inner_text() == "right"

    # PS-1001 with the mouse: benign set to "absent" through the menu, the rest right
    page.locator("#case-list li", has_text="PS-1001").click()
    assert _h1(page) == "PS-1001"
    page.select_option("#label-table tr[data-key='benign'] select.set", "absent")
    page.click("#all-right")
    # PS-1004: the Gleason score is wrong and corrected by typing
    page.locator("#case-list li", has_text="PS-1004").click()
    page.click("#value-table tr[data-key='gleason_score'] button.no")
    page.fill("#value-table tr[data-key='gleason_score'] input.fix", "4+3=7")
    page.keyboard.press("Tab")
    page.locator("body").click(position={"x": 5, "y": 5})
    assert page.inner_text("#progress") == "15 mark(s) in 3 of 6 case(s)"

    # marks survive a reload (local storage)
    _open(page, path, "PS-1003")
    page.reload()
    page.wait_for_selector("body[data-ready='1']")
    assert _h1(page) == "PS-1003"
    assert (
        page.locator("#label-table tr[data-key='adenocarcinoma'] td.out").inner_text()
        == "→ present"
    )

    # review filter: cases with a label marked wrong
    page.select_option("#f-review", "wrong")
    assert page.inner_text("#f-count") == "3 of 6 cases match"
    page.select_option("#f-review", "all")

    with page.expect_download() as info:
        page.keyboard.press("d")
    gold = tmp_path / "gold.csv"
    info.value.save_as(gold)
    rows = list(csv.DictReader(io.StringIO(gold.read_text(encoding="utf-8"))))
    assert set(rows[0]) == {"case_id", "label", "expected", "scheme"}
    got = {(r["case_id"], r["label"]): r["expected"] for r in rows}
    assert got[("PS-1003", "adenocarcinoma")] == "present"
    assert got[("PS-1003", "atypical_glands")] == "absent"
    assert got[("PS-1003", "hgpin")] == "unmentioned"  # confirmed right: the predicted state
    assert got[("PS-1001", "adenocarcinoma")] == "present"
    assert got[("PS-1001", "benign")] == "absent"
    assert got[("PS-1001", "gleason_score")] == "3+4=7"
    assert got[("PS-1004", "gleason_score")] == "4+3=7"
    assert ("PS-1002", "adenocarcinoma") not in got  # unreviewed cases are not exported
    assert len(rows) == 2 * 7 + 1  # two cases in full, one value on PS-1004

    # the downloaded file is a gold table validate reads, and it reflects the marks
    result = validate(gold, DATA / "labels_prostate.csv", scheme=PROSTATE, n_boot=0)
    adeno = result.label("adenocarcinoma")
    assert (adeno.tp, adeno.fn, adeno.fp) == (1, 1, 0)  # PS-1001 right, PS-1003 missed
    assert result.label("atypical_glands").fp == 1
    assert result.label("benign").confusion[4][5] == 1  # gold absent x predicted unmentioned
    errors = {(d.case_id, d.label, d.error) for d in result.disagreements}
    assert errors == {
        ("PS-1003", "adenocarcinoma", "false negative"),
        ("PS-1003", "atypical_glands", "false positive"),
        ("PS-1001", "benign", "state"),
        ("PS-1004", "gleason_score", "value"),
    }
    gleason = result.value("gleason_score")
    assert (gleason.n, gleason.correct) == (3, 2)  # PS-1003: "not stated" confirmed

    shot = tmp_path / "review.png"
    page.screenshot(path=str(shot))
    _check_not_blank(shot.read_bytes())


def test_report_text_is_embedded_safely(page: Any, tmp_path: Path) -> None:
    # PS-1006 holds "</script><b>bold?</b> & more" and "&amp;" in its text; a report
    # with a character outside the BMP checks that offsets survive JavaScript's UTF-16
    text = "Clinical history: patient \U0001f600 notes.\nDIAGNOSIS: HSIL (CIN 3) </script><b>x</b> & more"
    start = text.index("HSIL")
    reports = pd.DataFrame({"case_id": ["U-1"], "text": [text]})
    labels = pd.DataFrame({"case_id": ["U-1"], "hsil": [1.0]})
    evidence = [
        {"case_id": "U-1", "part": "", "kind": "mention", "labels": ["hsil"], "text": "HSIL",
         "start": start, "end": start + 4, "section": "diagnosis", "certainty": "present",
         "decides": True, "triggers": []},
        {"case_id": "U-1", "part": "", "kind": "mention", "labels": ["hsil"], "text": "CIN 2",
         "start": start + 6, "end": start + 11, "section": "diagnosis", "certainty": "present",
         "decides": True, "triggers": []},  # wrong text at these offsets: shown as a warning
    ]  # fmt: skip
    html = render_review(reports, labels, evidence, scheme=SchemeKeys("cervix", ("hsil",)))
    assert "</script><b>" not in html and "\\u003c/script\\u003e" in html
    out = tmp_path / "unicode.html"
    out.write_text(html, encoding="utf-8")
    _open(page, out)
    assert page.locator("#report mark").inner_text() == "HSIL"
    assert "point outside the text or at different text" in page.inner_text("#warn")
    assert page.locator("#report b").count() == 0
    assert "</script><b>x</b> & more" in page.inner_text("#report")

    _open(page, _review_page(tmp_path), "PS-1006")
    assert page.locator("#report b").count() == 0
    assert "</script><b>bold?</b> & more" in page.inner_text("#report")
    assert "<b>&amp;</b>" in page.inner_text("#report")
    assert "Labelling failed" in page.inner_text("#warn")


def test_demo_loop_label_sample_review_validate(page: Any, tmp_path: Path) -> None:
    """The whole loop on the demo reports: label -> sample -> review -> marks -> validate.

    Runs through ``pathsieve.cli.main``, so it needs ``label``, ``sample``,
    ``review`` and ``validate`` registered in ``pathsieve.cli.COMMANDS``, the
    shipped schemes and examples/demo_reports.csv; it fails (it does not skip)
    while any of them is missing.
    """
    from pathsieve.cli import main

    demo = REPO / "examples" / "demo_reports.csv"
    assert demo.is_file(), "examples/demo_reports.csv is missing"
    reports = pd.read_csv(demo, dtype=str, keep_default_na=False)
    scheme = "prostate"
    if "scheme" in reports.columns:
        reports = reports[reports["scheme"] == scheme]
    reports = reports.head(10)  # enough for the loop, quick to label
    assert len(reports) >= 2, f"the demo has fewer than two {scheme} reports"
    subset = tmp_path / "reports.csv"
    reports.to_csv(subset, index=False)
    labels, evidence = tmp_path / "labels.csv", tmp_path / "evidence.jsonl"
    sample_csv, page_html = tmp_path / "sample.csv", tmp_path / "review.html"

    assert main(["label", str(subset), "--scheme", scheme, "-o", str(labels),
                 "--evidence", str(evidence), "--workers", "1", "--no-progress"]) == 0  # fmt: skip
    n = min(4, len(reports))
    assert main(["sample", str(labels), "-n", str(n), "--seed", "1", "-o", str(sample_csv)]) == 0
    assert main(["review", "--reports", str(subset), "--labels", str(labels), "--evidence",
                 str(evidence), "--scheme", scheme, "--cases", str(sample_csv),
                 "-o", str(page_html)]) == 0  # fmt: skip

    _open(page, page_html)
    assert page.inner_text("#f-count") == f"{n} of {n} cases match"
    # every highlighted mention shows the text its evidence row quotes
    ev = pd.read_json(evidence, lines=True)
    first = _h1(page)
    quoted = set(ev[ev["case_id"].astype(str) == first]["text"])
    for t in page.locator("#report mark").all_inner_texts():
        assert any(t in q for q in quoted), (t, quoted)
    # mark the first label of the first case wrong (flips its decision), confirm the rest
    first_key = page.locator("#label-table tr").first.get_attribute("data-key")
    page.keyboard.press("x")
    page.keyboard.press("A")
    for _ in range(n - 1):
        page.keyboard.press("j")
        page.keyboard.press("A")
    with page.expect_download() as info:
        page.click("#download")
    gold = tmp_path / "gold.csv"
    info.value.save_as(gold)
    shot = tmp_path / "demo.png"
    page.screenshot(path=str(shot))
    _check_not_blank(shot.read_bytes())

    report = tmp_path / "validation.html"
    assert main(["validate", "--gold", str(gold), "--pred", str(labels), "--scheme", scheme,
                 "--evidence", str(evidence), "--n-boot", "100", "-o", str(report)]) == 0  # fmt: skip
    result = validate(gold, labels, scheme=scheme, evidence=evidence, n_boot=0)
    assert result.n_units == n
    assert result.gold_only_cases == () and result.unknown_labels == ()
    wrong = [d for d in result.disagreements if d.error in ("false positive", "false negative")]
    assert [(d.case_id, d.label) for d in wrong] == [(first, first_key)]
    assert "<svg" in report.read_text(encoding="utf-8")
