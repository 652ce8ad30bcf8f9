"""Check a label table against a hand-coded gold table.

Per binary label: support, precision, recall, F1 and Cohen's kappa, with
bootstrap 95% confidence intervals (cases resampled, seeded); micro and macro
averages; a confusion table over the certainty states; per value label the
accuracy after normalisation, with the mismatches; and the list of
disagreements, each with the evidence text that produced the prediction.

A label is *positive* when its score is at least ``positive_at`` (0.75 by
default: present or likely).  "Unmentioned" (an empty cell) is negative.

Gold tables come long (``case_id,label,expected`` plus optional ``scheme``,
``part``) or wide (the layout ``pathsieve label`` writes).  A long table judges
only the (case, label) pairs it lists; a wide table judges every cell.
Cases and labels found on one side only are listed in the result, never
dropped silently.

>>> import pandas as pd
>>> gold = pd.DataFrame({"case_id": ["c1", "c2", "c3"], "label": ["hsil"] * 3,
...                      "expected": ["present", "absent", "likely"]})
>>> pred = pd.DataFrame({"case_id": ["c1", "c2", "c3"], "hsil": [1.0, None, 0.5]})
>>> r = validate(gold, pred, scheme=SchemeKeys("cervix", ("hsil",), ()), n_boot=0)
>>> (r.labels[0].precision, r.labels[0].recall)
(1.0, 0.5)
"""

from __future__ import annotations

import html
import json
import math
import os
import re
from collections import defaultdict
from collections.abc import Iterable, Mapping, Sequence
from dataclasses import asdict, dataclass, field, replace
from pathlib import Path
from typing import Any

import numpy as np
import pandas as pd

from .errors import ConfigError, InputError
from .records import CERTAINTY_ORDER, CERTAINTY_SCORE, score_to_state

__all__ = [
    "META_COLUMNS",
    "STATES",
    "AverageMetrics",
    "Disagreement",
    "EvidenceNote",
    "LabelMetrics",
    "SchemeKeys",
    "ValidationResult",
    "ValueMetrics",
    "ValueMismatch",
    "is_blank",
    "normalize_value",
    "parse_state",
    "read_evidence",
    "read_table",
    "scheme_keys",
    "validate",
]

#: The certainty states plus "unmentioned" (an empty cell), most definite positive first.
STATES: tuple[str, ...] = (*CERTAINTY_ORDER, "unmentioned")
#: Columns of a label table that are not labels.
META_COLUMNS: frozenset[str] = frozenset(
    {"case_id", "part", "status", "error", "primary_label", "flags", "scheme", "text"}
)
_STATE_RANK = {s: i for i, s in enumerate(STATES)}

TableSource = pd.DataFrame | str | os.PathLike[str]


# ---------------------------------------------------------------------------
# schemes and tables


@dataclass(frozen=True, slots=True)
class SchemeKeys:
    """What validation, sampling and review need from a scheme: its label keys.

    Built from a loaded :class:`pathsieve.schemes.Scheme` by :func:`scheme_keys`,
    or directly (e.g. in tests, or for a scheme outside the shipped ones).
    """

    name: str
    label_keys: tuple[str, ...]
    value_keys: tuple[str, ...] = ()
    descriptions: tuple[tuple[str, str], ...] = ()

    def description(self, key: str) -> str:
        return dict(self.descriptions).get(key, "")


def scheme_keys(scheme: object) -> SchemeKeys:
    """The label keys of a scheme given by name, YAML path, loaded scheme or SchemeKeys.

    >>> scheme_keys(SchemeKeys("x", ("a",))).label_keys
    ('a',)
    """
    if isinstance(scheme, SchemeKeys):
        return scheme
    if isinstance(scheme, str | os.PathLike):
        # imported here: loading a scheme binds the ontology, which validation of a
        # plain table with an explicit SchemeKeys never needs
        from .schemes import load_scheme

        scheme = load_scheme(os.fspath(scheme))
    try:
        label_keys = tuple(str(k) for k in scheme.label_keys)  # type: ignore[attr-defined]
        value_keys = tuple(str(k) for k in scheme.value_keys)  # type: ignore[attr-defined]
    except AttributeError as exc:
        raise ConfigError(
            f"not a scheme: {type(scheme).__name__}; pass a scheme name, a YAML path or a Scheme"
        ) from exc
    labels = getattr(scheme, "labels", {})
    descriptions = tuple(
        (k, str(getattr(labels.get(k), "description", "") or "")) for k in label_keys
    )
    return SchemeKeys(str(getattr(scheme, "name", "")), label_keys, value_keys, descriptions)


def _merge_keys(parts: Sequence[SchemeKeys]) -> SchemeKeys:
    labels: dict[str, None] = {}
    values: dict[str, None] = {}
    desc: dict[str, str] = {}
    for sk in parts:
        labels.update(dict.fromkeys(sk.label_keys))
        values.update(dict.fromkeys(sk.value_keys))
        for k, d in sk.descriptions:
            desc.setdefault(k, d)
    return SchemeKeys(
        "+".join(sk.name for sk in parts),
        tuple(labels),
        tuple(values),
        tuple(desc.items()),
    )


def is_blank(x: object) -> bool:
    """Whether a table cell is empty (None, NaN, NA or whitespace)."""
    if x is None:
        return True
    if isinstance(x, float):
        return math.isnan(x)
    if isinstance(x, str):
        return not x.strip()
    if isinstance(x, np.floating):
        return bool(np.isnan(x))
    return x is pd.NA or x is pd.NaT


def _text(x: object) -> str:
    """A cell as a trimmed string ("" when blank; 12.0 -> "12")."""
    if is_blank(x):
        return ""
    if isinstance(x, float) and x.is_integer():
        return str(int(x))
    if isinstance(x, np.floating) and float(x).is_integer():
        return str(int(x))
    return str(x).strip()


def parse_state(x: object, *, where: str = "") -> str:
    """A certainty cell (state word or score; empty = unmentioned) as a state word.

    >>> parse_state(0.75), parse_state(""), parse_state("Uncertain"), parse_state("1")
    ('likely', 'unmentioned', 'uncertain', 'present')
    """
    if is_blank(x):
        return "unmentioned"
    s = str(x).strip().lower()
    if s in _STATE_RANK:
        return s
    try:
        return score_to_state(float(s))
    except ValueError:
        pass
    known = ", ".join(f"{k} ({v})" for k, v in CERTAINTY_SCORE.items())
    at = f"{where}: " if where else ""
    raise InputError(
        f"{at}not a certainty state or score: {str(x)!r}; use one of {known}, "
        "'unmentioned' or an empty cell"
    )


_SPACES = re.compile(r"\s+")


def normalize_value(x: object) -> str | float:
    """A value cell normalised for comparison: numbers as floats, text lowercased.

    >>> normalize_value("7"), normalize_value(7.0), normalize_value(" pT3  "), normalize_value(None)
    (7.0, 7.0, 'pt3', '')
    """
    s = _text(x)
    if not s:
        return ""
    try:
        f = float(s)
    except ValueError:
        return _SPACES.sub(" ", s).lower()
    return f if math.isfinite(f) else s.lower()


