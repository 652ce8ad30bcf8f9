"""Line-aware scopes: form fields, nodal categories, run-on history, comparisons.

Report forms and OCR'd text put one field a line, so a trigger must not carry
over from one field into the next ("Yes No" boxes above a diagnosis; an OCR'd
"NO (0/14)" nodal category between two lines); a past event told in a long
run-on diagnosis must not date the findings that follow it; a comparison with
earlier material dates nothing.  Prose wrapped mid-phrase still carries its
trigger onto the next line, and plain negations keep working.

Each case marks one mention with {braces} and gives the expected certainty,
temporality and the trigger text that decided the axis asked about (None: no
trigger acts).  Expectations follow the NegEx/ConText scope rules (Chapman et
al., J Biomed Inform 2001; Harkema et al., J Biomed Inform 2009; recalled from
memory) as pathsieve applies them to line-per-field reports (practice).  Every
fragment is invented for pathsieve (fictional Northgate Lane laboratory).
"""

from __future__ import annotations

import re
from pathlib import Path

import pytest

from pathsieve.assertion import AssertionEngine, check_triggers, parse_triggers

ENGINE = AssertionEngine.load()
P, A, L = "present", "absent", "likely"
CUR, HIST, HYP = "current", "historical", "hypothetical"


def marked(fragment: str) -> tuple[str, tuple[int, int]]:
    """Strip the one {braced} mention from a fragment; return text and its span."""
    m = re.search(r"\{([^}]+)\}", fragment)
    assert m is not None, fragment
    text = fragment[: m.start()] + m.group(1) + fragment[m.end() :]
    return text, (m.start(), m.start() + len(m.group(1)))


def certainty_of(fragment: str) -> tuple[str, str | None]:
    text, span = marked(fragment)
    a = ENGINE.assess(text, [span])[0]
    hits = [t.text for t in a.triggers if t.category == a.certainty]
    return a.certainty, hits[0] if hits else None


def temporality_of(fragment: str) -> tuple[str, str | None]:
    text, span = marked(fragment)
    a = ENGINE.assess(text, [span])[0]
    hits = [t.text for t in a.triggers if t.category == a.temporality]
    return a.temporality, hits[0] if hits else None


