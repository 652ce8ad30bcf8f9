"""The output contract: label-table rows and evidence rows.

Label table (one row per case, or per part with ``per="part"``), columns in
order: ``case_id``, [``part``], ``status``, ``error``, ``primary_label``, one
column per binary label key (certainty score 1.0/0.75/0.5/0.25/0.0, empty when
unmentioned; state words with ``states=True``; 0/1 with ``uncertain=``), one
column per value label, then ``flags``.

Evidence: one row per mention and per value, with exact offsets.  Unless
redacted, evidence holds report text (the ``text`` column, trigger words,
notes): protected health information.  A Parquet evidence table says so in its
schema metadata (key ``pathsieve``: ``{"contains_report_text": true, ...}``);
``pathsieve label`` also writes :data:`EVIDENCE_PHI_NOTICE` beside an evidence
file that holds text (``<evidence>.PHI.txt``: JSONL has no place for a note).
"""

from __future__ import annotations

import json
from typing import Any

from .aggregate import CaseLabels, PartLabels
from .records import CERTAINTY_SCORE, LabelState
from .schemes import Scheme

__all__ = [
    "EVIDENCE_COLUMNS",
    "EVIDENCE_PHI_NOTICE",
    "UNCERTAIN_MODES",
    "error_rows",
    "evidence_rows",
    "evidence_schema",
    "label_columns",
    "label_rows",
    "label_schema",
]

UNCERTAIN_MODES = ("drop", "positive", "negative", "soft")
EVIDENCE_PHI_NOTICE = (
    "This evidence table contains pathology report text (the 'text' column, trigger words "
    "and notes): protected health information. Keep it on approved systems, do not e-mail or "
    "upload it, and delete it when it is no longer needed. 'pathsieve label --redact-evidence' "
    "writes evidence with offsets and concept ids only."
)
EVIDENCE_COLUMNS = [
    "case_id",
    "part",
    "kind",
    "labels",
    "concept_id",
    "concept_label",
    "value_key",
    "value",
    "text",
    "start",
    "end",
    "section",
    "certainty",
    "temporality",
    "experiencer",
    "decides",
    "triggers",
    "match",
    "score",
    "flags",
    "note",
]


def label_columns(scheme: Scheme, per: str = "case") -> list[str]:
    head = ["case_id", "part"] if per == "part" else ["case_id"]
    return [
        *head,
        "status",
        "error",
        "primary_label",
        *scheme.label_keys,
        *scheme.value_keys,
        "flags",
    ]


def label_schema(
    scheme: Scheme, per: str = "case", *, states: bool = False, uncertain: str | None = None
) -> Any:
    """The pyarrow schema of a label table (fixed, so every Parquet chunk and
    every cluster partition has the same column types whatever its rows hold)."""
    import pyarrow as pa

    # state words only when asked for and not binarised for training
    score = pa.large_string() if states and uncertain is None else pa.float64()
    return pa.schema(
        [
            (name, score if name in scheme.labels else pa.large_string())
            for name in label_columns(scheme, per)
        ]
    )


def evidence_schema(*, redact: bool = False) -> Any:
    """The pyarrow schema of the evidence table, marked as holding report text or not.

    >>> import json
    >>> meta = evidence_schema().metadata[b"pathsieve"]
    >>> json.loads(meta)["contains_report_text"]
    True
    """
    import pyarrow as pa

    text = pa.large_string()
    trigger = pa.struct(
        [
            ("text", pa.string()),
            ("start", pa.int64()),
            ("end", pa.int64()),
            ("category", pa.string()),
        ]
    )
    kinds = {
        "labels": pa.list_(pa.string()),
        "start": pa.int64(),
        "end": pa.int64(),
        "decides": pa.bool_(),
        "triggers": pa.list_(trigger),
        "score": pa.float64(),
        "flags": pa.list_(pa.string()),
    }
    note = {
        "table": "evidence",
        "contains_report_text": not redact,
        "notice": "" if redact else EVIDENCE_PHI_NOTICE,
    }
    return pa.schema(
        [(name, kinds.get(name, text)) for name in EVIDENCE_COLUMNS],
        metadata={"pathsieve": json.dumps(note)},
    )