def read_table(source: TableSource, *, what: str = "table") -> pd.DataFrame:
    """Read a CSV/TSV, Parquet, JSON or JSONL table (a DataFrame is copied).

    Empty CSV cells stay empty strings so that "unmentioned" is never confused
    with a parsing accident; column names are stripped.
    """
    if isinstance(source, pd.DataFrame):
        df = source.copy()
    else:
        path = Path(os.fspath(source))
        if not path.is_file():
            raise InputError(f"{what} file not found; check the path", path=path)
        suffix = path.suffix.lower()
        try:
            if suffix in {".csv", ".tsv", ".txt"}:
                df = pd.read_csv(
                    path,
                    dtype=str,
                    keep_default_na=False,
                    sep="\t" if suffix == ".tsv" else ",",
                    encoding="utf-8-sig",
                )
            elif suffix in {".parquet", ".pq"}:
                df = pd.read_parquet(path)
            elif suffix in {".jsonl", ".ndjson"}:
                df = pd.read_json(path, lines=True, dtype=False)
            elif suffix == ".json":
                df = pd.read_json(path, dtype=False)
            else:
                raise InputError(
                    f"cannot read {what} of type {suffix or '(none)'}; "
                    "use .csv, .tsv, .parquet or .jsonl",
                    path=path,
                )
        except InputError:
            raise
        except (ValueError, OSError, UnicodeDecodeError, pd.errors.ParserError) as exc:
            raise InputError(f"cannot read {what}: {exc}", path=path) from exc
    df.columns = [str(c).strip() for c in df.columns]
    return df


def _source_name(source: object) -> str | None:
    return None if isinstance(source, pd.DataFrame) else os.fspath(source)  # type: ignore[call-overload]


def _as_list(x: object) -> list[Any]:
    if x is None:
        return []
    if isinstance(x, str):
        s = x.strip()
        if not s:
            return []
        if s.startswith("["):
            try:
                parsed = json.loads(s)
            except ValueError:
                return [s]
            return list(parsed) if isinstance(parsed, list) else [parsed]
        return [p for p in s.split(";") if p]
    if isinstance(x, float) and math.isnan(x):
        return []
    if isinstance(x, Iterable) and not isinstance(x, Mapping):
        return list(x)
    return [x]


def _as_int(x: object) -> int | None:
    if is_blank(x):
        return None
    try:
        return int(float(str(x)))
    except ValueError:
        return None


def _as_bool(x: object) -> bool:
    if isinstance(x, str):
        return x.strip().lower() in {"true", "1", "yes"}
    if is_blank(x):
        return False
    return bool(x)


def read_evidence(source: TableSource | Iterable[Mapping[str, Any]] | None) -> list[dict[str, Any]]:
    """Evidence rows (JSONL, Parquet, DataFrame or dicts) as plain dicts with clean types.

    ``labels`` and ``flags`` become lists of strings, ``triggers`` a list of dicts,
    ``start``/``end`` ints, ``decides`` a bool.
    """
    if source is None:
        return []
    if isinstance(source, pd.DataFrame | str | os.PathLike):
        df = read_table(source, what="evidence")
        if "case_id" not in df.columns:
            raise InputError(
                f"evidence has no 'case_id' column (columns: {', '.join(df.columns)})",
                path=_source_name(source),
            )
        records: list[dict[str, Any]] = df.to_dict(orient="records")  # type: ignore[assignment]
    else:
        records = [dict(r) for r in source]
    out: list[dict[str, Any]] = []
    for r in records:
        row = {str(k): v for k, v in r.items()}
        row["case_id"] = _text(row.get("case_id"))
        row["part"] = _text(row.get("part"))
        row["kind"] = _text(row.get("kind")) or "mention"
        row["labels"] = [str(v) for v in _as_list(row.get("labels"))]
        row["flags"] = [str(v) for v in _as_list(row.get("flags"))]
        triggers = []
        for t in _as_list(row.get("triggers")):
            if isinstance(t, Mapping):
                triggers.append(
                    {
                        "text": _text(t.get("text")),
                        "start": _as_int(t.get("start")),
                        "end": _as_int(t.get("end")),
                        "category": _text(t.get("category")),
                    }
                )
        row["triggers"] = triggers
        row["start"] = _as_int(row.get("start"))
        row["end"] = _as_int(row.get("end"))
        row["decides"] = _as_bool(row.get("decides"))
        for key in (
            "concept_id",
            "concept_label",
            "value_key",
            "text",
            "section",
            "certainty",
            "temporality",
            "experiencer",
            "match",
            "note",
        ):
            row[key] = "" if is_blank(row.get(key)) else str(row.get(key))
        row["value"] = _text(row.get("value"))
        out.append(row)
    return out


# ---------------------------------------------------------------------------
# result records


CI = tuple[float, float] | None


@dataclass(frozen=True, slots=True)
class LabelMetrics:
    """Agreement on one binary label.  Undefined ratios (0/0) are ``None``."""

    key: str
    n: int  # judged units (cases, or parts)
    support: int  # gold positives
    predicted: int  # predicted positives
    tp: int
    fp: int
    fn: int
    tn: int
    precision: float | None
    recall: float | None
    f1: float | None
    kappa: float | None
    precision_ci: CI = None
    recall_ci: CI = None
    f1_ci: CI = None
    kappa_ci: CI = None
    #: gold state (rows) x predicted state (columns), both in :data:`STATES` order
    confusion: tuple[tuple[int, ...], ...] = ()


@dataclass(frozen=True, slots=True)
class AverageMetrics:
    """Micro (pooled counts) or macro (mean of defined per-label values) average."""

    kind: str
    precision: float | None
    recall: float | None
    f1: float | None
    kappa: float | None = None
    precision_ci: CI = None
    recall_ci: CI = None
    f1_ci: CI = None
    kappa_ci: CI = None


@dataclass(frozen=True, slots=True)
class ValueMismatch:
    case_id: str
    part: str
    gold: str
    pred: str


@dataclass(frozen=True, slots=True)
class ValueMetrics:
    """Exact-match accuracy of one value label after normalisation."""

    key: str
    n: int
    correct: int
    accuracy: float | None
    accuracy_ci: CI = None
    mismatches: tuple[ValueMismatch, ...] = ()


@dataclass(frozen=True, slots=True)
class EvidenceNote:
    """One evidence row shown beside a disagreement."""

    text: str
    section: str
    part: str
    start: int | None
    end: int | None
    kind: str
    certainty: str
    temporality: str
    experiencer: str
    decides: bool
    concept_label: str = ""
    value: str = ""


@dataclass(frozen=True, slots=True)
class Disagreement:
    """A judged (case, label) where gold and prediction differ.

    ``error`` is "false positive" / "false negative" (the binary decision
    differs), "state" (same decision, different certainty) or "value".
    """

    case_id: str
    part: str
    label: str
    kind: str  # "binary" | "value"
    gold: str
    pred: str
    error: str
    evidence: tuple[EvidenceNote, ...] = ()


