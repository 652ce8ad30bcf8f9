"""Aggregation: mentions and values -> label states per part and per case.

The rules of the label contract (LABELS.md):

* only current mentions about the patient decide; historical, hypothetical and
  other-experiencer mentions stay in the evidence with their flags;
* diagnosis, synoptic and addendum sections decide; comment and microscopic
  text adds support (it decides a label no deciding section mentions), and
  so does the headerless text that opens a report (real exports often lose
  the diagnosis header) and a value in any "other" section (a staging line
  cut off from its checklist); clinical history and gross never decide
  while a deciding section exists;
* frozen-section and intraoperative diagnoses are read as comments (their
  headers map to ``"comment"`` in the header lexicon), so they add support
  and never override the permanent diagnosis (beyond the letter of the
  contract, which names no such section: a permanent diagnosis that reads
  "same" or is lost to OCR still yields its frozen-section diagnosis);
* where the deciding mentions of a label are only broad negations
  ("lymph nodes negative for carcinoma"), a specific affirmation in
  supporting text still counts;
* an addendum that mentions a label wins over the original text for it --
  unless its only mentions are broad negations ("not involved by neoplasm"),
  which speak of a parent class and so do not amend this label's diagnosis
  (beyond the letter of the contract: an addendum "changes the diagnosis" only
  where it names it);
* a part's state is its most definite positive state among deciding mentions;
  absent only when every deciding mention is negated; affirmed and negated
  together give "present" with a conflict flag; a case's state is the most
  definite positive state across its parts;
* a mention of a descendant counts for a label (ontology roll-up), and a
  negated mention of a broader class ("negative for carcinoma") negates the
  labels wholly beneath it;
* implications come from the scheme data, never from code.
"""

from __future__ import annotations

import re
from collections import defaultdict
from collections.abc import Iterable, Sequence
from dataclasses import dataclass, field, replace
from typing import Any

from .records import (
    CERTAINTY_ORDER,
    DECIDING,
    SUPPORTING,
    Assertion,
    LabelState,
    Mention,
    ReadReport,
    Value,
)
from .schemes import Scheme

__all__ = ["CaseLabels", "EvidenceRow", "PartLabels", "aggregate", "section_role", "tnm_rank"]

_RANK = {s: i for i, s in enumerate(CERTAINTY_ORDER)}  # lower is more definite-positive


@dataclass(frozen=True, slots=True)
class EvidenceRow:
    """One mention or value with the labels it bears on and whether it decided."""

    kind: str  # "mention" | "value"
    part: str
    labels: tuple[str, ...]
    mention: Mention | None
    value: Value | None
    assertion: Assertion
    decides: bool
    implied_by: str = ""


@dataclass
class PartLabels:
    part: str
    states: dict[str, LabelState] = field(default_factory=dict)
    values: dict[str, Value] = field(default_factory=dict)
    flags: list[str] = field(default_factory=list)


@dataclass
class CaseLabels:
    """A case's labels: per part and rolled up, with the evidence behind them."""

    scheme: Scheme
    parts: list[PartLabels]
    case: PartLabels
    evidence: list[EvidenceRow]

    def positive(self) -> list[str]:
        return [k for k, s in self.case.states.items() if s.state in ("present", "likely")]

    @property
    def primary_label(self) -> str:
        return self.scheme.primary(self.positive())


def _most_definite(states: Iterable[str]) -> str:
    return min(states, key=lambda s: _RANK[s])


def _negation_reach(scheme: Scheme, concept_id: str) -> tuple[tuple[str, ...], tuple[str, ...]]:
    """Labels a *negated* mention of ``concept_id`` speaks against: (own, broad).

    ``own`` are its roll-up labels; ``broad`` are labels with a class beneath the
    negated concept ("negative for carcinoma" speaks against adenocarcinoma).
    A broad negation sets a label absent but never contradicts an affirmation.
    """
    onto = scheme.ontology
    own = scheme.labels_for(concept_id)
    broad = tuple(
        key
        for key, d in scheme.labels.items()
        if key not in own and any(onto.is_a(c, concept_id) for c in d.classes)
    )
    return own, broad