@pytest.mark.parametrize(
    ("fragment", "certainty", "trigger"),
    [
        # a checkbox row above the diagnosis answers its own question
        (
            "Pleural invasion\nYes No NA\n{Moderately differentiated squamous cell carcinoma}",
            P,
            None,
        ),
        ("Perineural invasion  Yes No\n{Acinar adenocarcinoma}, Gleason 3+4", P, None),
        # an OCR'd nodal category "N0" read as "NO", then a node count
        ("Poorly differentiated adenocarcinoma\nNO (0/14)\npT3 NO (0/14) {G3} R0", P, None),
        ("{Squamous cell carcinoma}, keratinising\nNO (0/9)", P, None),
        ("pT2 NO (0/11) {G2}", P, None),
        ("Stage pT1b NO\n{Lymph nodes}, level 7, excision: reactive changes", P, None),
        # "No 2" numbers a specimen: nothing is negated
        ("Specimen No 2: {adenocarcinoma} of the sigmoid colon", P, None),
        # a part marker glued to its text, a dash-led item, a heading line of its own
        (
            "There is no evidence of metastatic carcinoma,\n"
            "B.Sections of the mass show {adenocarcinoma}",
            P,
            None,
        ),
        ("SURGICAL MARGINS FREE OF TUMOR\n-METASTATIC {ADENOCARCINOMA} IN 2 OF 15 NODES", P, None),
        (
            "NEGATIVE FOR FUNGAL ORGANISMS\nSIGMOID COLON (LAPAROSCOPIC SEGMENTAL RESECTION):\n"
            "{INVASIVE ADENOCARCINOMA}",
            P,
            None,
        ),
        # a hedge on one form line does not reach the next field
        ("Extraprostatic extension\nIndeterminate\n{Seminal vesicle invasion}", P, None),
        # a column of checklist answers: each answer belongs to its own key, so
        # a backward negation two answers down negates neither the type above it
        (
            "Histologic type:\nHistologic grade:\nLymph-vascular invasion:\n"
            "Unifocal\n{Adenocarcinoma}\nG2, moderately differentiated\nNot identified",
            P,
            None,
        ),
        ("Sigmoid colon\n{Adenocarcinoma}\n4.5 cm in greatest dimension\nNot identified", P, None),
        # ... right on the next line it still answers the line before
        ("Perineural invasion\n{Lymph-vascular invasion}\nNot identified", A, "Not identified"),
        ("{Perineural invasion}\nNot identified", A, "Not identified"),
        ("{Perineural invasion}:\nNot identified", A, "Not identified"),
        ("NO {CARCINOMA}, IN SITU OR INVASIVE,\nIS IDENTIFIED", A, "NO"),
        # a field answered "No" at the end of its line reaches the next line at most
        (
            "Reviewed:No\n-- 7 --\n__ .. ___\n{ENDOCERVIX}, BIOPSY: MUCINOUS ADENOCARCINOMA",
            P,
            None,
        ),
        ("Reviewed:No\n-- 7 --\n__ .. ___\nENDOCERVIX, BIOPSY: {MUCINOUS ADENOCARCINOMA}", P, None),
        ("Margins: negative for\n{invasive carcinoma}", A, "negative for"),
        # real negations still hold
        ("No {carcinoma} identified.", A, "No"),
        ("Negative for {malignancy}.", A, "Negative for"),
        ("Lymph nodes: no {metastatic carcinoma} (0/12).", A, "no"),
        ("NO {CARCINOMA} SEEN (0/3).", A, "NO"),
        # ... across a line wrapped mid-phrase
        ("There is no evidence of\n{malignancy} in the sections.", A, "no evidence of"),
        ("There is no atypia or\n{dysplasia}.", A, "no"),
        ("ONE LYMPH NODE, NEGATIVE FOR\n{CARCINOMA} (0/1).", A, "NEGATIVE FOR"),
        ("Sections negative for\n{Malignant cells}.", A, "negative for"),
        # ... and from a label whose value is on the next line
        ("Negative for:\n{Carcinoma}", A, "Negative for"),
        ("Margins uninvolved by\n{invasive carcinoma}", A, "uninvolved by"),
    ],
)
def test_certainty_across_lines(fragment: str, certainty: str, trigger: str | None) -> None:
    assert certainty_of(fragment) == (certainty, trigger)


@pytest.mark.parametrize(
    ("fragment", "temporality", "trigger"),
    [
        # a run-on diagnosis: the past excision is told on its own line
        (
            "Hemicolectomy specimen with several tubular adenomas, with\n"
            "status post polypectomy of a {sessile adenoma} (compare previous findings\n"
            "NL-24-0311 and NL-24-0348) and with an ulcerated invasive adenocarcinoma",
            HIST,
            "status post",
        ),
        (
            "Hemicolectomy specimen with several tubular adenomas, with\n"
            "status post polypectomy of a sessile adenoma (compare previous findings\n"
            "NL-24-0311 and NL-24-0348) and with an ulcerated invasive {adenocarcinoma}",
            CUR,
            None,
        ),
        # a comparison dates nothing
        ("Invasive {adenocarcinoma}; compare previous findings.", CUR, None),
        ("Compared with prior biopsy, {adenocarcinoma} is present.", CUR, None),
        ("Compare with previous {squamous cell carcinoma} (NL-23-0992).", CUR, None),
        ("In comparison with prior material, {high-grade dysplasia} persists.", CUR, None),
        # a gross specimen "previously unopened" was not opened before
        ("Received is a previously unopened segment of {sigmoid colon}.", CUR, None),
        # history still reaches a line wrapped right after the trigger or mid-phrase
        ("History of\n{colon cancer}, treated.", HIST, "History of"),
        ("with possible status post\nendoscopic excision of an {adenoma}).", HIST, "status post"),
        (
            "The previous needle biopsies showed adenocarcinoma with\n{Gleason score} of 7",
            HIST,
            "previous",
        ),
        ("History of {rectal adenocarcinoma}, resected.", HIST, "History of"),
        ("Status post {left hemicolectomy} for carcinoma.", HIST, "Status post"),
        # ... but not a line that starts afresh
        ("History of hypertension\n{Adenocarcinoma}, moderately differentiated", CUR, None),
        # hypothetical readings are unchanged
        ("Rule out {lymphoma}.", HYP, "Rule out"),
    ],
)
def test_temporality_across_lines(fragment: str, temporality: str, trigger: str | None) -> None:
    assert temporality_of(fragment) == (temporality, trigger)