def _fmt(x: float | None, digits: int = 3) -> str:
    return "—" if x is None else f"{x:.{digits}f}"


def _fmt_ci(ci: CI) -> str:
    return "" if ci is None else f"[{ci[0]:.2f}, {ci[1]:.2f}]"


@dataclass(frozen=True, slots=True)
class ValidationResult:
    """Everything :func:`validate` measured; render with ``to_text``/``to_markdown``/``to_html``."""

    scheme: str
    positive_at: float
    n_boot: int
    seed: int
    per_part: bool
    n_units: int
    labels: tuple[LabelMetrics, ...]
    micro: AverageMetrics
    macro: AverageMetrics
    values: tuple[ValueMetrics, ...]
    disagreements: tuple[Disagreement, ...]
    gold_only_cases: tuple[str, ...] = ()
    pred_only_cases: tuple[str, ...] = ()
    gold_only_labels: tuple[str, ...] = ()
    pred_only_labels: tuple[str, ...] = ()
    unknown_labels: tuple[str, ...] = ()
    pred_errors: tuple[str, ...] = ()
    notes: tuple[str, ...] = field(default=())

    # -- derived ----------------------------------------------------------

    def label(self, key: str) -> LabelMetrics:
        for m in self.labels:
            if m.key == key:
                return m
        raise KeyError(key)

    def value(self, key: str) -> ValueMetrics:
        for m in self.values:
            if m.key == key:
                return m
        raise KeyError(key)

    @property
    def confusion(self) -> tuple[tuple[int, ...], ...]:
        """Gold state x predicted state summed over every binary label."""
        total = np.zeros((len(STATES), len(STATES)), dtype=int)
        for m in self.labels:
            if m.confusion:
                total += np.array(m.confusion, dtype=int)
        return tuple(tuple(int(v) for v in row) for row in total)

    def problems(self) -> list[str]:
        """One line per mismatch between the gold and the prediction tables."""

        def listed(items: Sequence[str], limit: int = 12) -> str:
            shown = ", ".join(items[:limit])
            return shown + (f", … (+{len(items) - limit})" if len(items) > limit else "")

        out = []
        if self.gold_only_cases:
            out.append(
                f"{len(self.gold_only_cases)} gold case(s) not in the prediction (not scored): "
                + listed(self.gold_only_cases)
            )
        if self.pred_only_cases:
            out.append(
                f"{len(self.pred_only_cases)} predicted case(s) not in the gold (not scored): "
                + listed(self.pred_only_cases)
            )
        if self.gold_only_labels:
            out.append(
                "gold label(s) with no column in the prediction (not scored): "
                + listed(self.gold_only_labels)
            )
        if self.pred_only_labels:
            out.append(f"predicted label(s) the gold never judges: {listed(self.pred_only_labels)}")
        if self.unknown_labels:
            out.append(
                f"label(s) not in scheme {self.scheme or '(none)'}: {listed(self.unknown_labels)}"
            )
        if self.pred_errors:
            out.append(
                f"{len(self.pred_errors)} judged case(s) failed in the prediction "
                f"(status error; scored as unmentioned): {listed(self.pred_errors)}"
            )
        out.extend(self.notes)
        return out

    # -- renderings -------------------------------------------------------

    def to_dict(self) -> dict[str, Any]:
        d = asdict(self)
        d["states"] = list(STATES)
        d["confusion"] = [list(r) for r in self.confusion]
        d["problems"] = self.problems()
        return _json_safe(d)  # type: ignore[no-any-return]

    def to_json(self, *, indent: int | None = 2) -> str:
        return json.dumps(self.to_dict(), indent=indent, ensure_ascii=False)

    def _label_rows(self) -> list[list[str]]:
        rows = []
        for m in self.labels:
            rows.append(
                [
                    m.key,
                    str(m.n),
                    str(m.support),
                    f"{_fmt(m.precision)} {_fmt_ci(m.precision_ci)}".strip(),
                    f"{_fmt(m.recall)} {_fmt_ci(m.recall_ci)}".strip(),
                    f"{_fmt(m.f1)} {_fmt_ci(m.f1_ci)}".strip(),
                    f"{_fmt(m.kappa)} {_fmt_ci(m.kappa_ci)}".strip(),
                ]
            )
        for a in (self.micro, self.macro):
            rows.append(
                [
                    f"({a.kind})",
                    "",
                    "",
                    f"{_fmt(a.precision)} {_fmt_ci(a.precision_ci)}".strip(),
                    f"{_fmt(a.recall)} {_fmt_ci(a.recall_ci)}".strip(),
                    f"{_fmt(a.f1)} {_fmt_ci(a.f1_ci)}".strip(),
                    f"{_fmt(a.kappa)} {_fmt_ci(a.kappa_ci)}".strip(),
                ]
            )
        return rows

    _LABEL_HEAD = ("label", "n", "support", "precision", "recall", "F1", "kappa")

    def _intro(self) -> str:
        unit = "parts" if self.per_part else "cases"
        ci = (
            f"95% bootstrap CIs over {self.n_boot} resamples of cases (seed {self.seed})"
            if self.n_boot
            else "no confidence intervals (n_boot=0)"
        )
        return (
            f"scheme {self.scheme or '(from the tables)'}; {self.n_units} judged {unit}; "
            f"positive = score >= {self.positive_at:g}; {ci}"
        )

    def to_text(self) -> str:
        """A plain table for the terminal."""
        lines = [f"pathsieve validate: {self._intro()}", ""]
        lines.extend(_plain_table(self._LABEL_HEAD, self._label_rows()))
        if self.values:
            lines.append("")
            lines.extend(
                _plain_table(
                    ("value", "n", "correct", "accuracy"),
                    [
                        [
                            v.key,
                            str(v.n),
                            str(v.correct),
                            f"{_fmt(v.accuracy)} {_fmt_ci(v.accuracy_ci)}".strip(),
                        ]
                        for v in self.values
                    ],
                )
            )
        decisive = [d for d in self.disagreements if d.error != "state"]
        lines.append("")
        lines.append(
            f"{len(self.disagreements)} disagreement(s), {len(decisive)} that change a "
            "decision or a value:"
        )
        for d in decisive[:40]:
            where = d.case_id + (f" part {d.part}" if d.part else "")
            lines.append(
                f"  {where}  {d.label}: gold {d.gold or '(empty)'}, predicted "
                f"{d.pred or '(empty)'} ({d.error})"
            )
            for ev in d.evidence[:3]:
                lines.append(f"      [{ev.section}] {ev.text!r} {ev.certainty}")
        if len(decisive) > 40:
            lines.append(f"  … {len(decisive) - 40} more (use -o report.html or --json)")
        problems = self.problems()
        if problems:
            lines.append("")
            lines.extend(f"note: {p}" for p in problems)
        return "\n".join(lines)

    def to_markdown(self) -> str:
        """Plain Markdown tables."""
        out = ["# pathsieve validation", "", self._intro() + ".", ""]
        out.append(CAUTION)
        out.append("")
        problems = self.problems()
        if problems:
            out.append("## Unmatched cases and labels")
            out.append("")
            out.extend(f"- {_md(p)}" for p in problems)
            out.append("")
        out.append("## Binary labels")
        out.append("")
        out.extend(_md_table(self._LABEL_HEAD, self._label_rows()))
        out.append("")
        out.append("## Certainty states (all labels): gold rows x predicted columns")
        out.append("")
        out.extend(
            _md_table(
                ("gold \\ predicted", *STATES),
                [[s, *map(str, row)] for s, row in zip(STATES, self.confusion)],
            )
        )
        out.append("")
        if self.values:
            out.append("## Value labels")
            out.append("")
            out.extend(
                _md_table(
                    ("value", "n", "correct", "accuracy"),
                    [
                        [
                            v.key,
                            str(v.n),
                            str(v.correct),
                            f"{_fmt(v.accuracy)} {_fmt_ci(v.accuracy_ci)}",
                        ]
                        for v in self.values
                    ],
                )
            )
            out.append("")
        out.append("## Disagreements")
        out.append("")
        if not self.disagreements:
            out.append("None.")
        else:
            rows = []
            for d in self.disagreements:
                ev = "<br>".join(
                    f"[{e.section}] “{e.text}” ({e.certainty or e.value}"
                    f"{'' if e.decides else ', did not decide'})"
                    for e in d.evidence
                )
                rows.append([d.case_id, d.part, d.label, d.gold, d.pred, d.error, ev])
            out.extend(
                _md_table(("case", "part", "label", "gold", "predicted", "error", "evidence"), rows)
            )
        out.append("")
        return "\n".join(out)

    def to_html(self) -> str:
        """A self-contained HTML report with an inline SVG chart of F1 and its CI."""
        return _render_html(self)


