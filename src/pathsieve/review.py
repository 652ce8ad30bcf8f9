"""A self-contained HTML page for reviewing labels against the report text.

Each report is shown with its mentions and values highlighted from the
evidence offsets (certainty by colour *and* by a text marker), its section and
part boundaries, and the case's labels beside it.  The reviewer marks each
label right or wrong (or sets the correct state), and downloads the result as
a long gold CSV (``case_id,label,expected,scheme``) that ``pathsieve
validate`` reads.  Everything is inline: the page works from a file with no
network.

Report text is embedded as JSON inside ``<script type="application/json">``
with ``<``, ``>`` and ``&`` escaped, so no report can close the script or
inject markup; the page builds the text with DOM text nodes, never as HTML.

>>> import pandas as pd
>>> from pathsieve.validate import SchemeKeys
>>> reports = pd.DataFrame({"case_id": ["c1"], "text": ["DIAGNOSIS: HSIL (CIN 2)."]})
>>> labels = pd.DataFrame({"case_id": ["c1"], "hsil": [1.0]})
>>> page = render_review(reports, labels, [], scheme=SchemeKeys("cervix", ("hsil",)))
>>> page.startswith("<!DOCTYPE html>") and "</script><b>" not in page
True
"""

from __future__ import annotations

import hashlib
import html
import json
import os
import re
from collections.abc import Iterable, Mapping
from dataclasses import dataclass
from importlib import resources
from typing import Any

import pandas as pd

from .errors import InputError
from .records import CERTAINTY_SCORE
from .validate import (
    CAUTION,
    STATES,
    TableSource,
    _text,
    is_blank,
    parse_state,
    read_evidence,
    read_table,
    scheme_keys,
)

__all__ = ["PHI_NOTICE", "ReviewData", "embed_json", "render_review", "review_data"]

PHI_NOTICE = (
    "This page contains pathology report text (protected health information). Keep it on "
    "approved systems, do not e-mail or upload it, and delete it when the review is done."
)
_STATE_RANK = {s: i for i, s in enumerate(STATES)}


def embed_json(data: object) -> str:
    """JSON safe to place inside ``<script type="application/json">``.

    ``<``, ``>`` and ``&`` become ``\\u003c``-style escapes (so ``</script>`` and
    ``<!--`` cannot appear), as do the line separators JavaScript once rejected.

    >>> embed_json({"t": "</script><b>&"})
    '{"t": "\\\\u003c/script\\\\u003e\\\\u003cb\\\\u003e\\\\u0026"}'
    """
    text = json.dumps(data, ensure_ascii=False, allow_nan=False)
    for ch, esc in (
        ("<", "\\u003c"),
        (">", "\\u003e"),
        ("&", "\\u0026"),
        ("\u2028", "\\u2028"),
        ("\u2029", "\\u2029"),
    ):
        text = text.replace(ch, esc)
    return text


def _utf16_map(text: str) -> list[int] | None:
    """Code-point offset -> UTF-16 offset (JavaScript strings), or None if identical."""
    if all(ord(c) < 0x10000 for c in text):
        return None
    out = [0]
    for c in text:
        out.append(out[-1] + (2 if ord(c) >= 0x10000 else 1))
    return out


def _offset_converter(text: str) -> Any:
    umap = _utf16_map(text)
    if umap is None:
        return lambda i: i
    return lambda i: umap[i]


@dataclass(frozen=True, slots=True)
class ReviewData:
    """What the page embeds, plus what could not be shown (for the CLI to print)."""

    data: dict[str, Any]
    missing_reports: tuple[str, ...]
    missing_labels: tuple[str, ...]
    bad_offsets: int

    @property
    def n_cases(self) -> int:
        return len(self.data["cases"])


def _read_reports(source: TableSource) -> pd.DataFrame:
    """Reports as ``case_id, text`` (files through pathsieve's report reader)."""
    if isinstance(source, pd.DataFrame):
        df = source
    else:
        from .io import read_reports

        chunks = list(read_reports(os.fspath(source), warn=lambda _m: None))
        df = pd.concat(chunks, ignore_index=True) if chunks else pd.DataFrame()
    for col in ("case_id", "text"):
        if col not in df.columns:
            raise InputError(
                f"reports have no {col!r} column (columns: {', '.join(map(str, df.columns))})"
            )
    return df