def test_line_rules_keep_offsets_on_the_original_text() -> None:
    # the walls are read from the original text (case matters), the trigger
    # evidence still points at exact offsets
    text = "Pleural invasion\nYes No NA\nNo tumour necrosis"
    start = text.index("tumour necrosis")
    a = ENGINE.assess(text, [(start, start + 15)])[0]
    assert a.certainty == A
    hit = a.triggers[0]
    assert text[hit.start : hit.end] == hit.text == "No"
    assert hit.start == text.rindex("No ")


# ---------------------------------------------------------------- the lexicon syntax


def test_shipped_lexicon_reads_the_new_columns() -> None:
    rows, problems = parse_triggers(ENGINE.path or "")
    assert problems == []
    by = {(r.phrase, r.category): r for r in rows}
    assert by[("status post", "historical")].within_line
    assert by[("prior", "historical")].scope == 4 and by[("prior", "historical")].within_line
    assert not by[("no", "absent")].within_line
    assert by[("no ( <num>", "pseudo")].tokens == ("no", "(", "<num>")
    assert by[("with", "continue")].tokens == ("with",)


@pytest.mark.parametrize(
    ("body", "message"),
    [
        ("prior\thistorical\tforward\tline 4\n", "bad scope 'line 4'"),
        ("prior\thistorical\tforward\t4 lines\n", "bad scope '4 lines'"),
        ("<num> no\tpseudo\t-\t-\n", "stands for a number inside a phrase"),
        ("and so\tcontinue\t-\t-\n", "a continue row takes one word"),
        ("with\tcontinue\tforward\t-\n", "continue rows take no direction or scope"),
    ],
)
def test_bad_new_syntax(tmp_path: Path, body: str, message: str) -> None:
    path = tmp_path / "triggers.tsv"
    path.write_text("no\tabsent\tforward\t-\n" + body, encoding="utf-8")
    problems = check_triggers(path)
    assert any(p.startswith(f"{path}:2: ") and message in p for p in problems), problems


def test_number_placeholder_and_line_scope_from_a_small_lexicon(tmp_path: Path) -> None:
    path = tmp_path / "triggers.tsv"
    path.write_text(
        "no\tabsent\tforward\t-\n"
        "no ( <num> )\tpseudo\t-\t-\n"
        "previous\thistorical\tforward\tline\n"
        "of\tcontinue\t-\t-\n",
        encoding="utf-8",
    )
    engine = AssertionEngine.load(path)
    assert [t.category for t in engine.triggers] == ["absent", "pseudo", "historical", "continue"]

    def read(fragment: str) -> tuple[str, str]:
        text, span = marked(fragment)
        a = engine.assess(text, [span])[0]
        return a.certainty, a.temporality

    # the placeholder matches digits only, the whole phrase must be there
    assert read("no (3) {carcinoma}") == (P, CUR)
    assert read("no (x) {carcinoma}") == (A, CUR)
    assert read("no (3 {carcinoma}") == (A, CUR)
    # "line": the next line only when the trigger, or a continue word, ends the line
    assert read("previous\n{biopsy}") == (P, HIST)
    assert read("previous biopsy\n{carcinoma}") == (P, CUR)
    assert read("previous biopsy of\n{carcinoma}") == (P, HIST)
