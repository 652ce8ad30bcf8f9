"""sample: seeded, sized, every non-empty stratum represented."""

from __future__ import annotations

import argparse
import random
from pathlib import Path

import pandas as pd
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from pathsieve.cli import sample as cli_sample
from pathsieve.errors import ConfigError, InputError
from pathsieve.sample import FAILED, NO_LABEL, allocate, sample, strata
from pathsieve.validate import SchemeKeys

DATA = Path(__file__).parent / "data"
KEYS = ("adenocarcinoma", "high_grade_dysplasia", "low_grade_dysplasia", "hyperplastic_polyp")
SCHEME = SchemeKeys("colorectal", KEYS, ("pt",))
SCORES = [1.0, 0.75, 0.5, 0.25, 0.0]


def _table(n: int, seed: int) -> pd.DataFrame:
    """A skewed label table: common confident states, rare doubtful ones, a few failures."""
    rnd = random.Random(seed)
    rows = []
    for i in range(n):
        failed = rnd.random() < 0.03
        row: dict[str, object] = {
            "case_id": f"CR-{i:04d}",
            "status": "error" if failed else "ok",
            "error": "unreadable" if failed else "",
            "primary_label": "",
        }
        for k in KEYS:
            r = rnd.random()
            row[k] = (
                None if failed or r < 0.6 else rnd.choices(SCORES, weights=[50, 5, 2, 1, 20])[0]
            )
        row["pt"] = "pT2" if rnd.random() < 0.1 else ""
        row["flags"] = ""
        rows.append(row)
    return pd.DataFrame(rows)


def test_determinism_and_size() -> None:
    df = _table(300, seed=1)
    a = sample(df, 40, seed=5, scheme=SCHEME)
    b = sample(df, 40, seed=5, scheme=SCHEME)
    c = sample(df, 40, seed=6, scheme=SCHEME)
    pd.testing.assert_frame_equal(a, b)
    assert list(a["case_id"]) != list(c["case_id"])
    assert len(a) == 40 and a["case_id"].is_unique
    assert list(a.columns) == ["case_id", "stratum", "label", "state", "picked"]
    # cases keep the label table's order
    order = {c: i for i, c in enumerate(df["case_id"])}
    assert [order[c] for c in a["case_id"]] == sorted(order[c] for c in a["case_id"])


def test_fewer_cases_than_requested_gives_all() -> None:
    df = _table(12, seed=2)
    s = sample(df, 50, seed=0, scheme=SCHEME)
    assert sorted(s["case_id"]) == sorted(df["case_id"])
    assert set(s["picked"]) == {"all"}


@settings(max_examples=30, deadline=None)
@given(
    n_cases=st.integers(min_value=5, max_value=150),
    seed=st.integers(min_value=0, max_value=1000),
    extra=st.integers(min_value=0, max_value=30),
    minimum=st.integers(min_value=1, max_value=3),
)
def test_every_stratum_represented_when_n_allows(
    n_cases: int, seed: int, extra: int, minimum: int
) -> None:
    df = _table(n_cases, seed)
    groups = strata(df, scheme=SCHEME)
    n = min(len(groups) + extra, n_cases)
    s = sample(df, n, seed=seed, scheme=SCHEME, min_per_stratum=minimum)
    assert len(s) == n
    chosen = set(s["case_id"])
    for g in groups:
        # each non-empty stratum has at least one case in the sample ...
        assert chosen & set(g.cases), g.name
    if n >= len(groups) * minimum:
        # ... and its minimum when the budget covers every stratum's minimum
        for g in groups:
            assert len(chosen & set(g.cases)) >= min(minimum, len(g.cases)), g.name


def test_rare_states_are_oversampled() -> None:
    df = _table(600, seed=3)
    s = sample(df, 30, seed=0, scheme=SCHEME)
    doubtful = s["case_id"].isin(
        [
            c
            for g in strata(df, scheme=SCHEME)
            if g.state in ("uncertain", "unlikely")
            for c in g.cases
        ]
    )
    population = sum(
        len(g.cases) for g in strata(df, scheme=SCHEME) if g.state in ("uncertain", "unlikely")
    )
    # doubtful states are a small share of the table but a large share of the sample
    assert doubtful.mean() > 2 * population / len(df)


