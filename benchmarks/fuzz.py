#!/usr/bin/env python3
"""Fuzz: label thousands of generated hostile inputs; count crashes and lost rows.

Generates ``-n`` hostile cases from a seed and labels them through
``label_file`` exactly as ``pathsieve label`` does, spread over every input
format: CSV, JSONL, Parquet, a folder of ``.txt`` files and a CSV with broken
rows written by hand.  The texts are invented reports mutated with random
Unicode (every plane), control characters, NUL bytes, right-to-left marks,
emoji, combining marks, HTML and RTF remnants, mixed line endings, lines of
100,000+ characters with no space, empty and white-space-only texts, lone
surrogates (JSONL), plus a few reports of a megabyte.  The ids are hostile too:
padded, empty, repeated, non-ASCII, holding commas and quotes.  The broken CSV
has unclosed quotes, undoubled quotes, extra and missing fields.

Every text carries a unique marker; no error message and nothing written to
stderr may contain one (report text never appears in messages).

Counts:

* **crashes** — a run that raised, or a row whose labelling raised
  (``... while labelling``);
* **lost rows** — input cases with no output row in their place: the output
  ids must equal the input ids one for one, in order;
* **unexpected errors** — error rows on cases built to be labellable, and ok
  rows on cases built to fail (no id, repeated id, no text, broken quoting);
* **bad offsets** — evidence whose text is not ``report[start:end]``;
* **leaks** — error messages or stderr lines holding report text;
* timeouts (the per-report budget) are reported, not counted as failures.

Prints the figures and, as the last line, a JSON summary; exits 1 unless
crashes, lost rows, unexpected errors, bad offsets and leaks are all zero.

    .venv/bin/python benchmarks/fuzz.py                  # 10,000 cases, seed 1
    .venv/bin/python benchmarks/fuzz.py -n 2000 --seed 7 --workers 1
"""

from __future__ import annotations

import argparse
import contextlib
import csv
import io
import json
import random
import shutil
import sys
import tempfile
import time
from collections import Counter
from collections.abc import Sequence
from dataclasses import dataclass, field
from pathlib import Path
from typing import Any

HERE = Path(__file__).resolve().parent
sys.path.insert(0, str(HERE))

import corpus  # noqa: E402  (the invented-report generator beside this file)

__all__ = ["Case", "generate_cases", "main", "run_fuzz"]

MARK = "QZPHI"  # + a number + "Z": in every text, never in a message

_ODD = [
    "\x00", "\x01", "\x07", "\x0b", "\x0c", "\x1b", "\x7f", "\x85", "\u00a0", "\u200b",
    "\u200e", "\u200f", "\u202a", "\u202e", "\u2066", "\u2028", "\u2029", "\ufeff",
    "\ufffd", "\u0301", "\u0336", "😀", "🧪", "👩🏽‍⚕️", "𝔸", "ﬁ", "Ⅲ", "İ", "ß", "ǅ",
    "\u0627\u0644", "\u05d0", "中文", "\r", "\n", "\r\n", "\t", '"', '""', ",", ";", "|",
    "\\", "{", "}", "<", ">", "&amp;", "&nbsp;", "%", "$", "'",
]  # fmt: skip
_HTML = [
    "<html><body><p>", "</p><br/>", "<div class='x'>", "</div>", "<script>alert(1)</script>",
    "<!-- c -->", "<table><tr><td>", "</td></tr></table>", "&lt;b&gt;", "<b>", "</b>",
]  # fmt: skip
_RTF = ["{\\rtf1\\ansi\\deff0 ", "{\\fonttbl{\\f0 Arial;}}", "\\par ", "\\b ", "\\b0 ", "\\tab ",
        "\\'e9", "}"]  # fmt: skip
_ENDINGS = ["\n", "\r\n", "\r", "\n\n", "\r\r\n"]


@dataclass
class Case:
    """One generated input row and what must come out of it."""

    raw_id: Any  # as written to the input
    text: str
    expect_id: str = ""  # filled once the row number is known
    expect: str = "ok"  # ok | error | any (e.g. a text that may time out)
    kind: str = ""


