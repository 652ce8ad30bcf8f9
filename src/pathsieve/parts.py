"""Split diagnosis, addendum, gross and synoptic sections into specimen parts.

Part labels are read at line starts only: ``A.``, ``A)``, ``(A)``, ``A:``,
``1.``, ``1)``, and keyword forms ``Part 1:``, ``PART A -``, ``SPECIMEN B -``,
``Specimen #2:``, ``Container 3:`` (keywords are data: ``part_keywords`` in
``ontology/lexicon/section_headers.yaml``).  Cassette keys such as
``A1-A3: tumor`` are never labels: they stay inside part A.

Guards against false parts:

- labels must follow in sequence (A, B, C / 1, 2, 3) within a section, or
  continue the sequence of an earlier section of the same kind;
- when labels of several styles are present, keyword labels win, then the
  style whose sequence starts first (the others are sub-items of a part);
- a single label is a part only when it reads like a part header (a keyword,
  or text ending in ``:`` or `` -``), or when another section of the report
  has a part with the same label (gross "A." and diagnosis "A. Colon, biopsy:");
- a letter mid-sentence ("vitamin A.") never starts a part;
- site lines ("Sigmoid colon, biopsy:" alone on a line) name parts in a
  diagnosis or addendum that has no labels, when at least two such lines
  are each followed by diagnosis text.

A report with one specimen gets one part labelled ``""`` per diagnosis or
addendum section (or one covering the whole text when it has neither).

>>> from pathsieve.sections import find_sections
>>> t = "DIAGNOSIS:\\nA. COLON, BIOPSY:\\n- Tubular adenoma.\\nB. RECTUM, BIOPSY:\\n- Hyperplastic polyp.\\n"
>>> [(p.label, p.header) for p in find_parts(t, find_sections(t))]
[('A', 'A. COLON, BIOPSY:'), ('B', 'B. RECTUM, BIOPSY:')]
"""

from __future__ import annotations

import re
from collections.abc import Iterator, Sequence
from dataclasses import dataclass

from .records import Part, Section
from .sections import (
    HeaderLexicon,
    default_lexicon,
    for_matching,
    is_generic_key_line,
    is_part_label,
    normalise_phrase,
)

__all__ = ["PART_KINDS", "find_parts"]

#: Section kinds whose bodies are split into parts.
PART_KINDS = frozenset({"diagnosis", "addendum", "gross", "synoptic"})
#: Kinds where a bare diagnosis always belongs to a part ("" for one specimen).
_DIAGNOSTIC = frozenset({"diagnosis", "addendum"})
_SITE_KINDS = _DIAGNOSTIC

_SITE_LINE = re.compile(
    r"[ \t]{0,12}(?P<t>[A-Za-z][^\n:]{2,100}?)[ \t]{0,8}(?::|[ \t]-{1,2})[ \t]{0,8}$"
)
_SITE_END = re.compile(r"(?::|[ \t]-{1,2})[ \t]*\r?$", re.MULTILINE)
_HEADER_STOP = re.compile(r":|[ \t][\-–—]{1,2}(?=[ \t]|$)")
_MAX_SITE_WORDS = 12


@dataclass(frozen=True, slots=True)
class _Candidate:
    family: str  # "kw-L", "kw-N", "L", "N", "l" (lower-case letters)
    label: str
    start: int  # where the label begins (after indentation)
    header: str
    strong: bool  # reads like a part header on its own


@dataclass(frozen=True, slots=True)
class _Region:
    kind: str
    start: int
    end: int
    body_start: int
    header: str


def _next_label(label: str) -> str:
    if label.isdigit():
        return str(int(label) + 1)
    return chr(ord(label) + 1) if label < "Z" else ""


def _first_label(family: str) -> str:
    return "1" if family.endswith("N") else "A"


def _regions(sections: Sequence[Section]) -> list[_Region]:
    """Sections with their headerless continuations merged back in.

    The sectioner splits a diagnosis around a bare synoptic run or an inline
    note ("Comment: ...") and resumes it as a headerless section of the same
    kind; for parts it is one stretch, so part A's checklist and comment stay
    inside part A and part B after them is still found.
    """
    out: list[_Region] = []
    for i, s in enumerate(sections):
        if i > 0 and not s.header and out:
            if s.kind == "synoptic":
                back = len(out) - 1
            else:  # the nearest earlier region of the same kind is the parent
                back = next((k for k in range(len(out) - 1, -1, -1) if out[k].kind == s.kind), -1)
            if back >= 0:
                prev = out[back]
                out[back] = _Region(prev.kind, prev.start, s.end, prev.body_start, prev.header)
                del out[back + 1 :]  # notes in between now lie inside the parent
                continue
        out.append(_Region(s.kind, s.start, s.end, s.body_start, s.header))
    return out


