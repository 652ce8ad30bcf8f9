"""Draw a review sample that represents rare labels and doubtful states.

A plain random sample of a label table is mostly common, confident cases.  This
one is stratified: every (label, state) pair that occurs is a stratum ("hsil
uncertain", "adenocarcinoma absent"...), plus "(none)" for cases with no label
mentioned and "(error)" for cases the labeller could not read.  Each non-empty
stratum gets a minimum number of cases, rarest first, and the rest of the
budget is shared in proportion to stratum size.  A case can belong to several
strata; the sample records the stratum that picked it.

The output (``case_id``, ``stratum``, ``label``, ``state``, ``picked``) is a
case filter that ``pathsieve review --cases`` accepts.

>>> import pandas as pd
>>> from pathsieve.validate import SchemeKeys
>>> labels = pd.DataFrame({"case_id": ["a", "b", "c", "d"],
...                        "hsil": [1.0, 1.0, 0.5, None], "lsil": [None, None, None, 0.0]})
>>> s = sample(labels, 3, seed=1, scheme=SchemeKeys("cervix", ("hsil", "lsil")))
>>> sorted(s["stratum"])
['hsil:present', 'hsil:uncertain', 'lsil:absent']
"""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass
from typing import Literal

import numpy as np
import pandas as pd

from .errors import ConfigError, InputError
from .records import CERTAINTY_ORDER
from .validate import (
    META_COLUMNS,
    TableSource,
    _text,
    parse_state,
    read_table,
    scheme_keys,
)

__all__ = ["FAILED", "NO_LABEL", "Stratum", "allocate", "sample", "strata"]

#: Strata for cases with no label mentioned, and for cases the labeller failed on.
NO_LABEL = "(none)"
FAILED = "(error)"
_STATE_RANK = {s: i for i, s in enumerate((*CERTAINTY_ORDER, "unmentioned", "error"))}

By = Literal["label_state", "label", "primary_label"]


@dataclass(frozen=True, slots=True)
class Stratum:
    """A group of cases: ``label`` in ``state`` (state "" when ``by="label"``)."""

    label: str
    state: str
    cases: tuple[str, ...]

    @property
    def name(self) -> str:
        return f"{self.label}:{self.state}" if self.state else self.label


def _label_columns(df: pd.DataFrame, scheme: object) -> list[str]:
    if scheme is not None:
        keys = scheme_keys(scheme)
        missing = [k for k in keys.label_keys if k not in df.columns]
        if len(missing) == len(keys.label_keys):
            raise InputError(
                f"the label table has none of scheme {keys.name!r}'s labels "
                f"({', '.join(keys.label_keys)}); check --scheme"
            )
        return [k for k in keys.label_keys if k in df.columns]
    # without a scheme: every non-meta column whose cells are all certainty states,
    # except the value labels pathsieve knows (a node count of 0/1 is no score)
    from . import schemes as _schemes

    values = set(getattr(_schemes, "KNOWN_VALUES", ()))
    out = []
    for c in df.columns:
        if c in META_COLUMNS or c in values:
            continue
        try:
            for v in df[c]:
                parse_state(v)
        except InputError:
            continue  # a value label (Gleason score, pT...)
        out.append(c)
    return out


def strata(labels: TableSource, *, scheme: object = None, by: By = "label_state") -> list[Stratum]:
    """The non-empty strata of a label table (per-part tables are rolled up to cases).

    ``by="label_state"``: one stratum per (label, state) that occurs;
    ``by="label"``: one per label mentioned at any state; ``by="primary_label"``:
    one per primary label.  Strata come rarest first (ties in scheme and state
    order), so a small sample spends its budget on the rare ones.
    """
    df = read_table(labels, what="label table")
    if "case_id" not in df.columns:
        raise InputError(f"label table has no 'case_id' column (columns: {', '.join(df.columns)})")
    if by not in ("label_state", "label", "primary_label"):
        raise ConfigError(f"unknown stratification {by!r}; use label_state, label or primary_label")
    columns = _label_columns(df, scheme) if by != "primary_label" else []
    order = {c: i for i, c in enumerate(columns)}
    groups: dict[tuple[str, str], dict[str, None]] = {}
    cases: dict[str, None] = {}
    assigned: set[str] = set()
    for pos, rec in enumerate(df.to_dict(orient="records")):
        case = _text(rec.get("case_id"))
        if not case:
            raise InputError(f"label table row {pos + 1} has an empty case_id")
        cases[case] = None
        if _text(rec.get("status")).lower() == "error":
            groups.setdefault((FAILED, ""), {})[case] = None
            assigned.add(case)
            continue
        if by == "primary_label":
            primary = _text(rec.get("primary_label"))
            if primary:
                groups.setdefault((primary, ""), {})[case] = None
                assigned.add(case)
            continue
        for c in columns:
            state = parse_state(rec.get(c), where=f"label table row {pos + 1}, column {c!r}")
            if state == "unmentioned":
                continue
            groups.setdefault((c, state if by == "label_state" else ""), {})[case] = None
            assigned.add(case)
    unassigned = [c for c in cases if c not in assigned]
    if unassigned:
        groups[(NO_LABEL, "")] = dict.fromkeys(unassigned)
    out = [Stratum(label, state, tuple(members)) for (label, state), members in groups.items()]
    out.sort(
        key=lambda s: (
            len(s.cases),
            order.get(s.label, len(order)),
            _STATE_RANK.get(s.state, -1),
            s.label,
        )
    )
    return out