CAUTION = (
    "Labels are research aids for model training, not diagnoses; the signing "
    "pathologist's report is authoritative."
)


def _json_safe(x: Any) -> Any:
    if isinstance(x, float):
        return None if math.isnan(x) or math.isinf(x) else x
    if isinstance(x, Mapping):
        return {str(k): _json_safe(v) for k, v in x.items()}
    if isinstance(x, list | tuple):
        return [_json_safe(v) for v in x]
    if isinstance(x, np.generic):
        return _json_safe(x.item())
    return x


def _plain_table(head: Sequence[str], rows: Sequence[Sequence[str]]) -> list[str]:
    widths = [
        max(len(h), *(len(r[i]) for r in rows)) if rows else len(h) for i, h in enumerate(head)
    ]
    fmt = lambda r: "  ".join(c.ljust(w) for c, w in zip(r, widths)).rstrip()  # noqa: E731
    return [fmt(head), fmt(["-" * w for w in widths]), *(fmt(r) for r in rows)]


def _md(s: str) -> str:
    return s.replace("|", "\\|").replace("\n", " ")


def _md_table(head: Sequence[str], rows: Sequence[Sequence[str]]) -> list[str]:
    out = ["| " + " | ".join(_md(h) for h in head) + " |", "|" + "---|" * len(head)]
    out.extend("| " + " | ".join(_md(c) for c in r) + " |" for r in rows)
    return out


# ---------------------------------------------------------------------------
# the computation


def _row_ref(name: str | None, pos: int, what: str) -> str:
    """Where a table row is: "file.csv:LINE" (the header is line 1) or "<what> row N"."""
    return f"{name}:{pos + 2}" if name else f"{what} row {pos + 1}"


def _positions(df: pd.DataFrame) -> list[int]:
    # row positions in the original table survive filtering through the index
    return [int(i) if isinstance(i, int | np.integer) else n for n, i in enumerate(df.index)]


@dataclass
class _Pred:
    name: str | None
    per_part: bool
    columns: list[str]
    cells: dict[tuple[str, str], dict[str, Any]]
    rows: dict[tuple[str, str], int]
    failed: set[tuple[str, str]]
    cases: list[str]


def _pred_table(df: pd.DataFrame, name: str | None, restrict_scheme: str | None) -> _Pred:
    if "case_id" not in df.columns:
        raise InputError(
            f"label table has no 'case_id' column (columns: {', '.join(df.columns)})", path=name
        )
    if restrict_scheme and "scheme" in df.columns:
        keep = [(_text(s) in ("", restrict_scheme)) for s in df["scheme"]]
        df = df[keep]
    per_part = "part" in df.columns
    columns = [c for c in df.columns if c not in META_COLUMNS]
    cells: dict[tuple[str, str], dict[str, Any]] = {}
    rows: dict[tuple[str, str], int] = {}
    failed: set[tuple[str, str]] = set()
    cases: dict[str, None] = {}
    records = df.to_dict(orient="records")
    for i, rec in zip(_positions(df), records):
        ref = _row_ref(name, i, "label table")
        case = _text(rec.get("case_id"))
        if not case:
            raise InputError(f"{ref}: empty case_id in the label table")
        unit = (case, _text(rec.get("part")) if per_part else "")
        if unit in cells:
            raise InputError(
                f"{ref}: the label table repeats case {case!r}"
                + (f" part {unit[1]!r}" if per_part else "")
                + f" (first at {_row_ref(name, rows[unit], 'label table')}); keep one row per "
                + ("part" if per_part else "case")
            )
        cells[unit] = {c: rec.get(c) for c in columns}
        rows[unit] = i
        if _text(rec.get("status")).lower() == "error":
            failed.add(unit)
        cases[case] = None
    return _Pred(name, per_part, columns, cells, rows, failed, list(cases))


def _pred_where(pred: _Pred, unit: tuple[str, str], column: str) -> str:
    return f"{_row_ref(pred.name, pred.rows.get(unit, 0), 'label table')}, column {column!r}"


def _to_case_level(pred: _Pred, binary: set[str]) -> _Pred:
    """Roll a per-part prediction up to cases: the most definite positive state of
    any part (the rule of the label contract); for values the first stated one."""
    cells: dict[tuple[str, str], dict[str, Any]] = {}
    rows: dict[tuple[str, str], int] = {}
    failed: set[tuple[str, str]] = set()
    for (case, part), row in pred.cells.items():
        unit = (case, "")
        rows.setdefault(unit, pred.rows[(case, part)])
        if (case, part) in pred.failed:
            failed.add(unit)
        acc = cells.setdefault(unit, {})
        for c, v in row.items():
            if c in binary:
                st = parse_state(v, where=_pred_where(pred, (case, part), c))
                old = acc.get(c)
                if old is None or _STATE_RANK[st] < _STATE_RANK[old]:
                    acc[c] = st
            elif is_blank(acc.get(c)) and not is_blank(v):
                acc[c] = v
            else:
                acc.setdefault(c, v)
    return _Pred(pred.name, False, pred.columns, cells, rows, failed, pred.cases)


@dataclass(frozen=True, slots=True)
class _GoldItem:
    case: str
    part: str
    key: str
    raw: Any
    where: str


