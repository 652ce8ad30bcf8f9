"""The notebook API: ``Labeler(scheme)`` labels texts and DataFrames.

>>> lab = Labeler("colorectal")
>>> res = lab.label_text("DIAGNOSIS: Sigmoid colon, biopsy: adenocarcinoma.")
>>> res.labels.loc[0, "adenocarcinoma"]
1.0
"""

from __future__ import annotations

import html
from collections.abc import Iterable
from dataclasses import dataclass
from pathlib import Path
from typing import Any

import pandas as pd

from .aggregate import CaseLabels, _negation_reach, aggregate
from .budget import BudgetExceeded, TimeBudget
from .export import EVIDENCE_COLUMNS, error_rows, evidence_rows, label_columns, label_rows
from .ontology import Ontology, load_ontology
from .pipeline import ReadReport, build_nlp, report_reader
from .records import CERTAINTY_SCORE
from .schemes import Scheme, load_scheme

__all__ = ["LabeledReport", "Labeler"]

_WARM_UP = "DIAGNOSIS: A. Colon, biopsy: no adenoma; 0/2 lymph nodes, margins negative."

#: Certainty colours and text markers of the HTML display (readable without colour).
_MARK = {
    "present": ("#1b7f3b", "●"),
    "likely": ("#5a9a2f", "◕"),
    "uncertain": ("#b7791f", "◑"),
    "unlikely": ("#8a6d9e", "◔"),
    "absent": ("#a23b3b", "○"),
}


@dataclass
class LabeledReport:
    """One labelled report: its label row(s), its evidence, and an HTML view."""

    case_id: str
    text: str
    result: CaseLabels
    labels: pd.DataFrame
    parts: pd.DataFrame
    evidence: pd.DataFrame

    def _repr_html_(self) -> str:
        spans = []
        for ev in self.result.evidence:
            m = ev.mention
            if m is not None:
                spans.append(
                    (m.start, m.end, ev.assertion.certainty, ev.decides, m.label, ev.assertion)
                )
        spans.sort(key=lambda s: (s[0], -s[1]))
        out, pos = [], 0
        for start, end, cert, decides, label, a in spans:
            if start < pos:
                continue
            colour, marker = _MARK[cert]
            flags = [] if a.counts else [a.temporality, a.experiencer]
            title = f"{label}: {cert}" + (f" ({', '.join(flags)})" if flags else "")
            style = f"border-bottom:2px solid {colour};" + ("" if decides else "opacity:.6;")
            out.append(html.escape(self.text[pos:start]))
            out.append(
                f'<span style="{style}" title="{html.escape(title)}">'
                f"{html.escape(self.text[start:end])}<sup>{marker}</sup></span>"
            )
            pos = end
        out.append(html.escape(self.text[pos:]))
        rows = "".join(
            f"<tr><td>{html.escape(k)}</td><td>{_MARK[s.state][1]} {s.state}"
            f"{' (conflict)' if s.conflict else ''}{' (implied)' if s.implied else ''}</td></tr>"
            for k, s in self.result.case.states.items()
        )
        vals = "".join(
            f"<tr><td>{html.escape(k)}</td><td>{html.escape(str(v.value))}</td></tr>"
            for k, v in self.result.case.values.items()
        )
        legend = " ".join(f"{m} {s}" for s, (_, m) in _MARK.items())
        return (
            '<div style="display:flex;gap:1.5em;font-family:sans-serif">'
            f'<pre style="white-space:pre-wrap;max-width:60em;flex:3">{"".join(out)}</pre>'
            f'<div style="flex:1"><b>{html.escape(self.case_id)}</b> · scheme '
            f"{html.escape(self.result.scheme.name)}<table>{rows}{vals}</table>"
            f"<p><small>{legend}</small></p><p><small>Research labels for model training, not a "
            "diagnosis; the signing pathologist's report is authoritative.</small></p></div></div>"
        )


def bears_on_labels(scheme: Scheme, concept_id: str) -> bool:
    """Whether a mention of ``concept_id`` can change a label table, whatever its assertion.

    It can when it counts for a label, when its negation reaches a label, or
    when it sets off an implication or names the site one needs: the ways :func:`~pathsieve.aggregate.aggregate`
    uses a mention.  Any other (a site, a procedure) is evidence only.  A test
    holds label tables with and without this shortcut identical.
    """
    own, broad = _negation_reach(scheme, concept_id)
    if own or broad:
        return True
    onto = scheme.ontology
    return any(
        (imp.concept is not None and onto.is_a(concept_id, imp.concept))
        or (imp.site is not None and onto.is_a(concept_id, imp.site))
        for imp in scheme.implications
    )