def _case_filter(cases: object) -> tuple[list[str] | None, dict[str, str]]:
    """Case ids (in order) and their sample strata, from ids or a table with case_id."""
    if cases is None:
        return None, {}
    if isinstance(cases, pd.DataFrame | str | os.PathLike):
        df = read_table(cases, what="case list")
        if "case_id" not in df.columns:
            raise InputError(
                f"case list has no 'case_id' column (columns: {', '.join(df.columns)}); "
                "use the output of 'pathsieve sample'"
            )
        ids = [_text(c) for c in df["case_id"]]
        strata = (
            {_text(c): _text(s) for c, s in zip(df["case_id"], df["stratum"])}
            if "stratum" in df.columns
            else {}
        )
        return [c for c in ids if c], strata
    if isinstance(cases, Iterable):
        return [_text(c) for c in cases if _text(c)], {}
    raise InputError(f"cases must be ids or a table with case_id, not {type(cases).__name__}")


def _structure(text: str) -> tuple[list[list[Any]], list[list[Any]]]:
    """Section and part spans of a report, from pathsieve's own readers."""
    from .parts import find_parts
    from .sections import find_sections

    sections = find_sections(text)
    parts = find_parts(text, sections)
    return (
        [[s.start, s.end, s.kind, s.header, s.body_start] for s in sections],
        [[p.start, p.end, p.label, p.header] for p in parts if p.label],
    )


def review_data(
    reports: TableSource,
    labels: TableSource,
    evidence: TableSource | Iterable[Mapping[str, Any]] | None,
    *,
    scheme: object,
    cases: object = None,
    positive_at: float = 0.75,
) -> ReviewData:
    """Assemble the page's data: one entry per case with text, labels and spans."""
    keys = scheme_keys(scheme)
    rep = _read_reports(reports)
    texts = {_text(c): "" if is_blank(t) else str(t) for c, t in zip(rep["case_id"], rep["text"])}
    lab = read_table(labels, what="label table")
    if "case_id" not in lab.columns:
        raise InputError(f"label table has no 'case_id' column (columns: {', '.join(lab.columns)})")
    label_keys = [k for k in keys.label_keys if k in lab.columns]
    value_keys = [k for k in keys.value_keys if k in lab.columns]
    if not label_keys:
        raise InputError(
            f"the label table has none of scheme {keys.name!r}'s labels "
            f"({', '.join(keys.label_keys)}); check --scheme"
        )
    per_part = "part" in lab.columns

    rows: dict[str, list[dict[Any, Any]]] = {}
    for rec in lab.to_dict(orient="records"):
        rows.setdefault(_text(rec.get("case_id")), []).append(rec)
    wanted, strata = _case_filter(cases)
    order = list(dict.fromkeys(wanted)) if wanted is not None else list(rows)
    missing_labels = tuple(c for c in order if c not in rows)
    missing_reports = tuple(c for c in order if c in rows and c not in texts)
    chosen = [c for c in order if c in rows and c in texts]
    if not chosen:
        raise InputError(
            "no case is in both the reports and the label table"
            + (" (and the case list)" if wanted is not None else "")
            + "; check that they come from the same export"
        )

    ev_by_case: dict[str, list[dict[str, Any]]] = {}
    for r in read_evidence(evidence):
        ev_by_case.setdefault(r["case_id"], []).append(r)

    bad_offsets = 0
    out_cases = []
    for case in chosen:
        text = texts[case]
        recs = rows[case]
        case_states: dict[str, str] = {}
        part_states: dict[str, dict[str, str]] = {}
        values: dict[str, str] = {}
        status, error, primary = "ok", "", ""
        flags: list[str] = []
        for rec in recs:
            part = _text(rec.get("part")) if per_part else ""
            if _text(rec.get("status")).lower() == "error":
                status = "error"
                error = error or _text(rec.get("error"))
            primary = primary or _text(rec.get("primary_label"))
            flags.extend(f for f in _text(rec.get("flags")).split(";") if f)
            for k in label_keys:
                st = parse_state(rec.get(k), where=f"label table, case {case!r}, column {k!r}")
                if per_part:
                    part_states.setdefault(part or "(case)", {})[k] = st
                old = case_states.get(k)
                if old is None or _STATE_RANK[st] < _STATE_RANK[old]:
                    case_states[k] = st  # the most definite positive part, as in labelling
            for k in value_keys:
                v = _text(rec.get(k))
                if v and not values.get(k):
                    values[k] = v
        u = _offset_converter(text)
        spans = []
        for r in sorted(
            ev_by_case.get(case, ()), key=lambda r: (r["start"] or 0, -(r["end"] or 0))
        ):
            s, e = r["start"], r["end"]
            ok = s is not None and e is not None and 0 <= s <= e <= len(text)
            if ok and r["text"] and text[s:e] != r["text"]:
                ok = False
            if not ok:
                bad_offsets += 1
                spans.append({"bad": True, "text": r["text"], "s": s, "e": e})
                continue
            triggers = [
                [u(t["start"]), u(t["end"]), t["category"], t["text"]]
                for t in r["triggers"]
                if t["start"] is not None
                and t["end"] is not None
                and 0 <= t["start"] <= t["end"] <= len(text)
            ]
            spans.append(
                {
                    "s": u(s),
                    "e": u(e),
                    "kind": r["kind"],
                    "labels": r["labels"],
                    "concept": r["concept_label"] or r["concept_id"],
                    "value_key": r["value_key"],
                    "value": r["value"],
                    "section": r["section"],
                    "part": r["part"],
                    "certainty": r["certainty"] or "present",
                    "temporality": r["temporality"] or "current",
                    "experiencer": r["experiencer"] or "patient",
                    "decides": r["decides"],
                    "triggers": triggers,
                    "flags": r["flags"],
                    "match": r["match"],
                    "note": r["note"],
                }
            )
        sections, parts = _structure(text)
        for sec in sections:
            sec[0], sec[1], sec[4] = u(sec[0]), u(sec[1]), u(sec[4])
        for p in parts:
            p[0], p[1] = u(p[0]), u(p[1])
        out_cases.append(
            {
                "id": case,
                "text": text,
                "status": status,
                "error": error,
                "primary": primary,
                "flags": sorted(set(flags)),
                "stratum": strata.get(case, ""),
                "labels": case_states,
                "part_labels": part_states,
                "values": values,
                "sections": sections,
                "parts": parts,
                "spans": spans,
            }
        )
    data = {
        "scheme": {
            "name": keys.name,
            "labels": [{"key": k, "description": keys.description(k)} for k in label_keys],
            "values": value_keys,
        },
        "states": list(STATES),
        "scores": CERTAINTY_SCORE,
        "positive_at": positive_at,
        "cases": out_cases,
        "missing": {"reports": list(missing_reports), "labels": list(missing_labels)},
        "bad_offsets": bad_offsets,
    }
    digest = hashlib.sha256(embed_json(data).encode("utf-8")).hexdigest()[:16]
    data["page_id"] = digest
    return ReviewData(data, missing_reports, missing_labels, bad_offsets)