def _gold_items(
    df: pd.DataFrame, name: str | None, restrict_scheme: str | None
) -> tuple[list[_GoldItem], bool, list[str]]:
    if "case_id" not in df.columns:
        raise InputError(
            f"gold table has no 'case_id' column (columns: {', '.join(df.columns)}); "
            "use long (case_id,label,expected) or the label table's wide layout",
            path=name,
        )
    notes: list[str] = []
    if restrict_scheme and "scheme" in df.columns:
        keep = [(_text(s) in ("", restrict_scheme)) for s in df["scheme"]]
        dropped = len(keep) - sum(keep)
        if dropped:
            notes.append(
                f"{dropped} gold row(s) of other schemes left out (scheme {restrict_scheme})"
            )
        df = df[keep]
    per_part = "part" in df.columns
    items: list[_GoldItem] = []
    records = df.to_dict(orient="records")
    long = {"label", "expected"} <= set(df.columns)
    seen: dict[tuple[str, str, str], tuple[str, Any]] = {}
    for pos, rec in zip(_positions(df), records):
        where = _row_ref(name, pos, "gold")
        case = _text(rec.get("case_id"))
        if not case:
            raise InputError(f"{where}: empty case_id in the gold; fill it or delete the row")
        part = _text(rec.get("part")) if per_part else ""
        if long:
            key = _text(rec.get("label"))
            if not key:
                raise InputError(f"{where}: empty label in the gold; fill it or delete the row")
            pairs = [(key, rec.get("expected"))]
        else:
            pairs = [(c, rec.get(c)) for c in df.columns if c not in META_COLUMNS]
        for key, raw in pairs:
            ident = (case, part, key)
            if ident in seen:
                prev_where, prev_raw = seen[ident]
                if _text(prev_raw) != _text(raw):
                    raise InputError(
                        f"{where}: case {case!r} label {key!r} is coded twice with different "
                        f"values ({prev_where}: {_text(prev_raw)!r}, here: {_text(raw)!r}); "
                        "keep one"
                    )
                continue
            seen[ident] = (where, raw)
            items.append(_GoldItem(case, part, key, raw, where))
    return items, per_part, notes


def _resolve_scheme(
    scheme: object, gold: pd.DataFrame, pred: pd.DataFrame
) -> tuple[SchemeKeys | None, bool, list[str]]:
    """The scheme(s) that say which keys are binary and which are values.

    Returns (keys, explicit, notes): explicit when named by the caller or by a
    ``scheme`` column; otherwise every shipped scheme is merged (value keys are
    shared across schemes) and unknown labels are not reported.  A name in a
    ``scheme`` column that is not a shipped scheme is noted, and the kinds of
    its labels are read from the data.
    """
    if scheme is not None:
        return scheme_keys(scheme), True, []
    names: dict[str, None] = {}
    for df in (gold, pred):
        if "scheme" in df.columns:
            names.update(dict.fromkeys(n for n in (_text(s) for s in df["scheme"]) if n))
    loaded: list[SchemeKeys] = []
    notes: list[str] = []
    for n in names:
        try:
            loaded.append(scheme_keys(n))
        except ConfigError:
            notes.append(
                f"scheme {n!r} of the scheme column is not a shipped scheme; label kinds "
                "were read from the data (pass --scheme PATH to use its file)"
            )
    if loaded:
        return _merge_keys(loaded), True, notes
    from .schemes import list_schemes

    shipped = list_schemes()
    if shipped:
        return _merge_keys([scheme_keys(n) for n in shipped]), False, notes
    return None, False, notes


def _looks_binary(values: Iterable[Any]) -> bool:
    for v in values:
        try:
            parse_state(v)
        except InputError:
            return False
    return True


# -- vectorised counting ------------------------------------------------------


def _ratio(num: np.ndarray, den: np.ndarray) -> np.ndarray:
    out = np.full(np.shape(num), np.nan)
    ok = den > 0
    np.divide(num, den, out=out, where=ok)
    return out


def _rates(tp: np.ndarray, fp: np.ndarray, fn: np.ndarray, tn: np.ndarray) -> dict[str, np.ndarray]:
    """Precision, recall, F1 and Cohen's kappa from counts (NaN where 0/0)."""
    tp, fp, fn, tn = (np.asarray(a, dtype=float) for a in (tp, fp, fn, tn))
    n = tp + fp + fn + tn
    # kappa = (po - pe) / (1 - pe) written over n^2 so the 0/0 case is exact:
    # po = (tp + tn) / n,  pe = ((tp + fp)(tp + fn) + (fn + tn)(fp + tn)) / n^2
    chance = (tp + fp) * (tp + fn) + (fn + tn) * (fp + tn)
    return {
        "precision": _ratio(tp, tp + fp),
        "recall": _ratio(tp, tp + fn),
        "f1": _ratio(2 * tp, 2 * tp + fp + fn),
        "kappa": _ratio(n * (tp + tn) - chance, n * n - chance),
    }


def _scalar(x: Any) -> float | None:
    f = float(x)
    return None if math.isnan(f) else f


def _ci(samples: np.ndarray | None) -> CI:
    if samples is None:
        return None
    finite = samples[np.isfinite(samples)]
    if finite.size == 0:
        return None
    lo, hi = np.percentile(finite, [2.5, 97.5])
    return (float(lo), float(hi))


def _nanmean(a: np.ndarray, axis: int) -> np.ndarray:
    finite = np.isfinite(a)
    count = finite.sum(axis=axis)
    total = np.where(finite, a, 0.0).sum(axis=axis)
    return _ratio(total, count)


