"""The fuzz benchmark's harness, on a small run: it labels hostile input of every
format and finds no crash, lost row, wrong status, bad offset or leak.

``benchmarks/fuzz.py -n 10000`` is the full run (figures in its JSON line);
this keeps its checks honest: they must also catch a row that goes missing.
"""

from __future__ import annotations

from pathlib import Path
from typing import Any

import pandas as pd


def test_small_fuzz_run_passes(bench: Any) -> None:
    fuzz = bench("fuzz")
    res = fuzz.run_fuzz(240, seed=5, workers=1)
    assert res["cases"] == 240
    for key in ("crashes", "lost_rows", "unexpected_status", "bad_offsets", "leaks"):
        assert res[key] == 0, (key, res["examples"])
    # the hostile kinds were really generated
    assert {"mutated", "unicode", "report"} <= set(res["kinds"]) and len(res["kinds"]) >= 8


def test_fuzz_checks_notice_a_lost_row(bench: Any, tmp_path: Path) -> None:
    fuzz = bench("fuzz")
    cases = fuzz.generate_cases(6, seed=2, surrogates=False)
    for i, c in enumerate(cases):
        c.raw_id, c.text, c.expect = f"FZ-{i:06d}", "DIAGNOSIS: adenoma.", "ok"
    fuzz._expected_ids(cases)
    out, ev = tmp_path / "labels.csv", tmp_path / "ev.jsonl"
    rows = [{"case_id": c.expect_id, "status": "ok", "error": ""} for c in cases]
    del rows[3]  # a row the run lost
    pd.DataFrame(rows).to_csv(out, index=False)
    ev.write_text("")
    tally = fuzz.Tally()
    fuzz._check("csv", cases, out, ev, "", "", tally)
    assert tally.lost > 0