@dataclass
class Tally:
    cases: int = 0
    crashes: int = 0
    lost: int = 0
    unexpected: int = 0
    bad_offsets: int = 0
    leaks: int = 0
    timeouts: int = 0
    errors: int = 0
    examples: list[str] = field(default_factory=list)
    kinds: Counter[str] = field(default_factory=Counter)
    _noted: Counter[str] = field(default_factory=Counter)

    def note(self, what: str) -> None:
        # a few examples of each kind of problem in each format
        key = what.split(" of ")[0].split(":")[0] + what.split(":", 1)[-1][:12]
        self._noted[key] += 1
        if self._noted[key] <= 2 and len(self.examples) < 24:
            self.examples.append(what)


# ------------------------------------------------------------------ generating


def _random_unicode(r: random.Random, n: int, *, surrogates: bool) -> str:
    out = []
    for _ in range(n):
        plane = r.random()
        if plane < 0.5:
            cp = r.randint(0x20, 0x7E)
        elif plane < 0.8:
            cp = r.randint(0xA0, 0xFFFF)
        else:
            cp = r.randint(0x10000, 0x10FFFF)
        if 0xD800 <= cp <= 0xDFFF and not surrogates:
            cp = 0xFFFD
        out.append(chr(cp))
    return "".join(out)


def _mutate(r: random.Random, text: str, *, surrogates: bool) -> str:
    pieces = list(text)
    for _ in range(r.randint(1, 25)):
        pos = r.randint(0, len(pieces))
        roll = r.random()
        if roll < 0.45:
            ins = r.choice(_ODD)
        elif roll < 0.6:
            ins = r.choice(_HTML)
        elif roll < 0.7:
            ins = r.choice(_RTF)
        elif roll < 0.85:
            ins = _random_unicode(r, r.randint(1, 12), surrogates=surrogates)
        elif roll < 0.95:
            ins = r.choice(_ENDINGS)
        else:
            ins = chr(0xD800) if surrogates else chr(0xFFFD)  # a lone surrogate (JSONL only)
        pieces.insert(pos, ins)
    out = "".join(pieces)
    if r.random() < 0.3:  # mixed line endings throughout
        out = "".join(r.choice(_ENDINGS) if c == "\n" else c for c in out)
    return out