def validate(
    gold: TableSource,
    pred: TableSource,
    *,
    scheme: object = None,
    positive_at: float = 0.75,
    n_boot: int = 1000,
    seed: int = 0,
    evidence: TableSource | Iterable[Mapping[str, Any]] | None = None,
) -> ValidationResult:
    """Compare a label table with a gold table.

    ``gold``/``pred``: DataFrames or paths (CSV, Parquet, JSONL).  ``scheme``: a
    name, YAML path, loaded scheme or :class:`SchemeKeys` (default: the
    ``scheme`` column, else every shipped scheme).  ``positive_at`` in (0, 1]:
    the lowest score counted positive.  ``n_boot`` resamples of cases for the
    95% intervals (0 for none); ``seed`` makes them reproducible.
    ``evidence`` (optional) is attached to each disagreement.
    """
    if not 0.0 < positive_at <= 1.0:
        raise ConfigError(f"positive_at must be in (0, 1], got {positive_at}")
    if n_boot < 0:
        raise ConfigError(f"n_boot must be >= 0, got {n_boot}")
    gold_df = read_table(gold, what="gold")
    pred_df = read_table(pred, what="label table")
    gold_name, pred_name = _source_name(gold), _source_name(pred)
    keys, explicit, notes = _resolve_scheme(scheme, gold_df, pred_df)
    restrict = keys.name if scheme is not None and keys is not None else None

    items, gold_per_part, gold_notes = _gold_items(gold_df, gold_name, restrict)
    notes.extend(gold_notes)
    p = _pred_table(pred_df, pred_name, restrict)

    # which keys are binary: the scheme says; otherwise the data (all cells states)
    # value labels: the scheme's, plus every value key pathsieve can read (so a
    # lymph node count of 0/1 is never mistaken for a certainty score)
    from . import schemes as _schemes

    value_keys = set(keys.value_keys) if keys else set()
    value_keys |= set(getattr(_schemes, "KNOWN_VALUES", ()))
    scheme_binary = list(keys.label_keys) if keys else []
    pred_cols = list(p.columns)
    gold_keys = list(dict.fromkeys(it.key for it in items))
    binary: set[str] = set()
    for k in dict.fromkeys([*pred_cols, *gold_keys]):
        if k in value_keys:
            continue
        if k in scheme_binary:
            binary.add(k)
            continue
        cells = [row.get(k) for row in p.cells.values()] + [it.raw for it in items if it.key == k]
        if k not in value_keys and _looks_binary(cells):
            binary.add(k)

    if p.per_part and not gold_per_part:
        p = _to_case_level(p, binary)
    elif gold_per_part and not p.per_part:
        raise InputError(
            "the gold table has a 'part' column but the label table has none; "
            "label with --per part, or drop 'part' from the gold",
            path=gold_name,
        )
    per_part = gold_per_part

    unknown = []
    if explicit and keys is not None:
        known = set(keys.label_keys) | set(keys.value_keys)
        unknown = [k for k in dict.fromkeys([*gold_keys, *pred_cols]) if k not in known]
    pred_cases = set(p.cases)
    gold_only_cases: dict[str, None] = {}
    gold_only_labels: dict[str, None] = {}
    judged_keys: dict[str, None] = {}
    kept: list[_GoldItem] = []
    for it in items:
        unit = (it.case, it.part)
        if unit not in p.cells:
            gold_only_cases[
                it.case if it.case not in pred_cases else f"{it.case} part {it.part}"
            ] = None
            continue
        if it.key not in p.columns:
            gold_only_labels[it.key] = None
            continue
        kept.append(it)
        judged_keys[it.key] = None
    gold_cases = {it.case for it in items}
    pred_only_cases = [c for c in p.cases if c not in gold_cases]
    pred_only_labels = [c for c in p.columns if c not in judged_keys]

    # order: scheme order, then prediction column order
    order = {
        k: i for i, k in enumerate([*scheme_binary, *(keys.value_keys if keys else ()), *pred_cols])
    }
    judged = sorted(judged_keys, key=lambda k: order.get(k, len(order)))

    units = list(dict.fromkeys((it.case, it.part) for it in kept))
    unit_ix = {u: i for i, u in enumerate(units)}
    cases = list(dict.fromkeys(u[0] for u in units))
    case_ix = {c: i for i, c in enumerate(cases)}
    unit_case = np.array([case_ix[u[0]] for u in units], dtype=int)

    ev_rows = read_evidence(evidence)
    ev_by_case: dict[str, list[dict[str, Any]]] = defaultdict(list)
    for r in ev_rows:
        ev_by_case[r["case_id"]].append(r)

    def evidence_for(case: str, part: str, key: str, kind: str) -> tuple[EvidenceNote, ...]:
        notes_ = []
        for r in sorted(ev_by_case.get(case, ()), key=lambda r: r["start"] or 0):
            if per_part and r["part"] != part:
                continue
            hit = key in r["labels"] if kind == "binary" else r["value_key"] == key
            if not hit:
                continue
            notes_.append(
                EvidenceNote(
                    text=r["text"],
                    section=r["section"],
                    part=r["part"],
                    start=r["start"],
                    end=r["end"],
                    kind=r["kind"],
                    certainty=r["certainty"],
                    temporality=r["temporality"],
                    experiencer=r["experiencer"],
                    decides=r["decides"],
                    concept_label=r["concept_label"],
                    value=r["value"],
                )
            )
        return tuple(notes_)

    by_key: dict[str, list[_GoldItem]] = defaultdict(list)
    for it in kept:
        by_key[it.key].append(it)

    label_metrics: list[LabelMetrics] = []
    value_metrics: list[ValueMetrics] = []
    disagreements: list[Disagreement] = []
    label_counts: list[np.ndarray] = []
    # bootstrap jobs: per label its (tp fp fn tn) masks, per value (correct, 1) rows,
    # each over the cases of its judged units; summed per resample after the loop
    label_jobs: list[tuple[np.ndarray, np.ndarray]] = []
    value_jobs: list[tuple[np.ndarray, np.ndarray]] = []
    failed_judged: dict[str, None] = {}

    for key in judged:
        its = by_key[key]
        if key in binary:
            g_states, p_states = [], []
            for it in its:
                unit = (it.case, it.part)
                g_states.append(parse_state(it.raw, where=f"{it.where}, label {key!r}"))
                p_states.append(
                    parse_state(p.cells[unit].get(key), where=_pred_where(p, unit, key))
                )
                if unit in p.failed:
                    failed_judged[it.case] = None
            g = np.array([CERTAINTY_SCORE.get(s, -1.0) >= positive_at for s in g_states])
            pr = np.array([CERTAINTY_SCORE.get(s, -1.0) >= positive_at for s in p_states])
            masks = np.stack([g & pr, ~g & pr, g & ~pr, ~g & ~pr]).astype(float)  # tp fp fn tn
            counts = masks.sum(axis=1)
            label_counts.append(counts)
            rates = _rates(*counts)
            label_jobs.append((masks, unit_case[[unit_ix[(it.case, it.part)] for it in its]]))
            conf = np.zeros((len(STATES), len(STATES)), dtype=int)
            for gs, ps in zip(g_states, p_states):
                conf[_STATE_RANK[gs], _STATE_RANK[ps]] += 1
            tp, fp, fn, tn = (int(c) for c in counts)
            label_metrics.append(
                LabelMetrics(
                    key=key,
                    n=len(its),
                    support=tp + fn,
                    predicted=tp + fp,
                    tp=tp,
                    fp=fp,
                    fn=fn,
                    tn=tn,
                    precision=_scalar(rates["precision"]),
                    recall=_scalar(rates["recall"]),
                    f1=_scalar(rates["f1"]),
                    kappa=_scalar(rates["kappa"]),
                    confusion=tuple(tuple(int(v) for v in r) for r in conf),
                )
            )
            for it, gs, ps, gp, pp in zip(its, g_states, p_states, g, pr):
                if gs == ps:
                    continue
                error = (
                    "false negative"
                    if gp and not pp
                    else "false positive"
                    if pp and not gp
                    else "state"
                )
                disagreements.append(
                    Disagreement(
                        it.case,
                        it.part,
                        key,
                        "binary",
                        gs,
                        ps,
                        error,
                        evidence_for(it.case, it.part, key, "binary"),
                    )
                )
        else:
            ok = []
            mismatches = []
            for it in its:
                unit = (it.case, it.part)
                gv, pv = _text(it.raw), _text(p.cells[unit].get(key))
                same = normalize_value(gv) == normalize_value(pv)
                ok.append(same)
                if unit in p.failed:
                    failed_judged[it.case] = None
                if not same:
                    mismatches.append(ValueMismatch(it.case, it.part, gv, pv))
                    disagreements.append(
                        Disagreement(
                            it.case,
                            it.part,
                            key,
                            "value",
                            gv,
                            pv,
                            "value",
                            evidence_for(it.case, it.part, key, "value"),
                        )
                    )
            okv = np.array(ok, dtype=float)
            value_jobs.append(
                (
                    np.stack([okv, np.ones_like(okv)]),
                    unit_case[[unit_ix[(it.case, it.part)] for it in its]],
                )
            )
            value_metrics.append(
                ValueMetrics(
                    key=key,
                    n=len(its),
                    correct=int(okv.sum()),
                    accuracy=float(okv.mean()) if len(its) else None,
                    mismatches=tuple(mismatches),
                )
            )

    boot_counts: list[np.ndarray] = []  # per label: (4, n_boot) tp fp fn tn
    if n_boot and cases:
        sums = _bootstrap_sums(len(cases), n_boot, seed, [*label_jobs, *value_jobs])
        boot_counts = sums[: len(label_jobs)]
        for i, bc in enumerate(boot_counts):
            cis = {k: _ci(v) for k, v in _rates(*bc).items()}
            label_metrics[i] = replace(
                label_metrics[i],
                precision_ci=cis["precision"],
                recall_ci=cis["recall"],
                f1_ci=cis["f1"],
                kappa_ci=cis["kappa"],
            )
        for i, vs in enumerate(sums[len(label_jobs) :]):
            value_metrics[i] = replace(value_metrics[i], accuracy_ci=_ci(_ratio(vs[0], vs[1])))
    micro, macro = _averages(label_counts, boot_counts, bool(boot_counts))
    disagreements.sort(
        key=lambda d: (d.error == "state", case_ix.get(d.case_id, 0), d.part, order.get(d.label, 0))
    )
    scheme_name = keys.name if keys is not None and explicit else ""
    return ValidationResult(
        scheme=scheme_name,
        positive_at=positive_at,
        n_boot=n_boot,
        seed=seed,
        per_part=per_part,
        n_units=len(units),
        labels=tuple(label_metrics),
        micro=micro,
        macro=macro,
        values=tuple(value_metrics),
        disagreements=tuple(disagreements),
        gold_only_cases=tuple(gold_only_cases),
        pred_only_cases=tuple(pred_only_cases),
        gold_only_labels=tuple(gold_only_labels),
        pred_only_labels=tuple(pred_only_labels),
        unknown_labels=tuple(unknown),
        pred_errors=tuple(failed_judged),
        notes=tuple(notes),
    )