def _lead_end(report: ReadReport) -> int:
    """Where the first section with a header starts (the text before it has none)."""
    return next((s.start for s in report.sections if s.header), len(report.text))


def section_role(
    section: str, has_deciding: bool, start: int = -1, lead_end: int = -1, *, value: bool = False
) -> str:
    """ "decide", "support" or "none": what a mention (or value) in ``section`` can do.

    ``has_deciding``: the report has a diagnosis, synoptic or addendum section;
    ``lead_end``: where its first headed section starts.  A "none" never changes a
    label; the label-only reader skips such mentions and value regions.
    """
    if section in DECIDING:
        return "decide"
    if section in SUPPORTING:
        return "support"
    if not has_deciding and section not in ("clinical_history",):
        # a report with no diagnosis section: its text is the diagnosis
        return "decide" if section != "gross" else "support"
    if section == "other" and (value or 0 <= start < lead_end):
        # Text before the first header: in exports the diagnosis often opens the
        # report with its header lost to OCR or never written, while a later
        # checklist or addendum has one.  It may add support, like a comment
        # (practice).  So may a value anywhere outside clinical history and gross:
        # a staging line or a checklist cut off from its header by OCR damage
        # ("Specimen" ... "pN1: Metastasis in ..."); a value from a deciding
        # section still wins.  Other mentions in headed "other" text (frozen
        # sections, specimen lists) never decide.
        return "support"
    return "none"


def aggregate(report: ReadReport, scheme: Scheme) -> CaseLabels:
    """Aggregate a read report into per-part and per-case labels."""
    # (part, label) -> role -> list of (state, from_addendum, broad)
    votes: dict[tuple[str, str], dict[str, list[tuple[str, bool, bool]]]] = defaultdict(
        lambda: defaultdict(list)
    )
    evidence: list[EvidenceRow] = []
    part_order: list[str] = []
    for p in report.parts:
        if p.label not in part_order:
            part_order.append(p.label)

    lead_end = _lead_end(report)
    deciding = report.has_deciding_section  # once: a scan of the sections
    for m, a in zip(report.mentions, report.assertions, strict=True):
        broad: tuple[str, ...] = ()
        if a.certainty == "absent":
            own, broad = _negation_reach(scheme, m.concept_id)
        else:
            own = scheme.labels_for(m.concept_id)
        keys = own + broad
        role = section_role(m.section, deciding, m.start, lead_end)
        decides = bool(keys) and a.counts and role != "none"
        evidence.append(EvidenceRow("mention", m.part, keys, m, None, a, decides))
        if not decides:
            continue
        if m.part not in part_order:
            part_order.append(m.part)
        for k in keys:
            votes[(m.part, k)][role].append((a.certainty, m.section == "addendum", k in broad))

    values_by_part: dict[str, list[Value]] = defaultdict(list)
    for v, a in zip(report.values, report.value_assertions, strict=True):
        role = section_role(v.section, deciding, v.start, lead_end, value=True)
        decides = a.counts and role != "none"
        fitted = scheme.fit_category(v)
        if fitted is None:
            # a category the organ's staging system lacks: evidence, never a label
            v = replace(v, flags=(*v.flags, "category_not_in_scheme"))
            decides = False
        else:
            v = fitted
        evidence.append(EvidenceRow("value", v.part, (v.key,), None, v, a, decides))
        if decides and v.key in scheme.value_keys:
            values_by_part[v.part].append(v)
            if v.part not in part_order:
                part_order.append(v.part)

    parts: dict[str, PartLabels] = {label: PartLabels(label) for label in part_order}
    for (part, key), roles in votes.items():
        chosen = roles.get("decide") or roles.get("support") or []
        if chosen and all(s == "absent" and b for s, _, b in chosen):
            # Only broad negations decide here ("not involved by neoplasm"): they
            # speak of a parent class, so a specific affirmation in supporting text
            # of the same part still counts (and, being specific, wins).
            chosen = chosen + [v for v in roles.get("support", []) if v[0] != "absent"]
        if not chosen:
            continue
        addenda = [v for v in chosen if v[1]]
        if all(st == "absent" and b for st, _, b in addenda):
            # An addendum that only negates a broader class ("margin not involved
            # by neoplasm") does not change the diagnosis of this label: it wins
            # only where it speaks of the label itself.
            addenda = []
        pool = addenda or chosen
        state = _most_definite(s for s, _, _ in pool)
        # only a negation of the label itself contradicts an affirmation of it
        conflict = state != "absent" and any(s == "absent" and not b for s, _, b in pool)
        parts[part].states[key] = LabelState(key, state, conflict=conflict)
        if conflict:
            parts[part].flags.append(f"conflict:{key}")

    for label, plist in parts.items():
        plist.values.update(_pick_values(values_by_part.get(label, [])))
        _apply_implications(scheme, report, plist, evidence)
        for v in plist.values.values():
            plist.flags.extend(v.flags)

    case = PartLabels("")
    for plist in parts.values():
        for key, st in plist.states.items():
            prev = case.states.get(key)
            if prev is None or _RANK[st.state] < _RANK[prev.state]:
                case.states[key] = LabelState(
                    key, st.state, st.conflict or bool(prev and prev.conflict), st.implied
                )
            elif st.conflict and not prev.conflict:
                case.states[key] = LabelState(key, prev.state, True, prev.implied)
    case.values = _pick_values([v for p in parts.values() for v in p.values.values()])
    case.flags = sorted({f for p in parts.values() for f in p.flags})
    ordered = [parts[label] for label in part_order if label in parts]
    # part "" holds case-level statements (e.g. a comment under no part); it is not a specimen
    specimen_parts = [p for p in ordered if p.part != ""] or ordered
    return CaseLabels(scheme, specimen_parts, case, evidence)