def _text(r: random.Random, base: str, i: int, *, surrogates: bool, big: bool) -> tuple[str, str]:
    """A hostile text (with its marker) and its kind."""
    mark = f"{MARK}{i}Z"
    roll = r.random()
    if big:
        kind = "megabyte"
        body = ("\n\n".join([base] * (1_000_000 // max(len(base), 1) + 1)))[:1_000_000]
    elif roll < 0.45:
        kind, body = "mutated", _mutate(r, base, surrogates=surrogates)
    elif roll < 0.55:
        kind, body = "unicode", _random_unicode(r, r.randint(1, 3000), surrogates=surrogates)
    elif roll < 0.62:
        kind, body = (
            "html",
            "".join(r.choice(_HTML) + r.choice([base[:200], "x"]) for _ in range(20)),
        )
    elif roll < 0.67:
        kind, body = "rtf", _RTF[0] + "".join(r.choice(_RTF) + base[:80] for _ in range(15)) + "}"
    elif roll < 0.68:
        kind = "long-line"
        body = r.choice(["a", "x1", "-", ":", "(", "0", "é"]) * r.randint(100_000, 200_000)
    elif roll < 0.72:
        kind = "repeats"
        unit = r.choice(["no ", "A. ", "DIAGNOSIS: ", "(IM) ", "3+4=7 ", "1/2 ", "pT", "? "])
        body = unit * r.randint(100, 5_000)
    elif roll < 0.77:
        kind, body = "controls", "".join(r.choice(_ODD) for _ in range(r.randint(1, 400)))
    else:
        kind, body = "report", base
    at = r.randint(0, len(body))
    return body[:at] + f" {mark} " + body[at:], kind


def generate_cases(n: int, *, seed: int, surrogates: bool, start: int = 0) -> list[Case]:
    """``n`` hostile cases: texts as above, ids hostile about one time in ten."""
    r = random.Random(seed)
    bases = corpus.texts(min(n, 400), seed=seed, organ="mixed")
    cases: list[Case] = []
    for i in range(n):
        serial = start + i
        text, kind = _text(
            r, bases[i % len(bases)], serial, surrogates=surrogates, big=(i == n // 2 and n >= 2000)
        )
        cid: Any = f"FZ-{serial:06d}"
        expect = "ok"
        roll = r.random()
        if roll < 0.02:
            text, kind = r.choice(["", "   ", "\n\t \r\n", "\u00a0\u2003"]), "blank"
            expect = "error"
        elif roll < 0.03:
            cid, kind, expect = r.choice(["", "   ", None]), "no-id", "error"
        elif roll < 0.04 and cases:
            cid, kind, expect = cases[r.randrange(len(cases))].raw_id, "repeated-id", "error"
        elif roll < 0.08:
            cid = r.choice(
                [
                    f"  FZ-{serial:06d}  ",
                    f"FZ-{serial:06d}-é中😀",
                    f'FZ,"{serial}"',
                    f"FZ {serial}\t",
                ]
            )
        cases.append(Case(cid, text, kind=kind, expect=expect))
    return cases


def _expected_ids(cases: list[Case]) -> None:
    """The id each row must come out with (trimmed; ``row<N>`` when empty)."""
    seen: set[str] = set()
    for row, c in enumerate(cases, 1):
        raw = "" if c.raw_id is None else str(c.raw_id).strip()
        raw = "".join("\ufffd" if 0xD800 <= ord(ch) <= 0xDFFF else ch for ch in raw)
        c.expect_id = raw or f"row{row}"
        if raw and raw in seen and c.expect == "ok":
            c.expect = "error"  # a repeated id, by chance
        if raw:
            seen.add(raw)
        if c.expect == "ok" and not c.text.strip():
            c.expect = "error"


# ------------------------------------------------------------------ writing inputs


def _write(fmt: str, cases: list[Case], folder: Path) -> Path:
    import pandas as pd

    ids = [c.raw_id for c in cases]
    texts = [c.text for c in cases]
    if fmt == "csv":
        path = folder / "fuzz.csv"
        pd.DataFrame({"case_id": ids, "text": texts}).to_csv(path, index=False)
    elif fmt == "parquet":
        path = folder / "fuzz.parquet"
        pd.DataFrame({"case_id": ids, "text": texts}).to_parquet(path, index=False)
    elif fmt == "jsonl":
        path = folder / "fuzz.jsonl"
        with open(path, "w", encoding="ascii") as fh:  # \\u escapes carry the surrogates
            for cid, text in zip(ids, texts, strict=True):
                fh.write(json.dumps({"case_id": cid, "text": text}) + "\n")
    elif fmt == "txt":
        path = folder / "fuzz_txt"
        path.mkdir()
        for c in cases:
            (path / f"{c.raw_id}.txt").write_text(c.text, encoding="utf-8", newline="")
    else:
        raise ValueError(fmt)
    return path


def _broken_csv(r: random.Random, cases: list[Case], folder: Path) -> Path:
    """A CSV written line by line, one row in twenty broken by hand."""
    path = folder / "broken.csv"
    out = io.StringIO(newline="")
    out.write("case_id,text\n")
    for c in cases:
        buf = io.StringIO(newline="")
        csv.writer(buf, quoting=csv.QUOTE_ALL, lineterminator="\n").writerow([c.raw_id, c.text])
        line = buf.getvalue()
        roll = r.random()
        if roll < 0.02:  # the closing quote lost
            cut = line.rindex('"')
            line = line[:cut] + line[cut + 1 :]
            c.expect, c.kind = "error", "unclosed-quote"
        elif roll < 0.04:  # a quote inside the text not doubled
            cut = line.index(',"') + 2 + r.randint(1, max(1, min(len(c.text), 50)))
            line = line[:cut] + '"x' + line[cut:]
            c.expect, c.kind = "error", "stray-quote"
        elif roll < 0.05:
            line = line.rstrip("\n") + ',"extra","columns"\n'
            c.kind = "extra-fields"
        elif roll < 0.06:
            buf = io.StringIO(newline="")
            csv.writer(buf, quoting=csv.QUOTE_ALL, lineterminator="\n").writerow([c.raw_id])
            line = buf.getvalue()
            c.expect, c.kind = "error", "missing-field"
        out.write(line)
    path.write_text(out.getvalue(), encoding="utf-8", newline="")
    return path


# ------------------------------------------------------------------ checking


def _check(
    fmt: str,
    cases: list[Case],
    out: Path,
    evidence: Path,
    crashed: str,
    stderr: str,
    tally: Tally,
) -> None:
    import pandas as pd

    tally.cases += len(cases)
    if crashed:
        tally.crashes += len(cases)
        tally.lost += len(cases)
        tally.note(f"{fmt}: the run raised {crashed}")
        return
    df = pd.read_csv(out, dtype=str, keep_default_na=False)
    got = df["case_id"].tolist()
    want = [c.expect_id for c in cases]
    if fmt == "txt":  # a folder is read in file-name order
        order = sorted(range(len(cases)), key=lambda i: f"{cases[i].raw_id}.txt")
        cases = [cases[i] for i in order]
        want = [cases[i].expect_id for i in range(len(cases))]
    missing = sum(1 for a, b in zip(got, want, strict=False) if a != b) + abs(len(got) - len(want))
    if missing:
        tally.lost += missing
        first = next((i for i, (a, b) in enumerate(zip(got, want, strict=False)) if a != b), None)
        tally.note(
            f"{fmt}: {missing} rows out of place (first at row {first}); {len(got)}/{len(want)}"
        )
    texts = {}
    for c, (_, row) in zip(cases, df.iterrows(), strict=False):
        error = row["error"]
        status = row["status"]
        if status == "ok":
            texts[row["case_id"]] = c.text
        tally.kinds[c.kind] += 1
        if status == "error":
            tally.errors += 1
        if "while labelling" in error:
            tally.crashes += 1
            tally.note(f"{fmt}: {error}")
        if "exceeded the time budget" in error:
            tally.timeouts += 1
            tally.note(f"{fmt}: timeout: {c.kind} case {row['case_id']!r}, {len(c.text)} chars")
        elif (c.expect == "ok") != (status == "ok") and c.expect != "any":
            tally.unexpected += 1
            tally.note(f"{fmt}: {c.kind} case {row['case_id']!r} expected {c.expect}, got {status}")
        if MARK in error:
            tally.leaks += 1
            tally.note(f"{fmt}: report text in an error message of {row['case_id']!r}")
    if MARK in stderr:
        tally.leaks += 1
        tally.note(f"{fmt}: report text on stderr")
    with open(evidence, encoding="utf-8") as fh:
        for line in fh:
            ev = json.loads(line)
            text = texts.get(ev["case_id"], "")
            if text[ev["start"] : ev["end"]] != ev["text"]:
                fixed = "".join("\ufffd" if 0xD800 <= ord(ch) <= 0xDFFF else ch for ch in text)
                if fixed[ev["start"] : ev["end"]] != ev["text"]:
                    tally.bad_offsets += 1
                    tally.note(f"{fmt}: evidence offsets of {ev['case_id']!r} do not hold")


def run_fuzz(
    n: int, *, seed: int = 1, workers: int = 2, scheme: str = "colorectal", keep: Path | None = None
) -> dict[str, Any]:
    """Generate ``n`` hostile cases, label them in every format, return the tally."""
    work = keep or Path(tempfile.mkdtemp(prefix="pathsieve-fuzz-"))
    work.mkdir(parents=True, exist_ok=True)
    try:
        return _run(n, seed, workers, scheme, work)
    finally:
        if keep is None:
            shutil.rmtree(work, ignore_errors=True)


def _run(n: int, seed: int, workers: int, scheme: str, work: Path) -> dict[str, Any]:
    from pathsieve.labeler import Labeler
    from pathsieve.runner import LabelOptions, label_file

    r = random.Random(seed)
    share = {"csv": 0.3, "jsonl": 0.25, "parquet": 0.2, "txt": 0.05, "broken": 0.2}
    sizes = {k: int(n * v) for k, v in share.items()}
    sizes["csv"] += n - sum(sizes.values())
    labeler = Labeler(scheme)
    tally = Tally()
    started = time.perf_counter()
    serial = 0
    for fmt, size in sizes.items():
        if not size:
            continue
        cases = generate_cases(
            size, seed=seed * 1000 + serial, surrogates=fmt == "jsonl", start=serial
        )
        if fmt == "jsonl":
            for c in cases:  # two lone surrogates side by side decode as one character
                c.text = json.loads(json.dumps(c.text))
        serial += size
        folder = work / fmt
        folder.mkdir(exist_ok=True)
        if fmt == "txt":
            for k, c in enumerate(cases):  # a file name is the id: no path characters
                c.raw_id = f"FZ-{serial - size + k:06d}"
                c.expect = "ok" if c.text.strip() else "error"
        if fmt == "broken":
            for c in cases:  # ids the resynchronising reader can recognise
                if c.kind in ("no-id", "repeated-id") or not isinstance(c.raw_id, str):
                    c.raw_id = f"FZ-{serial:06d}"
                    c.expect = "ok" if c.text.strip() else "error"
                c.raw_id = str(c.raw_id).strip() or "FZ-x"
            src = _broken_csv(r, cases, folder)
        else:
            src = _write(fmt, cases, folder)
        _expected_ids(cases)
        out, evidence = folder / "labels.csv", folder / "evidence.jsonl"
        err = io.StringIO()
        crashed = ""
        with contextlib.redirect_stderr(err):
            try:
                label_file(
                    src,
                    out,
                    LabelOptions(scheme),
                    evidence_path=evidence,
                    workers=workers,
                    chunk_rows=250,
                    labeler=labeler,
                )
            except Exception as exc:  # a crash of the whole run is what this counts
                crashed = f"{type(exc).__name__}: {str(exc)[:200]}"
        _check(fmt, cases, out, evidence, crashed, err.getvalue(), tally)
        print(f"  {fmt:<8} {size:>6} cases  {time.perf_counter() - started:7.1f} s", flush=True)
    seconds = time.perf_counter() - started
    return {
        "cases": tally.cases,
        "crashes": tally.crashes,
        "lost_rows": tally.lost,
        "unexpected_status": tally.unexpected,
        "bad_offsets": tally.bad_offsets,
        "leaks": tally.leaks,
        "timeouts": tally.timeouts,
        "error_rows": tally.errors,
        "seconds": round(seconds, 1),
        "cases_per_second": round(tally.cases / seconds, 1) if seconds else 0.0,
        "kinds": dict(tally.kinds),
        "examples": tally.examples,
    }


def main(argv: Sequence[str] | None = None) -> int:
    ap = argparse.ArgumentParser(
        description=__doc__, formatter_class=argparse.RawDescriptionHelpFormatter
    )
    ap.add_argument("-n", type=int, default=10_000, help="hostile cases (default 10,000)")
    ap.add_argument("--seed", type=int, default=1)
    ap.add_argument("--workers", type=int, default=2)
    ap.add_argument("--scheme", default="colorectal")
    ap.add_argument("--keep", type=Path, help="write inputs and outputs here (default: a temp dir)")
    args = ap.parse_args(argv)
    print(f"fuzz: {args.n} hostile cases, seed {args.seed}, {args.workers} worker(s)")
    res = run_fuzz(args.n, seed=args.seed, workers=args.workers, scheme=args.scheme, keep=args.keep)
    print(
        f"crashes {res['crashes']} / lost rows {res['lost_rows']}  "
        f"(unexpected status {res['unexpected_status']}, bad offsets {res['bad_offsets']}, "
        f"leaks {res['leaks']}, timeouts {res['timeouts']}, error rows {res['error_rows']})"
    )
    print(f"{res['cases']} cases in {res['seconds']} s ({res['cases_per_second']} cases/s)")
    for ex in res["examples"]:
        print("  e.g.", ex)
    summary = {k: v for k, v in res.items() if k != "examples"}
    summary["passed"] = not any(
        res[k] for k in ("crashes", "lost_rows", "unexpected_status", "bad_offsets", "leaks")
    )
    print(json.dumps(summary, sort_keys=True))
    return 0 if summary["passed"] else 1


if __name__ == "__main__":
    raise SystemExit(main())