def _header_text(
    text: str, orig: str, label_start: int, label_end: int, le: int
) -> tuple[str, bool]:
    """The part header as written, and whether it reads like one on its own.

    "B. RECTUM, POLYPECTOMY: hyperplastic polyp" -> "B. RECTUM, POLYPECTOMY:".
    """
    stop = _HEADER_STOP.search(text, label_end, le)
    cut = le if stop is None else stop.end()
    # Strip with the matching text's idea of space, slice the original.
    end = label_start + len(text[label_start:cut].rstrip())
    if stop is None:
        return orig[label_start:end], False
    has_text = bool(text[label_end : stop.start()].strip())
    return orig[label_start:end], has_text


def _label_lines(
    text: str, region: _Region, lex: HeaderLexicon
) -> Iterator[tuple[int, int, re.Match[str]]]:
    """(line start, line end, match) of the lines of a body that start with a label.

    The regex engine finds the candidate lines (one C-level scan); Python only
    sees the few that match.  The first line may be an inline body
    ("DIAGNOSIS: A. Colon...") and is matched on its own.
    """
    start, stop = region.body_start, region.end
    first_nl = text.find("\n", start, stop)
    first_end = stop if first_nl < 0 else first_nl
    m = lex.part_pattern.match(text, start, first_end)
    if m is not None:
        yield start, _content_end(text, start, first_end), m
    if first_nl < 0:
        return
    for m in lex.part_line_pattern.finditer(text, first_nl + 1, stop):
        ls = m.start()
        nl = text.find("\n", ls, stop)
        yield ls, _content_end(text, ls, stop if nl < 0 else nl), m


def _content_end(text: str, ls: int, le: int) -> int:
    return le - 1 if le > ls and text[le - 1] == "\r" else le


def _candidates(text: str, orig: str, region: _Region, lex: HeaderLexicon) -> list[_Candidate]:
    """Label lines of a region; ``text`` is for matching, ``orig`` gives the headers."""
    out: list[_Candidate] = []
    for ls, le, m in _label_lines(text, region, lex):
        if m.end() > le or not is_part_label(text, m, le):
            continue
        end = m.end()
        if m.group("kw") is not None:
            label = m.group("kl")
            if label.islower() and not m.group("ksep"):
                continue  # "Specimen a 2 cm fragment" is prose
            family = "kw-N" if label.isdigit() else "kw-L"
            start = m.start("kw")
        elif m.group("pl") is not None:
            label = m.group("pl")
            family = "N" if label.isdigit() else "L"
            start = m.start("pl") - 1
        else:
            label = m.group("bl")
            # lower-case letters are usually sub-items; "l" parts need headers
            family = "N" if label.isdigit() else ("l" if label.islower() else "L")
            start = m.start("bl")
        if label.isdigit() and int(label) == 0:
            continue
        if lex.is_key_line(text, ls, le) or (
            region.kind == "synoptic" and is_generic_key_line(text, ls, le)
        ):
            continue  # "1. Histologic type: ..." is a numbered checklist item
        header, strong = _header_text(text, orig, start, end, le)
        out.append(
            _Candidate(family, label.upper(), start, header, strong or family.startswith("kw"))
        )
    return out


def _chain(cands: list[_Candidate], family: str, carry: dict[str, str]) -> list[_Candidate]:
    """The in-sequence labels of one style; other labels are sub-items and ignored."""
    chain: list[_Candidate] = []
    expect = {_first_label(family)}
    if family in carry:
        nxt = _next_label(carry[family])
        if nxt:
            expect.add(nxt)
    for c in cands:
        if c.family != family:
            continue
        if not chain:
            if c.label in expect:
                chain.append(c)
        elif c.label == _next_label(chain[-1].label):
            chain.append(c)
    return chain


def _choose(cands: list[_Candidate], carry: dict[str, str]) -> tuple[list[_Candidate], str, bool]:
    """Pick the sequence that names this region's parts.

    Returns (chain, family, continued) -- ``continued`` when the chain goes on
    from an earlier section of the same kind.
    """
    if not cands:
        return [], "", False
    chains = {f: _chain(cands, f, carry) for f in ("kw-L", "kw-N", "L", "N")}
    for f in ("kw-L", "kw-N"):
        ch = chains[f]
        if ch:
            return ch, f, f in carry and ch[0].label != _first_label(f)
    multi = [(ch[0].start, f) for f in ("L", "N") if len(ch := chains[f]) >= 2]
    if multi:
        f = min(multi)[1]
        ch = chains[f]
        return ch, f, f in carry and ch[0].label != _first_label(f)
    lower = _chain(cands, "l", carry)
    if len(lower) >= 2 and all(c.strong for c in lower):
        # "a. Rectosigmoid colon, resection:" -- lower-case labels used as parts
        return lower, "l", False
    singles = [(ch[0].start, f) for f in ("L", "N") if (ch := chains[f])]
    if singles:
        f = min(singles)[1]
        ch = chains[f]
        return ch, f, f in carry and ch[0].label != _first_label(f)
    return [], "", False