def _apply_implications(
    scheme: Scheme, report: ReadReport, plist: PartLabels, evidence: list[EvidenceRow]
) -> None:
    onto = scheme.ontology
    lead_end = _lead_end(report)
    deciding = report.has_deciding_section
    for imp in scheme.implications:
        if imp.then_label in plist.states:
            continue
        if any(u in plist.states for u in imp.unless):
            continue
        why = ""
        if imp.site is not None and not any(
            row.mention is not None
            and row.part == plist.part
            and onto.is_a(row.mention.concept_id, imp.site)
            for row in evidence
        ):
            continue
        if imp.concept is not None:
            for row in evidence:
                m = row.mention
                if (
                    m is not None
                    and row.part == plist.part
                    and row.assertion.counts
                    and row.assertion.certainty in ("present", "likely")
                    and section_role(m.section, deciding, m.start, lead_end) != "none"
                    and onto.is_a(m.concept_id, imp.concept)
                ):
                    why = f"{m.label} ({m.concept_id})"
                    break
        elif imp.value_key is not None:
            v = plist.values.get(imp.value_key)
            if v is not None and str(v.value) in imp.value_in:
                why = f"{imp.value_key}={v.value}"
        if why:
            plist.states[imp.then_label] = LabelState(imp.then_label, imp.then_state, implied=True)
            plist.flags.append(f"implied:{imp.then_label}")


# ------------------------------------------------------------------ values

_SECTION_PREF = {"addendum": 0, "synoptic": 1, "diagnosis": 2}
_ORDINAL: dict[str, Any] = {
    "margin_status": {"involved": 1, "negative": 0},
    "lymphovascular_invasion": {"present": 1, "absent": 0},
    "her2_status": {"positive": 2, "equivocal": 1, "negative": 0},
}
#: Marsh–Oberhuber types in order; "3" is a type 3 with no stated subtype.
_MARSH_ORDER = {"0": 0, "1": 1, "2": 2, "3": 3, "3a": 4, "3b": 5, "3c": 6, "4": 7}
_MAX_NUMERIC = frozenset(
    {"grade_group", "nottingham_grade", "tumor_size_mm", "lymph_nodes_examined"}
)