def allocate(sizes: Sequence[int], n: int, *, minimum: int = 1) -> list[int]:
    """Quotas for strata of ``sizes`` (rarest first) summing to at most ``n``.

    Each stratum first gets ``min(minimum, size)`` while the budget lasts, dealt
    one case per stratum per round in the order given (so the rarest are served
    first and every stratum gets one before any gets two); the rest is shared in
    proportion to size by largest remainder, never above a stratum's size.

    >>> allocate([1, 4, 20], 10, minimum=2)
    [1, 3, 6]
    """
    if n < 0 or minimum < 0:
        raise ConfigError("sample size and minimum per stratum must be >= 0")
    quota = [0] * len(sizes)
    budget = n
    # the minimum is dealt one round at a time, so that a budget too small for
    # every minimum still gives each stratum one case before any gets a second
    for level in range(1, minimum + 1):
        for i, size in enumerate(sizes):
            if budget and quota[i] < min(level, size):
                quota[i] += 1
                budget -= 1
    while budget > 0:
        room = [size - q for size, q in zip(sizes, quota)]
        total = sum(size for size, r in zip(sizes, room) if r > 0)
        if total == 0:
            break
        share = [budget * size / total if r > 0 else 0.0 for size, r in zip(sizes, room)]
        whole = [min(int(s), r) for s, r in zip(share, room)]
        left = budget - sum(whole)
        # largest remainders next; ties go to the rarer (earlier) stratum
        by_rest = sorted(
            (i for i, r in enumerate(room) if r - whole[i] > 0),
            key=lambda i: (-(share[i] - whole[i]), i),
        )
        for i in by_rest[:left]:
            whole[i] += 1
        if sum(whole) == 0:
            break
        for i, w in enumerate(whole):
            quota[i] += w
        budget -= sum(whole)
    return quota


def sample(
    labels: TableSource,
    n: int,
    *,
    seed: int = 0,
    by: By = "label_state",
    scheme: object = None,
    min_per_stratum: int = 2,
) -> pd.DataFrame:
    """A stratified, seeded review sample of ``n`` cases (all cases when fewer).

    Strata are visited rarest first; each takes cases at random (seeded) until
    its quota is met, counting cases an earlier stratum already took; then the
    sample is topped up at random to ``n``.  Columns: ``case_id``, ``stratum``
    (e.g. "hsil:uncertain"), ``label``, ``state`` and ``picked`` ("stratum" or
    "fill"), in the order the cases appear in the label table.
    """
    if n < 1:
        raise ConfigError(f"sample size must be at least 1, got {n}")
    groups = strata(labels, scheme=scheme, by=by)
    every: dict[str, None] = {}
    for s in groups:
        every.update(dict.fromkeys(s.cases))
    df = read_table(labels, what="label table")
    case_order = {c: i for i, c in enumerate(dict.fromkeys(_text(c) for c in df["case_id"]))}
    rarest: dict[str, Stratum] = {}
    for s in groups:
        for c in s.cases:
            rarest.setdefault(c, s)
    rng = np.random.default_rng(seed)
    picked: dict[str, tuple[Stratum, str]] = {}
    if n >= len(every):
        picked = {c: (rarest[c], "all") for c in every}
    else:
        quotas = allocate([len(s.cases) for s in groups], n, minimum=min_per_stratum)
        for s, quota in zip(groups, quotas):
            have = sum(1 for c in s.cases if c in picked)
            need = quota - have
            if need <= 0:
                continue
            pool = [c for c in s.cases if c not in picked]
            chosen = rng.choice(len(pool), size=min(need, len(pool)), replace=False)
            for i in sorted(int(j) for j in chosen):
                picked[pool[i]] = (s, "stratum")
        rest = [c for c in every if c not in picked]
        need = n - len(picked)
        if need > 0 and rest:
            chosen = rng.choice(len(rest), size=min(need, len(rest)), replace=False)
            for i in sorted(int(j) for j in chosen):
                picked[rest[i]] = (rarest[rest[i]], "fill")
    rows = [
        {
            "case_id": c,
            "stratum": s.name,
            "label": s.label,
            "state": s.state,
            "picked": how,
        }
        for c, (s, how) in sorted(picked.items(), key=lambda kv: case_order.get(kv[0], 0))
    ]
    return pd.DataFrame(rows, columns=["case_id", "stratum", "label", "state", "picked"])