def _site_parts(text: str, orig: str, region: _Region, lex: HeaderLexicon) -> list[_Candidate]:
    """Parts named by a site line ("Sigmoid colon, biopsy:"), each followed by text.

    Only lines ending in ":" or " -" can be site lines; the regex engine finds
    those line ends, so the usual diagnosis without any costs one scan.
    """
    start_at, stop = region.body_start, region.end
    found: list[_Candidate] = []
    gap_from = -1  # where the text after the previous site line starts
    for mark in _SITE_END.finditer(text, start_at, stop):
        ls = max(text.rfind("\n", start_at, mark.start()) + 1, start_at)
        nl = text.find("\n", mark.start(), stop)
        le = _content_end(text, ls, stop if nl < 0 else nl)
        m = _SITE_LINE.match(text, ls, le)
        if m is None:
            continue
        site = m.group("t").strip()
        if (
            "," not in site
            or site.endswith(".")
            or len(site.split()) > _MAX_SITE_WORDS
            or lex.is_key_line(text, ls, le)
        ):
            continue
        if gap_from >= 0 and not text[gap_from:ls].strip():
            return []  # two site lines in a row: a list, not part headers
        start = m.start("t")
        end = start + len(text[start:le].rstrip())
        label = normalise_phrase(site.rstrip(" ,")).upper()
        found.append(_Candidate("site", label, start, orig[start:end], True))
        gap_from = le
    if len(found) < 2 or not text[gap_from:stop].strip():
        return []  # fewer than two, or a site line with nothing after it
    return found


def find_parts(
    text: str, sections: Sequence[Section], *, lexicon: HeaderLexicon | None = None
) -> list[Part]:
    """Specimen parts of a report, sorted by start.

    ``sections`` is the output of :func:`pathsieve.sections.find_sections` for
    the same text.  A label found in both the gross and the diagnosis gives
    two parts with that label.
    """
    if not text:
        return []
    lex = lexicon if lexicon is not None else default_lexicon()
    scan = for_matching(text)
    regions = [
        r
        for r in _regions(sections)
        if r.kind in PART_KINDS and not lex.is_cassette_header(r.header)
    ]
    carry: dict[str, dict[str, str]] = {}  # kind -> family -> last label
    picked: list[tuple[_Region, list[_Candidate]]] = []
    weak: list[tuple[_Region, _Candidate]] = []  # lone labels awaiting support
    for region in regions:
        cands = _candidates(scan, text, region, lex)
        state = carry.setdefault(region.kind, {})
        chain, family, continued = _choose(cands, state)
        if len(chain) == 1 and not chain[0].strong and not continued:
            weak.append((region, chain[0]))
            chain = []
        if not chain and region.kind in _SITE_KINDS:
            chain = _site_parts(scan, text, region, lex)
            family = "site" if chain else ""
        if chain:
            if family != "site":
                state[family] = chain[-1].label
            picked.append((region, chain))
    # A lone "A." is a part when another section names a part "A" too.
    # Two lone "A." in sections of different kinds support each other.
    named = {c.label for _, chain in picked for c in chain}
    weak_kinds: dict[str, set[str]] = {}
    for region, cand in weak:
        weak_kinds.setdefault(cand.label, set()).add(region.kind)
    named.update(label for label, kinds in weak_kinds.items() if len(kinds) >= 2)
    for region, cand in weak:
        if cand.label in named:
            picked.append((region, [cand]))

    parts: list[Part] = []
    covered: set[int] = set()
    for region, chain in picked:
        covered.add(region.start)
        for k, c in enumerate(chain):
            end = chain[k + 1].start if k + 1 < len(chain) else region.end
            parts.append(Part(c.label, c.start, end, c.header, c.start + len(c.header)))
    diagnostic = [r for r in regions if r.kind in _DIAGNOSTIC]
    for region in diagnostic:
        if region.start not in covered:
            parts.append(Part("", region.start, region.end, "", region.start))
    if not parts:
        parts.append(Part("", 0, len(text), "", 0))
    parts.sort(key=lambda p: (p.start, p.end))
    return parts