def _bootstrap_sums(
    n_cases: int, n_boot: int, seed: int, jobs: Sequence[tuple[np.ndarray, np.ndarray]]
) -> list[np.ndarray]:
    """Per job ``(rows, case_ix)``: ``rows @ weights.T`` for every resample of cases.

    A resample draws ``n_cases`` cases with replacement; a case's weight is how
    often it was drawn, and every unit of that case carries the weight.  The
    resamples are drawn in blocks so memory stays bounded on large tables; the
    block size depends only on the number of cases, so a seed always gives the
    same intervals.
    """
    rng = np.random.default_rng(seed)
    block = max(1, min(n_boot, 2_000_000 // max(n_cases, 1)))
    out = [np.empty((rows.shape[0], n_boot)) for rows, _ in jobs]
    for start in range(0, n_boot, block):
        b = min(block, n_boot - start)
        draws = rng.integers(0, n_cases, size=(b, n_cases))
        offs = (np.arange(b)[:, None] * n_cases + draws).ravel()
        weights = np.bincount(offs, minlength=b * n_cases).reshape(b, n_cases).astype(float)
        for (rows, case_ix), acc in zip(jobs, out):
            # (weights @ rows.T).T: the contiguous product; rows @ weights.T is far slower
            acc[:, start : start + b] = (weights[:, case_ix] @ rows.T).T
    return out


def _averages(
    label_counts: list[np.ndarray], boot_counts: list[np.ndarray], boot: bool
) -> tuple[AverageMetrics, AverageMetrics]:
    names = ("precision", "recall", "f1", "kappa")
    if not label_counts:
        empty = dict.fromkeys(names)
        return AverageMetrics("micro", **empty), AverageMetrics("macro", **empty)  # type: ignore[arg-type]
    counts = np.stack(label_counts)  # (labels, 4)
    micro_r = _rates(*counts.sum(axis=0))
    per_label = _rates(*counts.T)
    macro_r = {k: _nanmean(v[None, :], axis=1)[0] for k, v in per_label.items()}
    micro_ci: dict[str, CI] = {}
    macro_ci: dict[str, CI] = {}
    if boot and boot_counts:
        bc = np.stack(boot_counts)  # (labels, 4, n_boot)
        micro_ci = {k: _ci(v) for k, v in _rates(*bc.sum(axis=0)).items()}
        per_label_b = _rates(*bc.transpose(1, 0, 2))  # each (labels, n_boot)
        macro_ci = {k: _ci(_nanmean(v, axis=0)) for k, v in per_label_b.items()}
    micro = AverageMetrics(
        "micro",
        _scalar(micro_r["precision"]),
        _scalar(micro_r["recall"]),
        _scalar(micro_r["f1"]),
        None,  # a pooled kappa over labels mixes unlike prevalences; not reported
        micro_ci.get("precision"),
        micro_ci.get("recall"),
        micro_ci.get("f1"),
        None,
    )
    macro = AverageMetrics(
        "macro",
        _scalar(macro_r["precision"]),
        _scalar(macro_r["recall"]),
        _scalar(macro_r["f1"]),
        _scalar(macro_r["kappa"]),
        macro_ci.get("precision"),
        macro_ci.get("recall"),
        macro_ci.get("f1"),
        macro_ci.get("kappa"),
    )
    return micro, macro


# ---------------------------------------------------------------------------
# HTML report


_HTML_CSS = """
:root { --ink:#1d2a33; --muted:#5d6b75; --line:#d5dde2; --bar:#2e7d8c; --ci:#16323a;
        --warn:#8a4b00; --warnbg:#fff4e0; --bg:#fbfcfc; }
body { font: 14px/1.45 system-ui, sans-serif; color: var(--ink); background: var(--bg);
       margin: 0 auto; max-width: 1100px; padding: 1.5rem; }
h1 { font-size: 1.4rem; margin: 0 0 .3rem; } h2 { font-size: 1.1rem; margin-top: 2rem; }
.muted { color: var(--muted); }
.caution { background: var(--warnbg); color: var(--warn); border-left: 4px solid var(--warn);
           padding: .5rem .8rem; margin: 1rem 0; }
table { border-collapse: collapse; margin: .5rem 0; }
th, td { border-bottom: 1px solid var(--line); padding: .25rem .6rem; text-align: left;
         vertical-align: top; }
th { background: #eef3f5; font-weight: 600; }
td.num { text-align: right; font-variant-numeric: tabular-nums; }
td.zero { color: #b8c2c8; }
td.diag { background: #e3f1ec; }
.ev { font-size: .9em; } .ev q { background: #fff1b8; quotes: none; }
.err-fp { color: #9b2f2f; } .err-fn { color: #6b3fa0; } .err-state { color: var(--muted); }
svg text { font: 12px system-ui, sans-serif; fill: var(--ink); }
"""


def _f1_chart(result: ValidationResult) -> str:
    """Horizontal bars of F1 per label with the 95% CI as a whisker."""
    rows: list[tuple[str, float | None, CI, bool]] = [
        (m.key, m.f1, m.f1_ci, False) for m in result.labels
    ]
    rows += [(f"({a.kind})", a.f1, a.f1_ci, True) for a in (result.micro, result.macro)]
    left, width, row_h, top = 210, 440, 24, 26
    height = top + row_h * len(rows) + 10
    x = lambda v: left + v * width  # noqa: E731
    out = [
        f'<svg xmlns="http://www.w3.org/2000/svg" width="{left + width + 70}" '
        f'height="{height}" role="img" aria-label="F1 per label with 95% confidence intervals">'
    ]
    for t in (0, 0.25, 0.5, 0.75, 1.0):
        out.append(
            f'<line x1="{x(t):.1f}" y1="{top - 6}" x2="{x(t):.1f}" y2="{height - 8}" '
            'stroke="#d5dde2" stroke-width="1"/>'
            f'<text x="{x(t):.1f}" y="{top - 10}" text-anchor="middle">{t:g}</text>'
        )
    for i, (name, f1, ci, avg) in enumerate(rows):
        y = top + i * row_h
        cy = y + row_h / 2
        weight = ' font-style="italic"' if avg else ""
        out.append(
            f'<text x="{left - 8}" y="{cy + 4:.1f}" text-anchor="end"{weight}>{html.escape(name)}</text>'
        )
        if f1 is None:
            out.append(f'<text x="{left + 4}" y="{cy + 4:.1f}" fill="#5d6b75">undefined</text>')
            continue
        color = "#7a93a0" if avg else "#2e7d8c"
        out.append(
            f'<rect x="{left}" y="{y + 5}" width="{max(f1 * width, 1):.1f}" height="{row_h - 10}" '
            f'fill="{color}"><title>{html.escape(name)} F1 {f1:.3f}</title></rect>'
        )
        if ci is not None:
            lo, hi = x(ci[0]), x(ci[1])
            out.append(
                f'<line x1="{lo:.1f}" y1="{cy:.1f}" x2="{hi:.1f}" y2="{cy:.1f}" stroke="#16323a" stroke-width="1.5"/>'
                f'<line x1="{lo:.1f}" y1="{cy - 5:.1f}" x2="{lo:.1f}" y2="{cy + 5:.1f}" stroke="#16323a" stroke-width="1.5"/>'
                f'<line x1="{hi:.1f}" y1="{cy - 5:.1f}" x2="{hi:.1f}" y2="{cy + 5:.1f}" stroke="#16323a" stroke-width="1.5"/>'
            )
        out.append(f'<text x="{x(1) + 8:.1f}" y="{cy + 4:.1f}">{f1:.2f}</text>')
    out.append("</svg>")
    return "".join(out)


def _html_table(head: Sequence[str], rows: Sequence[Sequence[str]], *, num_from: int = 1) -> str:
    e = html.escape
    out = ["<table><thead><tr>", *(f"<th>{e(h)}</th>" for h in head), "</tr></thead><tbody>"]
    for r in rows:
        out.append("<tr>")
        for i, c in enumerate(r):
            cls = ' class="num"' if i >= num_from else ""
            out.append(f"<td{cls}>{e(c)}</td>")
        out.append("</tr>")
    out.append("</tbody></table>")
    return "".join(out)


def _render_html(r: ValidationResult) -> str:
    e = html.escape
    parts = [
        "<!DOCTYPE html><html lang='en'><head><meta charset='utf-8'>",
        "<meta name='viewport' content='width=device-width, initial-scale=1'>",
        "<title>pathsieve validation</title>",
        f"<style>{_HTML_CSS}</style></head><body>",
        "<h1>pathsieve validation</h1>",
        f"<p class='muted'>{e(r._intro())}.</p>",
        f"<p class='caution'>{e(CAUTION)} The disagreement list quotes report text: "
        "handle this file as protected health information.</p>",
    ]
    problems = r.problems()
    if problems:
        parts.append("<h2>Unmatched cases and labels</h2><ul>")
        parts.extend(f"<li>{e(p)}</li>" for p in problems)
        parts.append("</ul>")
    parts.append("<h2>F1 per label (bars) with 95% interval (whiskers)</h2>")
    parts.append(_f1_chart(r))
    parts.append("<h2>Binary labels</h2>")
    parts.append(_html_table(r._LABEL_HEAD, r._label_rows()))
    parts.append("<h2>Certainty states, all labels (gold rows × predicted columns)</h2>")
    conf = r.confusion
    parts.append("<table><thead><tr><th>gold \\ predicted</th>")
    parts.extend(f"<th>{e(s)}</th>" for s in STATES)
    parts.append("</tr></thead><tbody>")
    for i, (s, row) in enumerate(zip(STATES, conf)):
        parts.append(f"<tr><th>{e(s)}</th>")
        for j, v in enumerate(row):
            cls = "num" + (" diag" if i == j else "") + (" zero" if v == 0 else "")
            parts.append(f"<td class='{cls}'>{v}</td>")
        parts.append("</tr>")
    parts.append("</tbody></table>")
    if r.values:
        parts.append("<h2>Value labels</h2>")
        parts.append(
            _html_table(
                ("value", "n", "correct", "accuracy"),
                [
                    [
                        v.key,
                        str(v.n),
                        str(v.correct),
                        f"{_fmt(v.accuracy)} {_fmt_ci(v.accuracy_ci)}",
                    ]
                    for v in r.values
                ],
            )
        )
    parts.append(f"<h2>Disagreements ({len(r.disagreements)})</h2>")
    if not r.disagreements:
        parts.append("<p>None.</p>")
    else:
        parts.append(
            "<table><thead><tr><th>case</th><th>label</th><th>gold</th><th>predicted</th>"
            "<th>error</th><th>evidence</th></tr></thead><tbody>"
        )
        for d in r.disagreements:
            cls = {"false positive": "err-fp", "false negative": "err-fn"}.get(d.error, "err-state")
            ev = (
                "".join(
                    f"<div class='ev'>[{e(n.section or '?')}"
                    + (f", part {e(n.part)}" if n.part else "")
                    + f"] <q>{e(n.text)}</q> {e(n.certainty or n.value)}"
                    + ("" if n.decides else " <span class='muted'>(did not decide)</span>")
                    + "</div>"
                    for n in d.evidence
                )
                or "<span class='muted'>no evidence row for this label</span>"
            )
            where = e(d.case_id) + (
                f" <span class='muted'>part {e(d.part)}</span>" if d.part else ""
            )
            parts.append(
                f"<tr><td>{where}</td><td>{e(d.label)}</td><td>{e(d.gold or '(empty)')}</td>"
                f"<td>{e(d.pred or '(empty)')}</td><td class='{cls}'>{e(d.error)}</td><td>{ev}</td></tr>"
            )
        parts.append("</tbody></table>")
    parts.append("</body></html>")
    return "".join(parts)