def _cell(state: LabelState | None, *, states: bool, uncertain: str | None) -> Any:
    if uncertain is not None:
        # training export: present/likely -> 1, absent/unlikely/unmentioned -> 0
        if state is None:
            return 0.0
        if state.state == "uncertain":
            return {"drop": None, "positive": 1.0, "negative": 0.0, "soft": 0.5}[uncertain]
        return 1.0 if CERTAINTY_SCORE[state.state] >= 0.75 else 0.0
    if state is None:
        return "" if states else None
    return state.state if states else state.score


def _row(
    case_id: str,
    part: str | None,
    labels: PartLabels,
    scheme: Scheme,
    *,
    states: bool,
    uncertain: str | None,
) -> dict[str, Any]:
    positive = [k for k, s in labels.states.items() if s.state in ("present", "likely")]
    row: dict[str, Any] = {"case_id": case_id}
    if part is not None:
        row["part"] = part
    row.update(status="ok", error="", primary_label=scheme.primary(positive))
    for key in scheme.label_keys:
        row[key] = _cell(labels.states.get(key), states=states, uncertain=uncertain)
    for key in scheme.value_keys:
        v = labels.values.get(key)
        row[key] = "" if v is None else str(v.value)
    row["flags"] = ";".join(dict.fromkeys(labels.flags))
    return row


def label_rows(
    case_id: str,
    result: CaseLabels,
    *,
    per: str = "case",
    states: bool = False,
    uncertain: str | None = None,
) -> list[dict[str, Any]]:
    """Rows of the label table for one case."""
    scheme = result.scheme
    if per == "case":
        return [_row(case_id, None, result.case, scheme, states=states, uncertain=uncertain)]
    parts = result.parts or [PartLabels("")]
    return [_row(case_id, p.part, p, scheme, states=states, uncertain=uncertain) for p in parts]


def error_rows(
    case_id: str, message: str, scheme: Scheme, *, per: str = "case"
) -> list[dict[str, Any]]:
    """The row of a case that could not be labelled: status error, nothing else invented."""
    row: dict[str, Any] = dict.fromkeys(label_columns(scheme, per))
    row.update(case_id=case_id, status="error", error=message, primary_label="", flags="")
    if per == "part":
        row["part"] = ""
    for key in scheme.value_keys:
        row[key] = ""
    return [row]


def evidence_rows(
    case_id: str, result: CaseLabels, *, redact: bool = False
) -> list[dict[str, Any]]:
    """One evidence row per mention and value; ``redact`` drops matched text."""
    out = []
    for ev in result.evidence:
        a = ev.assertion
        base: dict[str, Any] = {
            "case_id": case_id,
            "part": ev.part,
            "labels": list(ev.labels),
            "certainty": a.certainty,
            "temporality": a.temporality,
            "experiencer": a.experiencer,
            "decides": ev.decides,
            "triggers": [
                {
                    "text": "" if redact else t.text,
                    "start": t.start,
                    "end": t.end,
                    "category": t.category,
                }
                for t in a.triggers
            ],
        }
        if ev.mention is not None:
            m = ev.mention
            base.update(
                kind="mention",
                concept_id=m.concept_id,
                concept_label=m.label,
                value_key="",
                value="",
                text="" if redact else m.text,
                start=m.start,
                end=m.end,
                section=m.section,
                match=m.match,
                score=float(m.score),
                flags=[],
                note="" if redact else m.note,
            )
        elif ev.value is not None:
            v = ev.value
            base.update(
                kind="value",
                concept_id="",
                concept_label="",
                value_key=v.key,
                value=str(v.value),  # normalised values carry no free text
                text="" if redact else v.text,
                start=v.start,
                end=v.end,
                section=v.section,
                match="pattern",
                score=100.0,
                flags=list(v.flags),
                note="",
            )
        out.append({k: base.get(k) for k in EVIDENCE_COLUMNS})
    return out