_TNM_RE = re.compile(r"[a-z]*([TNM])(X|is|a|\d)(mi|[a-d])?(\d)?", re.IGNORECASE)
_TNM_MAIN = {"x": -2.0, "0": 0.0, "a": 0.25, "is": 0.5}
_TNM_SUB = {"": 0.0, "mi": 0.5, "a": 1.0, "b": 2.0, "c": 3.0, "d": 4.0}


def tnm_rank(value: str) -> tuple[float, float, int, int]:
    """Order of a pT/pN/pM category, least extensive first (AJCC 8th ed.).

    TX/NX (cannot be assessed) rank below every category, Ta and Tis below T1,
    and a subcategory above its bare category (T2 < T2a < T2b), "mi" below "a"
    (T1mi < T1a, N1mi < N1a).  Between equal categories the longer writing,
    which says more ("pT3(m)", "pN0(i+)"), comes last.  An unreadable value ranks
    lowest.

    >>> sorted(["pTis", "pT2", "pTX", "pT1mi", "pT1a", "pT0", "pTa"], key=tnm_rank)
    ['pTX', 'pT0', 'pTa', 'pTis', 'pT1mi', 'pT1a', 'pT2']
    """
    m = _TNM_RE.match(value)
    if m is None:
        return (-9.0, 0.0, 0, 0)
    main, sub, num = m.group(2).lower(), (m.group(3) or "").lower(), m.group(4)
    rank = _TNM_MAIN[main] if main in _TNM_MAIN else float(main)
    return (rank, _TNM_SUB.get(sub, 0.0), int(num) if num else 0, len(value))


def _value_rank(v: Value) -> Any:
    """Larger is 'worse' (what a case-level value should report)."""
    key = v.key
    if key == "gleason_score":
        d = v.detail
        return (int(d.get("total") or 0), int(d.get("primary") or 0))
    if key in _ORDINAL:
        return _ORDINAL[key].get(str(v.value), -1)
    if key == "marsh_grade":
        return _MARSH_ORDER.get(str(v.value), -1)
    if key in ("pt", "pn", "pm"):
        return tnm_rank(str(v.value))
    if key in _MAX_NUMERIC or key == "lymph_nodes_positive":
        try:
            return float(v.value)
        except (TypeError, ValueError):
            return -1.0
    return 0


def _pick_values(values: Sequence[Value]) -> dict[str, Value]:
    """One value per key: addendum first, then synoptic/diagnosis, then the 'worst'.

    Lymph-node counts travel together: the positive count is taken from the
    statement that gave the chosen examined count when there is one.
    """
    by_key: dict[str, list[Value]] = defaultdict(list)
    for v in values:
        by_key[v.key].append(v)
    out: dict[str, Value] = {}
    for key, vs in by_key.items():
        if key == "grade_group":
            # a stated group first, then one derived from a pattern pair, then one
            # from a total alone (a pair says more than a total)
            stated = [v for v in vs if not v.detail.get("derived")]
            paired = [v for v in vs if v.detail.get("derived") and not v.detail.get("from_total")]
            vs = stated or paired or vs
        best_pref = min(_SECTION_PREF.get(v.section, 3) for v in vs)
        pool = [v for v in vs if _SECTION_PREF.get(v.section, 3) == best_pref]
        if key in ("gleason_score", "grade_group"):
            # Within the chosen sections, a score called the predominant (overall)
            # one comes first ("predominant 4+4 with areas of 4+5"), then named
            # primary/secondary fields, which say which pattern is primary where a
            # "P+S" string may be a slip ("3+4" in the fields, "4+3" in a summary
            # line); only then the worst (practice).
            pool = (
                [v for v in pool if v.detail.get("main")]
                or [v for v in pool if v.detail.get("fields")]
                or pool
            )
        if key in ("er_status", "pr_status"):
            out[key] = pool[0]
        else:
            out[key] = max(pool, key=_value_rank)
    examined = out.get("lymph_nodes_examined")
    if examined is not None:
        twins = [v for v in by_key.get("lymph_nodes_positive", []) if v.start == examined.start]
        if twins:
            out["lymph_nodes_positive"] = twins[0]
    return out
