"""Lymphovascular invasion: ``"present"`` or ``"absent"``.

Read forms: the name then a finding ("LVI: present", "Lymph-vascular invasion:
Not identified", "angiolymphatic invasion present"), a negating or affirming
phrase before the name ("no lymphovascular invasion", "no perineural or
lymphovascular invasion", "carcinoma with lymphovascular invasion").

A *part* of LVI ("lymphatic invasion", "venous invasion") makes LVI present
when it is present, but says nothing when it is absent (the other vessels may
be involved), so only "present" is read from it (``detail["partial"] = True``).
A checkbox line that lists both answers ("( No ( Yes ( Unknown") is not read.

>>> from pathsieve.values import extract_values
>>> t = "No lymphovascular invasion is identified."
>>> [(v.value, v.text) for v in extract_values(t, [(0, len(t), "diagnosis", "")])]
[('absent', 'No lymphovascular invasion')]
"""

from __future__ import annotations

import re

from ..records import Value
from .common import Anchors, Found, Region, Rx, alternation, gate, near_before
from .lexicon import ValueLexicon

__all__ = ["LVIReader"]

_S = r"[^\S\n]{0,3}"


class LVIReader:
    """Reads ``lymphovascular_invasion``."""

    keys = ("lymphovascular_invasion",)

    def __init__(self, lex: ValueLexicon) -> None:
        fam = "lvi"
        full = alternation(lex.phrases(fam, "names"), lex.phrases(fam, "name_abbreviations"))
        partial = alternation(lex.phrases(fam, "partial_names"))
        self._full = Rx(full)
        name = rf"(?P<name>{full}|{partial})(?:{_S}\([^()\n]{{1,12}}\))?"
        present = lex.phrases(fam, "present")
        absent = lex.phrases(fam, "absent")
        self._absent_words = {" ".join(w.split()) for w in absent}
        finding = alternation((*present, *absent))
        self._finding_any = Rx(finding)
        # "LVI: present", "lymphovascular invasion is not identified", "... by carcinoma identified"
        self._name_first = Rx(
            rf"{name}{_S}[:=\-–;]?{_S}(?:\(?{_S})?(?:(?:is|are|was|were){_S})?"
            rf"(?:by{_S}[a-z]{{2,15}}(?:{_S}[a-z]{{2,15}})?{_S})?(?P<finding>{finding})"
        )
        coordinated = alternation(lex.phrases(fam, "coordinated"))
        coord = rf"(?:{coordinated}{_S}(?:,|or|and|nor|/){_S})?"
        # "no lymphovascular invasion", "no perineural or lymphovascular invasion"
        self._absent_prefix = Rx(
            rf"{alternation(lex.phrases(fam, 'absent_prefixes'))}{_S}{coord}(?:{_S}{name})"
        )
        # "with lymphovascular invasion", "positive for LVI"
        self._present_prefix = Rx(
            rf"{alternation(lex.phrases(fam, 'present_prefixes'))}{_S}{coord}(?:{_S}{name})"
        )
        self._at_names = Anchors(
            (*lex.phrases(fam, "names"), *lex.phrases(fam, "partial_names")),
            lex.phrases(fam, "name_abbreviations"),
        )
        self._at_absent = Anchors(lex.phrases(fam, "absent_prefixes"))
        self._at_present = Anchors(lex.phrases(fam, "present_prefixes"))
        #: nothing is read without a name (see :func:`~.common.gate`)
        self.gate = gate(self._at_names)

    def read(self, region: Region) -> list[Value]:
        names = self._at_names.positions(region)
        if not names:
            return []
        found: list[Found] = []
        for m in self._absent_prefix.match_at(
            region, near_before(self._at_absent.positions(region), names, 60)
        ):
            if self._is_full(m, region):
                found.append(self._found(m, region, "absent"))
        for m in self._name_first.match_at(region, names):
            word = " ".join(m["finding"].lower().split())
            value = "absent" if word in self._absent_words else "present"
            if self._is_checkbox(region, m.end("finding"), value):
                continue
            if value == "absent" and not self._is_full(m, region):
                continue  # "lymphatic invasion: absent" leaves blood vessels open
            found.append(self._found(m, region, value))
        for m in self._present_prefix.match_at(
            region, near_before(self._at_present.positions(region), names, 60)
        ):
            found.append(self._found(m, region, "present"))
        return [region.found("lymphovascular_invasion", f) for f in _merge(found)]

    def _is_full(self, m: re.Match[str], region: Region) -> bool:
        """Whether the name is LVI itself, not one part of it ("lymphatic invasion")."""
        full = self._full.match(region, m.start("name"), m.end("name"))
        return full is not None and full.end() == m.end("name")

    def _found(self, m: re.Match[str], region: Region, value: str) -> Found:
        detail = {} if self._is_full(m, region) else {"partial": True}
        return Found(m.start(), m.end(), value, (), detail)

    def _is_checkbox(self, region: Region, end: int, value: str) -> bool:
        """ "Angiolymphatic invasion: ( No ( Yes ( Unknown": every answer listed."""
        body = region.body
        stop = end + len(re.split(r"[.;\n]", body[end : end + 20], maxsplit=1)[0])
        for m in self._finding_any.finditer(region, end, stop):
            other = (
                "absent"
                if " ".join(m.group(0).lower().split()) in self._absent_words
                else "present"
            )
            if other != value:
                return True
        return False


def _merge(found: list[Found]) -> list[Found]:
    """Overlapping readings that agree become one ("Extensive | LVI | is seen");
    of readings that disagree, the earlier-listed form wins."""
    kept: list[Found] = []
    for f in found:
        for k in kept:
            if f.start < k.end and k.start < f.end:
                if f.value == k.value:
                    k.start, k.end = min(k.start, f.start), max(k.end, f.end)
                break
        else:
            kept.append(f)
    return sorted(kept, key=lambda f: f.start)