def _template(name: str) -> str:
    return resources.files("pathsieve").joinpath("templates", name).read_text(encoding="utf-8")


def render_data(review: ReviewData, *, title: str = "") -> str:
    """The HTML page for assembled :class:`ReviewData`."""
    name = review.data["scheme"]["name"]
    fills = {
        "<!--TITLE-->": html.escape(title or f"pathsieve review — {name}"),
        "<!--SCHEME-->": html.escape(name),
        "<!--CAUTION-->": html.escape(CAUTION),
        "<!--PHI-->": html.escape(PHI_NOTICE),
        "/*CSS*/": _template("review.css"),
        "/*JS*/": _template("review.js"),
        "<!--DATA-->": embed_json(review.data),
    }
    page = _template("review.html")
    for mark in fills:
        if page.count(mark) != 1:
            raise RuntimeError(f"review template must hold {mark} once")  # a packaging defect
    # one pass, so text put in (a scheme name, the data) is never taken for a placeholder
    pattern = re.compile("|".join(re.escape(m) for m in fills))
    return pattern.sub(lambda m: fills[m.group(0)], page)


def render_review(
    reports: TableSource,
    labels: TableSource,
    evidence: TableSource | Iterable[Mapping[str, Any]] | None,
    *,
    scheme: object,
    cases: object = None,
    positive_at: float = 0.75,
    title: str = "",
) -> str:
    """One self-contained HTML review page (inline CSS and JS, no network).

    ``reports``: DataFrame or report export with ``case_id,text``; ``labels``:
    the label table; ``evidence``: the evidence table (or None); ``scheme``:
    name, YAML path, loaded scheme or SchemeKeys; ``cases``: ids, or a table
    with ``case_id`` (e.g. from ``pathsieve sample``) to review only those.
    """
    review = review_data(
        reports, labels, evidence, scheme=scheme, cases=cases, positive_at=positive_at
    )
    return render_data(review, title=title)
