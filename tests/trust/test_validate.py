"""validate: metrics checked against scikit-learn, edge cases, reports, CLI."""

from __future__ import annotations

import argparse
import json
import math
import random
import warnings
from pathlib import Path

import numpy as np
import pandas as pd
import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st
from sklearn.metrics import cohen_kappa_score, precision_recall_fscore_support

from pathsieve.cli import validate as cli_validate
from pathsieve.errors import ConfigError, InputError
from pathsieve.validate import (
    STATES,
    SchemeKeys,
    normalize_value,
    parse_state,
    read_evidence,
    validate,
)

DATA = Path(__file__).parent / "data"
SCORES = {"present": 1.0, "likely": 0.75, "uncertain": 0.5, "unlikely": 0.25, "absent": 0.0}
PROSTATE = SchemeKeys(
    "prostate",
    ("adenocarcinoma", "atypical_glands", "hgpin", "benign"),
    ("gleason_score", "grade_group", "pt"),
)


def _wide_pred(
    cases: list[str], keys: list[str], states: dict[tuple[str, str], str]
) -> pd.DataFrame:
    """A label table in the contract's layout; unmentioned cells are empty (NaN)."""
    rows = []
    for c in cases:
        row: dict[str, object] = {"case_id": c, "status": "ok", "error": "", "primary_label": ""}
        for k in keys:
            s = states[(c, k)]
            row[k] = SCORES.get(s, float("nan"))
        row["flags"] = ""
        rows.append(row)
    return pd.DataFrame(rows)


def _long_gold(
    cases: list[str], keys: list[str], states: dict[tuple[str, str], str]
) -> pd.DataFrame:
    return pd.DataFrame(
        [
            {
                "case_id": c,
                "label": k,
                "expected": "" if states[(c, k)] == "unmentioned" else states[(c, k)],
            }
            for c in cases
            for k in keys
        ]
    )


def _sk(y_true: list[int], y_pred: list[int]) -> tuple[float, float, float, int, float]:
    """Reference numbers from scikit-learn for one binary label (undefined -> NaN)."""
    with warnings.catch_warnings():
        warnings.simplefilter("ignore")
        p, r, f, s = precision_recall_fscore_support(
            y_true, y_pred, labels=[1], average=None, zero_division=np.nan
        )
        k = cohen_kappa_score(y_true, y_pred, labels=[0, 1])
    return float(p[0]), float(r[0]), float(f[0]), int(s[0]), float(k)


def _close(ours: float | None, ref: float) -> bool:
    if ours is None:
        return math.isnan(ref)
    return not math.isnan(ref) and abs(ours - ref) < 1e-9