class Labeler:
    """Label reports with one scheme; the pipeline is built once and reused."""

    def __init__(self, scheme: str | Path | Scheme, *, ontology: Ontology | None = None) -> None:
        onto = ontology or (scheme.ontology if isinstance(scheme, Scheme) else load_ontology())
        self.scheme = scheme if isinstance(scheme, Scheme) else load_scheme(scheme, onto)
        self.nlp = build_nlp(self.scheme, ontology=onto)
        self._read = report_reader(self.nlp)
        # A label table needs the scheme's value keys and the mentions that can change a
        # label; the rest is evidence only, and a run writing no evidence skips it.
        relevant: dict[str, bool] = {}

        def keep(cid: str) -> bool:
            hit = relevant.get(cid)
            if hit is None:
                hit = relevant[cid] = bears_on_labels(self.scheme, cid)
            return hit

        self._read_for_labels = report_reader(
            self.nlp, value_keys=self.scheme.value_keys, keep_mention=keep, counting_only=True
        )
        # Some pieces (the value readers' patterns) are built on first use.  Build them
        # now: the first report's time budget must not pay for them, an interrupted
        # build must not be possible, and forked workers inherit them ready-made.
        self._read(_WARM_UP)
        self._read_for_labels(_WARM_UP)

    def read(self, text: str) -> ReadReport:
        """The pipeline's records for one text (the spaCy Doc is not built)."""
        return self._read(text)

    def label_report(self, text: str) -> CaseLabels:
        return aggregate(self.read(text), self.scheme)

    def columns(self, per: str = "case") -> list[str]:
        return label_columns(self.scheme, per)

    def label_text(self, text: str, case_id: str = "report", **options: Any) -> LabeledReport:
        """Label one report; returns its table rows, evidence and an HTML view."""
        result = self.label_report(text)
        return LabeledReport(
            case_id=case_id,
            text=text,
            result=result,
            labels=self._frame(label_rows(case_id, result, **options), "case"),
            parts=self._frame(label_rows(case_id, result, per="part", **options), "part"),
            evidence=pd.DataFrame(evidence_rows(case_id, result), columns=EVIDENCE_COLUMNS),
        )

    def label_records(
        self,
        records: Iterable[tuple[str, str, str]],
        *,
        per: str = "case",
        states: bool = False,
        uncertain: str | None = None,
        redact: bool = False,
        evidence: bool = True,
        time_budget: float | None = None,
    ) -> tuple[list[dict[str, Any]], list[dict[str, Any]]]:
        """Label (case_id, text, error) records; an error record yields an error row.

        Exactly one row per record (per part with ``per="part"``), in order.  A
        report whose labelling fails, or runs past ``time_budget`` seconds (see
        :class:`~pathsieve.budget.TimeBudget`), becomes an error row too; error
        messages name the case, never its text.
        """
        rows: list[dict[str, Any]] = []
        ev: list[dict[str, Any]] = []
        with TimeBudget(time_budget) as budget:
            for case_id, text, error in records:
                if error:
                    rows += error_rows(case_id, error, self.scheme, per=per)
                    continue
                try:
                    with budget.watch(len(text)):
                        result = (
                            self.label_report(text)
                            if evidence
                            else aggregate(self._read_for_labels(text), self.scheme)
                        )
                        new_rows = label_rows(
                            case_id, result, per=per, states=states, uncertain=uncertain
                        )
                        new_ev = evidence_rows(case_id, result, redact=redact) if evidence else []
                except BudgetExceeded:
                    seconds = budget.allowance(len(text))
                    message = f"case {case_id}: exceeded the time budget of {seconds:g} s"
                    rows += error_rows(case_id, message, self.scheme, per=per)
                    continue
                except Exception as exc:  # one bad report never stops a run
                    # the exception's own message may quote the report: name its type only
                    message = f"case {case_id}: {type(exc).__name__} while labelling"
                    rows += error_rows(case_id, message, self.scheme, per=per)
                    continue
                rows += new_rows
                ev += new_ev
        return rows, ev

    def label_frame(
        self,
        df: pd.DataFrame,
        *,
        id_col: str = "case_id",
        text_col: str = "text",
        per: str = "case",
        states: bool = False,
        uncertain: str | None = None,
        time_budget: float | None = None,
    ) -> pd.DataFrame:
        """Label a DataFrame of reports; one output row per input case (or per part)."""
        from .io import _finish

        chunk = _finish(df, id_col, text_col, Path("<DataFrame>"), 1, set())
        rows, _ = self.label_records(
            zip(chunk.case_id, chunk.text, chunk.error, strict=True),
            per=per,
            states=states,
            uncertain=uncertain,
            evidence=False,
            time_budget=time_budget,
        )
        return self._frame(rows, per)

    def _frame(self, rows: list[dict[str, Any]], per: str) -> pd.DataFrame:
        return frame_from_rows(rows, self.columns(per), self.scheme, states=False)


def frame_from_rows(
    rows: list[dict[str, Any]], columns: list[str], scheme: Scheme, *, states: bool
) -> pd.DataFrame:
    """A label table with stable dtypes (scores float, everything else string)."""
    df = pd.DataFrame(rows, columns=columns)
    for key in scheme.label_keys:
        if (
            not states
            and (df[key].isna() | df[key].map(lambda x: isinstance(x, float | int))).all()
        ):
            df[key] = df[key].astype("float64")
    return df


assert set(_MARK) == set(CERTAINTY_SCORE)