def test_special_strata_and_value_columns_skipped() -> None:
    df = pd.DataFrame(
        {
            "case_id": ["a", "b", "c", "d"],
            "status": ["ok", "ok", "error", "ok"],
            "adenocarcinoma": [1.0, None, None, None],
            "pt": ["pT3", "", "", ""],
        }
    )
    names = {g.name: g.cases for g in strata(df)}  # no scheme: label columns from the data
    assert names == {"adenocarcinoma:present": ("a",), FAILED: ("c",), NO_LABEL: ("b", "d")}
    by_label = {g.name for g in strata(df, by="label")}
    assert by_label == {"adenocarcinoma", FAILED, NO_LABEL}


def test_per_part_table_samples_cases() -> None:
    df = pd.DataFrame(
        {
            "case_id": ["a", "a", "b", "c"],
            "part": ["A", "B", "A", "A"],
            "hsil": [1.0, 0.5, None, 0.0],
        }
    )
    s = sample(df, 2, seed=0, scheme=SchemeKeys("cervix", ("hsil",)))
    assert s["case_id"].is_unique and len(s) == 2


@pytest.mark.parametrize(
    ("sizes", "n", "minimum", "expect"),
    [
        ([1, 4, 20], 10, 2, [1, 3, 6]),
        ([3, 3, 3], 2, 1, [1, 1, 0]),  # budget below the number of strata: rarest first
        ([5, 5], 100, 2, [5, 5]),  # never above a stratum's size
        ([2, 8], 5, 0, [1, 4]),  # no minimum: purely proportional
    ],
)
def test_allocate(sizes: list[int], n: int, minimum: int, expect: list[int]) -> None:
    assert allocate(sizes, n, minimum=minimum) == expect


@settings(max_examples=60, deadline=None)
@given(
    sizes=st.lists(st.integers(min_value=1, max_value=50), min_size=1, max_size=12).map(sorted),
    n=st.integers(min_value=0, max_value=200),
    minimum=st.integers(min_value=0, max_value=4),
)
def test_allocate_invariants(sizes: list[int], n: int, minimum: int) -> None:
    q = allocate(sizes, n, minimum=minimum)
    assert sum(q) == min(n, sum(sizes))
    assert all(0 <= a <= s for a, s in zip(q, sizes))
    if n >= minimum * len(sizes):
        assert all(a >= min(minimum, s) for a, s in zip(q, sizes))


@pytest.mark.parametrize(
    ("kwargs", "error"),
    [({"n": 0}, ConfigError), ({"n": 3, "by": "colour"}, ConfigError)],
)
def test_bad_arguments(kwargs: dict, error: type[Exception]) -> None:
    with pytest.raises(error):
        sample(_table(10, 0), **kwargs)


def test_scheme_without_matching_columns() -> None:
    with pytest.raises(InputError, match="none of scheme"):
        sample(_table(10, 0), 3, scheme=SchemeKeys("cervix", ("hsil", "lsil")))


def test_cli_writes_a_case_filter(tmp_path: Path, capsys: pytest.CaptureFixture[str]) -> None:
    parser = argparse.ArgumentParser(prog="pathsieve")
    cli_sample.register(parser.add_subparsers())
    out = tmp_path / "sample.csv"
    args = parser.parse_args(
        ["sample", str(DATA / "labels_prostate.csv"), "-n", "4", "--seed", "2", "-o", str(out)]
    )
    assert args.func(args) == 0
    written = pd.read_csv(out, dtype=str, keep_default_na=False)
    assert len(written) == 4 and written["case_id"].is_unique
    assert set(written["case_id"]) <= {f"PS-100{i}" for i in range(1, 7)}
    assert "wrote" in capsys.readouterr().out