@settings(max_examples=40, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(
    n_cases=st.integers(min_value=1, max_value=40),
    n_labels=st.integers(min_value=1, max_value=5),
    seed=st.integers(min_value=0, max_value=10_000),
    positive_at=st.sampled_from([0.75, 0.5, 1.0, 0.25]),
)
def test_binary_metrics_match_scikit_learn(
    n_cases: int, n_labels: int, seed: int, positive_at: float
) -> None:
    # Reference: scikit-learn precision_recall_fscore_support (zero_division=nan, so
    # undefined ratios are excluded from macro averages) and cohen_kappa_score.
    rnd = random.Random(seed)
    cases = [f"S-{i:03d}" for i in range(n_cases)]
    keys = [f"label_{j}" for j in range(n_labels)]
    gold = {(c, k): rnd.choice(STATES) for c in cases for k in keys}
    pred = {(c, k): rnd.choice(STATES) for c in cases for k in keys}
    result = validate(
        _long_gold(cases, keys, gold),
        _wide_pred(cases, keys, pred),
        scheme=SchemeKeys("random", tuple(keys)),
        positive_at=positive_at,
        n_boot=0,
    )
    pos = lambda s: int(SCORES.get(s, -1.0) >= positive_at)  # noqa: E731
    Y_true = np.array([[pos(gold[(c, k)]) for k in keys] for c in cases])
    Y_pred = np.array([[pos(pred[(c, k)]) for k in keys] for c in cases])
    assert [m.key for m in result.labels] == keys
    for j, m in enumerate(result.labels):
        p, r, f, s, kappa = _sk(list(Y_true[:, j]), list(Y_pred[:, j]))
        assert m.support == s
        assert m.n == n_cases
        assert _close(m.precision, p), (m.precision, p)
        assert _close(m.recall, r), (m.recall, r)
        assert _close(m.f1, f), (m.f1, f)
        assert _close(m.kappa, kappa), (m.kappa, kappa)
    with warnings.catch_warnings():
        warnings.simplefilter("ignore")
        for avg, ours in (("micro", result.micro), ("macro", result.macro)):
            if n_labels == 1:
                # one column is a binary target to scikit-learn, not a multilabel one:
                # restrict its averages to the positive class
                ref = dict(y_true=Y_true.ravel(), y_pred=Y_pred.ravel(), labels=[1])
            else:
                ref = dict(y_true=Y_true, y_pred=Y_pred)
            p, r, f, _ = precision_recall_fscore_support(**ref, average=avg, zero_division=np.nan)
            assert _close(ours.precision, float(p)), (avg, ours.precision, p)
            assert _close(ours.recall, float(r)), (avg, ours.recall, r)
            assert _close(ours.f1, float(f)), (avg, ours.f1, f)


@pytest.mark.parametrize(
    ("gold", "pred", "expect"),
    [
        # no positives anywhere: precision, recall, F1 undefined; kappa undefined
        (["absent", "", "unlikely"], ["", "absent", "uncertain"], (0, None, None, None, None)),
        # all positive on both sides: perfect P/R/F1, kappa undefined (chance agreement 1)
        (
            ["present", "likely", "present"],
            ["present", "present", "likely"],
            (3, 1.0, 1.0, 1.0, None),
        ),
        # gold positives, none predicted: recall 0, precision undefined, F1 0, kappa 0
        (["present", "present", "absent"], ["", "", ""], (2, None, 0.0, 0.0, 0.0)),
        # predicted positives, none in gold: precision 0, recall undefined
        (["absent", "", ""], ["present", "", ""], (0, 0.0, None, 0.0, 0.0)),
    ],
)
def test_edge_cases(gold: list[str], pred: list[str], expect: tuple) -> None:
    cases = ["E-1", "E-2", "E-3"]
    g = {(c, "hsil"): s or "unmentioned" for c, s in zip(cases, gold)}
    p = {(c, "hsil"): s or "unmentioned" for c, s in zip(cases, pred)}
    r = validate(
        _long_gold(cases, ["hsil"], g),
        _wide_pred(cases, ["hsil"], p),
        scheme=SchemeKeys("cervix", ("hsil",)),
        n_boot=50,
    )
    m = r.label("hsil")
    assert (m.support, m.precision, m.recall, m.f1, m.kappa) == expect
    # cross-check the same edge against scikit-learn
    yt = [int(SCORES.get(s or "unmentioned", -1) >= 0.75) for s in gold]
    yp = [int(SCORES.get(s or "unmentioned", -1) >= 0.75) for s in pred]
    sp, sr, sf, ss, sk = _sk(yt, yp)
    assert m.support == ss
    assert _close(m.precision, sp) and _close(m.recall, sr) and _close(m.f1, sf)
    assert _close(m.kappa, sk)


def test_bootstrap_is_seeded_and_brackets_the_estimate() -> None:
    rnd = random.Random(7)
    cases = [f"B-{i}" for i in range(60)]
    gold = {(c, "adenocarcinoma"): rnd.choice(["present", "absent"]) for c in cases}
    # predictions agree 80% of the time
    pred = {
        k: (v if rnd.random() < 0.8 else ("absent" if v == "present" else "present"))
        for k, v in gold.items()
    }
    args = (
        _long_gold(cases, ["adenocarcinoma"], gold),
        _wide_pred(cases, ["adenocarcinoma"], pred),
    )
    scheme = SchemeKeys("colorectal", ("adenocarcinoma",))
    a = validate(*args, scheme=scheme, n_boot=300, seed=3)
    b = validate(*args, scheme=scheme, n_boot=300, seed=3)
    c = validate(*args, scheme=scheme, n_boot=300, seed=4)
    m = a.label("adenocarcinoma")
    assert a.to_dict() == b.to_dict()
    assert m.f1_ci != c.label("adenocarcinoma").f1_ci
    for value, ci in (
        (m.precision, m.precision_ci),
        (m.recall, m.recall_ci),
        (m.f1, m.f1_ci),
        (m.kappa, m.kappa_ci),
    ):
        assert value is not None and ci is not None
        assert ci[0] <= value <= ci[1]
        assert ci[1] - ci[0] < 0.5  # 60 cases: a usable, not degenerate, interval
        assert ci[1] > ci[0]
    assert a.micro.f1_ci is not None and a.macro.f1_ci is not None
    none = validate(*args, scheme=scheme, n_boot=0)
    assert none.label("adenocarcinoma").f1_ci is None


def test_confusion_table_over_states() -> None:
    cases = ["C-1", "C-2", "C-3", "C-4"]
    gold = dict(
        zip([(c, "hsil") for c in cases], ["present", "uncertain", "unmentioned", "absent"])
    )
    pred = dict(
        zip([(c, "hsil") for c in cases], ["present", "likely", "unmentioned", "unmentioned"])
    )
    r = validate(
        _long_gold(cases, ["hsil"], gold),
        _wide_pred(cases, ["hsil"], pred),
        scheme=SchemeKeys("cervix", ("hsil",)),
        n_boot=0,
    )
    conf = r.label("hsil").confusion
    ix = {s: i for i, s in enumerate(STATES)}
    assert conf[ix["present"]][ix["present"]] == 1
    assert conf[ix["uncertain"]][ix["likely"]] == 1
    assert conf[ix["unmentioned"]][ix["unmentioned"]] == 1
    assert conf[ix["absent"]][ix["unmentioned"]] == 1
    assert sum(map(sum, conf)) == 4
    assert r.confusion == conf
    errors = {(d.case_id, d.error) for d in r.disagreements}
    assert errors == {("C-2", "false positive"), ("C-4", "state")}


@pytest.mark.parametrize(
    ("gold", "pred", "same"),
    [
        ("7", 7.0, True),
        ("2", "2.0", True),
        ("3+4=7", "3+4=7", True),
        ("3+4=7", "4+3=7", False),
        ("PT3A", "pT3a", True),
        ("Positive", " positive ", True),
        ("", None, True),
        ("15", "", False),
        ("2/15", "2/15", True),
    ],
)
def test_value_normalisation(gold: str, pred: object, same: bool) -> None:
    assert (normalize_value(gold) == normalize_value(pred)) is same


def test_fixture_tables_report_unknowns_values_and_evidence() -> None:
    r = validate(
        DATA / "gold_prostate_long.csv",
        DATA / "labels_prostate.csv",
        scheme=PROSTATE,
        evidence=DATA / "evidence_prostate.jsonl",
        n_boot=200,
    )
    # unknown cases and labels are listed, not dropped silently
    assert r.gold_only_cases == ("PS-1099",)
    assert r.gold_only_labels == ("perineural_invasion",)
    assert r.unknown_labels == ("perineural_invasion",)
    assert r.pred_errors == ("PS-1006",)
    assert r.pred_only_labels == ()  # the gold judges every predicted column
    problems = "\n".join(r.problems())
    assert "PS-1099" in problems and "perineural_invasion" in problems and "PS-1006" in problems
    adeno = r.label("adenocarcinoma")
    # PS-1001 TP, PS-1002 TN, PS-1003 FN (uncertain), PS-1004 TP, PS-1006 FN (error row)
    assert (adeno.tp, adeno.fp, adeno.fn, adeno.tn) == (2, 0, 2, 1)
    gleason = r.value("gleason_score")
    assert (gleason.n, gleason.correct) == (2, 1)
    assert gleason.mismatches[0].case_id == "PS-1004"
    assert r.value("pt").correct == 1  # "PT3A" == "pT3a" case-insensitively
    assert r.value("grade_group").correct == 1  # "2" == 2
    # the disagreement on PS-1003 carries the evidence text and its section
    fn = next(d for d in r.disagreements if d.case_id == "PS-1003" and d.label == "adenocarcinoma")
    assert fn.error == "false negative"
    assert [(e.text, e.section, e.certainty) for e in fn.evidence] == [
        ("adenocarcinoma", "diagnosis", "uncertain")
    ]
    g = next(d for d in r.disagreements if d.label == "gleason_score")
    assert (g.gold, g.pred, g.evidence[0].text) == ("4+3=7", "4+4=8", "Gleason score 4+4=8")
    # decision errors come before state-only differences
    kinds = [d.error == "state" for d in r.disagreements]
    assert kinds == sorted(kinds)


def test_per_part_prediction_rolls_up_to_cases() -> None:
    pred = pd.DataFrame(
        {
            "case_id": ["P-1", "P-1", "P-2"],
            "part": ["A", "B", "A"],
            "status": ["ok"] * 3,
            "error": [""] * 3,
            "primary_label": [""] * 3,
            "adenocarcinoma": [0.0, 0.75, None],
            "gleason_score": ["", "3+3=6", ""],
            "flags": [""] * 3,
        }
    )
    gold = pd.DataFrame(
        {
            "case_id": ["P-1", "P-2", "P-1"],
            "label": ["adenocarcinoma", "adenocarcinoma", "gleason_score"],
            "expected": ["likely", "absent", "3+3=6"],
        }
    )
    scheme = SchemeKeys("prostate", ("adenocarcinoma",), ("gleason_score",))
    r = validate(gold, pred, scheme=scheme, n_boot=0)
    assert not r.per_part
    assert r.label("adenocarcinoma").confusion[1][1] == 1  # likely x likely (part B wins)
    assert r.value("gleason_score").correct == 1
    # gold per part, prediction per case: refused with a way out
    with pytest.raises(InputError, match="--per part"):
        validate(
            gold.assign(part="A"),
            pred.drop(columns="part").drop_duplicates("case_id"),
            scheme=scheme,
        )


def test_wide_gold_and_positive_threshold() -> None:
    pred = pd.DataFrame({"case_id": ["W-1", "W-2"], "hsil": [0.5, 1.0], "lsil": [None, 0.25]})
    gold = pd.DataFrame(
        {"case_id": ["W-1", "W-2"], "hsil": ["uncertain", "present"], "lsil": ["", ""]}
    )
    scheme = SchemeKeys("cervix", ("hsil", "lsil"))
    strict = validate(gold, pred, scheme=scheme, n_boot=0)
    assert strict.label("hsil").support == 1
    loose = validate(gold, pred, scheme=scheme, n_boot=0, positive_at=0.5)
    assert loose.label("hsil").support == 2 and loose.label("hsil").f1 == 1.0
    assert strict.label("lsil").n == 2
    assert [(d.case_id, d.label, d.error) for d in strict.disagreements] == [
        ("W-2", "lsil", "state")
    ]


@pytest.mark.parametrize(
    ("gold", "message"),
    [
        (pd.DataFrame({"case": ["x"], "label": ["hsil"], "expected": ["present"]}), "no 'case_id'"),
        (
            pd.DataFrame({"case_id": ["x"], "label": ["hsil"], "expected": ["maybe"]}),
            "row 1.*'maybe'",
        ),
        (
            pd.DataFrame(
                {
                    "case_id": ["x", "x"],
                    "label": ["hsil", "hsil"],
                    "expected": ["present", "absent"],
                }
            ),
            "coded twice",
        ),
        (pd.DataFrame({"case_id": ["x"], "label": [""], "expected": ["present"]}), "empty label"),
    ],
)
def test_bad_gold_is_an_input_error(gold: pd.DataFrame, message: str) -> None:
    pred = pd.DataFrame({"case_id": ["x"], "hsil": [1.0]})
    with pytest.raises(InputError, match=message):
        validate(gold, pred, scheme=SchemeKeys("cervix", ("hsil",)), n_boot=0)


def test_bad_gold_file_names_the_line(tmp_path: Path) -> None:
    path = tmp_path / "gold.csv"
    path.write_text("case_id,label,expected\nx,hsil,present\ny,hsil,probably\n", encoding="utf-8")
    pred = pd.DataFrame({"case_id": ["x", "y"], "hsil": [1.0, 0.0]})
    with pytest.raises(InputError) as err:
        validate(path, pred, scheme=SchemeKeys("cervix", ("hsil",)), n_boot=0)
    assert "gold.csv:3, label 'hsil'" in str(err.value) and "'probably'" in str(err.value)
    with pytest.raises(InputError, match="not found"):
        validate(tmp_path / "missing.csv", pred, n_boot=0)
    with pytest.raises(ConfigError):
        validate(path, pred, positive_at=0.0)


@pytest.mark.parametrize(
    ("cell", "state"),
    [
        (1.0, "present"),
        ("0.75", "likely"),
        (0.5, "uncertain"),
        ("0.25", "unlikely"),
        (0, "absent"),
        ("", "unmentioned"),
        (float("nan"), "unmentioned"),
        ("Likely", "likely"),
        (None, "unmentioned"),
    ],
)
def test_parse_state(cell: object, state: str) -> None:
    assert parse_state(cell) == state


def test_reports_render(tmp_path: Path) -> None:
    r = validate(
        DATA / "gold_prostate_long.csv",
        DATA / "labels_prostate.csv",
        scheme=PROSTATE,
        evidence=DATA / "evidence_prostate.jsonl",
        n_boot=100,
    )
    page = r.to_html()
    assert page.startswith("<!DOCTYPE html>") and "<svg" in page
    # self-contained: nothing fetched (the SVG namespace is an identifier, not a request)
    for needle in ("src=", "href=", "@import", "url("):
        assert needle not in page
    assert page.count("<rect") == len(r.labels) + 2  # one bar per label + micro + macro
    assert "not diagnoses" in page and "PS-1099" in page
    assert "Gleason score 4+4=8" in page
    md = r.to_markdown()
    assert "| adenocarcinoma |" in md and "## Disagreements" in md
    data = json.loads(r.to_json())
    assert data["labels"][0]["key"] == "adenocarcinoma"
    assert data["gold_only_cases"] == ["PS-1099"]
    text = r.to_text()
    assert "adenocarcinoma" in text and "PS-1003" in text and "note:" in text


def _parser() -> argparse.ArgumentParser:
    parser = argparse.ArgumentParser(prog="pathsieve")
    cli_validate.register(parser.add_subparsers())
    return parser


@pytest.mark.parametrize("output", [None, "report.html", "report.md", "json"])
def test_cli(tmp_path: Path, capsys: pytest.CaptureFixture[str], output: str | None) -> None:
    argv = [
        "validate",
        "--gold", str(DATA / "gold_prostate_long.csv"),
        "--pred", str(DATA / "labels_prostate.csv"),
        "--evidence", str(DATA / "evidence_prostate.jsonl"),
        "--n-boot", "50",
    ]  # fmt: skip
    if output == "json":
        argv.append("--json")
    elif output:
        argv += ["-o", str(tmp_path / output)]
    args = _parser().parse_args(argv)
    assert args.func(args) == 0
    out = capsys.readouterr()
    if output == "json":
        data = json.loads(out.out)
        assert {m["key"] for m in data["labels"]} >= {"adenocarcinoma", "hgpin"}
        assert "PS-1099" in out.err
    elif output:
        written = (tmp_path / output).read_text(encoding="utf-8")
        assert "adenocarcinoma" in written
        assert f"wrote {tmp_path / output}" in out.out and "PS-1099" in out.out
    else:
        assert "precision" in out.out and "PS-1099" in out.out


def test_cli_help_and_bad_output(tmp_path: Path) -> None:
    parser = _parser()
    sub = next(a for a in parser._actions if isinstance(a, argparse._SubParsersAction))
    assert sub.choices["validate"].description
    args = parser.parse_args(
        ["validate", "--gold", str(DATA / "gold_prostate_long.csv"), "--pred",
         str(DATA / "labels_prostate.csv"), "-o", str(tmp_path / "r.pdf")]
    )  # fmt: skip
    with pytest.raises(ConfigError, match=r"\.html or \.md"):
        args.func(args)


def test_read_evidence_cleans_types() -> None:
    rows = read_evidence(DATA / "evidence_prostate.jsonl")
    assert rows[0]["labels"] == ["adenocarcinoma"] and isinstance(rows[0]["start"], int)
    trig = next(r for r in rows if r["triggers"])
    assert set(trig["triggers"][0]) == {"text", "start", "end", "category"}
    assert all(isinstance(r["decides"], bool) for r in rows)


def test_value_keys_are_never_read_as_certainty_scores() -> None:
    # a lymph-node count of 0 or 1 looks like a score; pathsieve knows it is a value
    pred = pd.DataFrame({"case_id": ["N-1", "N-2"], "lymph_nodes_positive": ["0", "1"]})
    gold = pd.DataFrame(
        {"case_id": ["N-1", "N-2"], "label": ["lymph_nodes_positive"] * 2, "expected": ["0", "2"]}
    )
    r = validate(gold, pred, scheme=SchemeKeys("x", (), ("lymph_nodes_positive",)), n_boot=0)
    assert r.labels == () and r.value("lymph_nodes_positive").correct == 1
    # an explicit scheme without that value reports it, yet still scores it as a value
    r = validate(gold, pred, scheme=SchemeKeys("x", ("hsil",)), n_boot=0)
    assert r.unknown_labels == ("lymph_nodes_positive",)
    assert r.value("lymph_nodes_positive").n == 2
