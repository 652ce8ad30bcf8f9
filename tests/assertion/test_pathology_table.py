"""Assertion of mentions in invented pathology report sentences.

Each case marks one mention with [brackets] and gives the expected certainty,
temporality, experiencer and the trigger text that decided it (None: no
trigger acts).  Sources of the expectations are named beside each group:
the certainty table of the label contract (LABELS.md), the NegEx trigger
families (Chapman et al., J Biomed Inform 2001) and the ConText
temporality/experiencer properties (Harkema et al., J Biomed Inform 2009),
recalled from memory; wording conventions with no single source are marked
(practice).  All sentences are invented for pathsieve.
"""

from __future__ import annotations

import re

import pytest

from pathsieve.assertion import AssertionEngine
from pathsieve.errors import InputError
from pathsieve.records import Assertion

ENGINE = AssertionEngine.load()
P, L, U, UL, A = "present", "likely", "uncertain", "unlikely", "absent"
CUR, HIST, HYP = "current", "historical", "hypothetical"
PAT, OTH = "patient", "other"


def marked(sentence: str) -> tuple[str, list[tuple[int, int]]]:
    """Strip [brackets] from a sentence; return the text and the bracketed spans."""
    spans: list[tuple[int, int]] = []
    out: list[str] = []
    pos = 0
    length = 0
    for m in re.finditer(r"\[([^\]]+)\]", sentence):
        out.append(sentence[pos : m.start()])
        length += m.start() - pos
        out.append(m.group(1))
        spans.append((length, length + len(m.group(1))))
        length += len(m.group(1))
        pos = m.end()
    out.append(sentence[pos:])
    return "".join(out), spans


def assess_marked(sentence: str, boundaries: tuple[int, ...] = ()) -> tuple[str, list[Assertion]]:
    text, spans = marked(sentence)
    return text, ENGINE.assess(text, spans, boundaries=boundaries)


# (sentence with one [mention], certainty, temporality, experiencer, deciding trigger)
CASES = [
    # -- absent, trigger before the mention: NegEx pre-negation family (from memory);
    #    grade "absent" for "negative for", "no", "without", "free of" per LABELS.md
    ("Negative for [high-grade dysplasia] and malignancy.", A, CUR, PAT, "Negative for"),
    ("Negative for high-grade dysplasia and [malignancy].", A, CUR, PAT, "Negative for"),
    ("[Tubular adenoma]; negative for high-grade dysplasia.", P, CUR, PAT, None),
    ("Tubular adenoma; negative for [high-grade dysplasia].", A, CUR, PAT, "negative for"),
    ("No [carcinoma] or dysplasia identified.", A, CUR, PAT, "No"),
    ("No carcinoma or [dysplasia] identified.", A, CUR, PAT, "No"),
    ("No evidence of [invasive carcinoma].", A, CUR, PAT, "No evidence of"),
    ("Surgical margins are free of [tumor].", A, CUR, PAT, "free of"),
    ("No residual [carcinoma] is identified in the re-excision.", A, CUR, PAT, "No residual"),
    ("Gastric mucosa without [intestinal metaplasia].", A, CUR, PAT, "without"),
    ("There is no [lymphovascular invasion].", A, CUR, PAT, "no"),
    ("Absence of [Helicobacter pylori] organisms on immunostain.", A, CUR, PAT, "Absence of"),
    ("Prostatic tissue devoid of [atypical glands].", A, CUR, PAT, "devoid of"),
    ("The lesion lacks [nuclear atypia].", A, CUR, PAT, "lacks"),
    ("Neither [dysplasia] nor carcinoma is present.", A, CUR, PAT, "Neither"),
    ("Neither dysplasia nor [carcinoma] is present.", A, CUR, PAT, "nor"),
    ("Keratin stain fails to reveal [metastatic carcinoma].", A, CUR, PAT, "fails to reveal"),
    ("Findings not consistent with [celiac disease].", A, CUR, PAT, "not consistent with"),
    ("Cytology not suspicious for [malignancy].", A, CUR, PAT, "not suspicious for"),
    ("Negative for [intraepithelial lesion] or malignancy.", A, CUR, PAT, "Negative for"),
    ("NEGATIVE FOR INTRAEPITHELIAL LESION OR [MALIGNANCY].", A, CUR, PAT, "NEGATIVE FOR"),
    ("Benign prostatic tissue, negative for [adenocarcinoma].", A, CUR, PAT, "negative for"),
    ("Lymph nodes negative for [metastatic carcinoma] (0/14).", A, CUR, PAT, "negative for"),
    ("Colonic mucosa with no [active colitis].", A, CUR, PAT, "no"),
    ("Immunostains are negative for [CDX2].", A, CUR, PAT, "negative for"),
    # a line wrap and runs of spaces do not break a scope (practice)
    ("No high-grade dysplasia or\n   [carcinoma] is identified.", A, CUR, PAT, "No"),
    ("no   [granulomas]   are seen", A, CUR, PAT, "no"),
    ("negative   for\n[dysplasia]", A, CUR, PAT, "negative   for\n"[:-1]),
    # -- absent, trigger after the mention: NegEx post-negation family (from memory)
    ("[Lymphovascular invasion]: not identified.", A, CUR, PAT, "not identified"),
    ("[Perineural invasion] is not identified.", A, CUR, PAT, "not identified"),
    ("[Perineural invasion] is absent.", A, CUR, PAT, "is absent"),
    ("[Extraprostatic extension]: absent.", A, CUR, PAT, "absent"),
    ("[Dysplasia] not seen.", A, CUR, PAT, "not seen"),
    ("[Granulomas] are not present.", A, CUR, PAT, "not present"),
    ("[Margins]: negative.", A, CUR, PAT, ": negative"),
    ("[Margins] negative.", A, CUR, PAT, "negative"),
    ("[ER] negative, PR positive.", A, CUR, PAT, "negative"),
    ("ER negative, [PR] positive.", P, CUR, PAT, None),
    ("[HPV] in situ hybridization is negative.", A, CUR, PAT, "is negative"),
    ("[HPV]-negative squamous cell carcinoma.", A, CUR, PAT, "-negative"),
    ("HPV-negative [squamous cell carcinoma].", P, CUR, PAT, None),
    ("[Tumor]-free margins.", A, CUR, PAT, "-free"),
    # careful: "negative" right after "margins" is about the margins, not the tumour
    ("[Carcinoma], margins negative.", P, CUR, PAT, None),
    ("[Carcinoma] was ruled out.", A, CUR, PAT, "ruled out"),
    ("[Dysplasia]: none identified.", A, CUR, PAT, "none identified"),
    ("[Metastatic carcinoma] is excluded by immunostains.", A, CUR, PAT, "excluded"),
    # -- unlikely (0.25): LABELS.md "unlikely", "not favored", "doubt"
    ("[Lymphoma] is unlikely.", UL, CUR, PAT, "unlikely"),
    ("Unlikely to represent [metastasis].", UL, CUR, PAT, "Unlikely"),
    ("[Squamous cell carcinoma] is not favored.", UL, CUR, PAT, "not favored"),
    ("Doubt [invasive carcinoma].", UL, CUR, PAT, "Doubt"),
    ("[Metastatic carcinoma] is less likely.", UL, CUR, PAT, "less likely"),
    # "no definite" states a residual doubt: graded unlikely, not absent (practice)
    ("No definite [invasion] is seen.", UL, CUR, PAT, "No definite"),
    ("No definite evidence of [malignancy].", UL, CUR, PAT, "No definite"),
    ("No convincing [dysplasia].", UL, CUR, PAT, "No convincing"),
    # -- uncertain (0.5): LABELS.md "suspicious for", "cannot exclude", "possible", "?"
    ("Atypical glands, suspicious for [adenocarcinoma].", U, CUR, PAT, "suspicious for"),
    (
        "Atypical small acinar proliferation, worrisome for [carcinoma].",
        U,
        CUR,
        PAT,
        "worrisome for",
    ),
    ("Findings concerning for [lymphoma].", U, CUR, PAT, "concerning for"),
    ("[Invasion] cannot be excluded.", U, CUR, PAT, "cannot be excluded"),
    ("Cannot exclude [microinvasion].", U, CUR, PAT, "Cannot exclude"),
    ("Cannot rule out [invasive carcinoma].", U, CUR, PAT, "Cannot rule out"),
    ("[Invasion] has not been ruled out.", U, CUR, PAT, "not been ruled out"),
    ("Possible [lymphovascular invasion].", U, CUR, PAT, "Possible"),
    ("? [lymphoma]", U, CUR, PAT, "?"),
    ("Polyp, ?[adenoma]", U, CUR, PAT, "?"),
    ("[Adenocarcinoma]?", U, CUR, PAT, "?"),
    (
        "Differential diagnosis includes [Hodgkin lymphoma].",
        U,
        CUR,
        PAT,
        "Differential diagnosis includes",
    ),
    ("[Reactive atypia] vs. dysplasia.", U, CUR, PAT, "vs"),
    ("Reactive atypia versus [dysplasia].", U, CUR, PAT, "versus"),
    ("Findings suggestive of [celiac disease].", U, CUR, PAT, "suggestive of"),
    ("Suspicious for but not diagnostic of [carcinoma].", U, CUR, PAT, "not diagnostic of"),
    ("May represent [low-grade dysplasia].", U, CUR, PAT, "May represent"),
    ("[Lymphovascular invasion]: cannot be determined.", U, CUR, PAT, "cannot be determined"),
    ("Questionable [perineural invasion].", U, CUR, PAT, "Questionable"),
    ("Indeterminate for [dysplasia].", U, CUR, PAT, "Indeterminate for"),
    # -- likely (0.75): LABELS.md "consistent with", "compatible with", "favor", "most likely"
    ("Favor [reactive atypia].", L, CUR, PAT, "Favor"),
    ("Non-small cell carcinoma, favor [adenocarcinoma].", L, CUR, PAT, "favor"),
    ("Findings consistent with [celiac disease].", L, CUR, PAT, "consistent with"),
    ("Compatible with [chronic gastritis].", L, CUR, PAT, "Compatible with"),
    ("Most likely [metastatic colorectal carcinoma].", L, CUR, PAT, "Most likely"),
    ("Probable [carcinoid tumor].", L, CUR, PAT, "Probable"),
    ("[Lymphoma] is favored.", L, CUR, PAT, "favored"),
    ("In keeping with [sessile serrated lesion].", L, CUR, PAT, "In keeping with"),
    ("Highly suspicious for [adenocarcinoma].", L, CUR, PAT, "Highly suspicious for"),
    # -- several triggers: the nearest decides, longer phrases hide shorter ones (practice)
    ("No carcinoma; possible [dysplasia].", U, CUR, PAT, "possible"),
    ("No [carcinoma]; possible dysplasia.", A, CUR, PAT, "No"),
    ("Negative for dysplasia, but [adenocarcinoma] is present.", P, CUR, PAT, None),
    ("No [adenocarcinoma] identified, high-grade PIN present.", A, CUR, PAT, "No"),
    ("No adenocarcinoma identified, [high-grade PIN] present.", P, CUR, PAT, None),
    ("No dysplasia, positive for [Helicobacter pylori].", P, CUR, PAT, None),
    ("Negative for [carcinoma] (see comment).", A, CUR, PAT, "Negative for"),
    ("Benign tissue (no [carcinoma]), adenocarcinoma elsewhere.", A, CUR, PAT, "no"),
    ("Benign tissue (no carcinoma), [adenocarcinoma] elsewhere.", P, CUR, PAT, None),
    ("Review of outside slides (not available here) confirms [adenocarcinoma].", P, CUR, PAT, None),
    ("No tumor seen. [Adenocarcinoma] in part B.", P, CUR, PAT, None),
    ("Gram negative [bacilli] are present.", P, CUR, PAT, None),
    ("No change in [dysplasia] compared to the earlier biopsy.", P, CUR, PAT, None),
    ("Not only [dysplasia] but also carcinoma.", P, CUR, PAT, None),
    ("[Non-small cell carcinoma], not otherwise specified.", P, CUR, PAT, None),
    (
        "Non-small cell carcinoma, not otherwise specified; [squamous cell carcinoma] not favored.",
        UL,
        CUR,
        PAT,
        "not favored",
    ),
    # named entities and report furniture that look like triggers (practice)
    ("[Atypical squamous cells] of undetermined significance.", P, CUR, PAT, None),
    ("Smooth muscle [tumor] of uncertain malignant potential.", P, CUR, PAT, None),
    ("No. of [lymph nodes] examined: 12.", P, CUR, PAT, None),
    ("[Adenocarcinoma], most likely of pulmonary origin.", P, CUR, PAT, None),
    ("[Lymphovascular invasion]: not assessed.", U, CUR, PAT, "not assessed"),
    ("[Invasion] is not entirely excluded.", U, CUR, PAT, "not entirely excluded"),
    # a negated extension negates the structure it does not reach (practice)
    ("Carcinoma does not extend to the inked [margin].", A, CUR, PAT, "not"),
    ("[Carcinoma] does not extend to the inked margin.", P, CUR, PAT, None),
    # -- historical: ConText temporality, "history of", "prior", "s/p" (from memory)
    ("History of [colon adenocarcinoma].", P, HIST, PAT, "History of"),
    (
        "Patient with a history of [Barrett esophagus], surveillance biopsy.",
        P,
        HIST,
        PAT,
        "history of",
    ),
    ("Status post [radical prostatectomy].", P, HIST, PAT, "Status post"),
    ("S/p [lumpectomy] for ductal carcinoma in situ.", P, HIST, PAT, "S/p"),
    ("Previously diagnosed [adenocarcinoma].", P, HIST, PAT, "Previously"),
    ("Prior [biopsy] showed tubular adenoma.", P, HIST, PAT, "Prior"),
    ("Known [Crohn disease].", P, HIST, PAT, "Known"),
    ("[Breast carcinoma] treated in the past.", P, HIST, PAT, "in the past"),
    ("[Cervical conization] three years ago.", P, HIST, PAT, "ago"),
    ("Past medical history: [hypertension], diabetes.", P, HIST, PAT, "Past medical history"),
    ("History of colon cancer, presents with [rectal bleeding].", P, CUR, PAT, None),
    ("Previous biopsy showed adenoma, current biopsy shows [carcinoma].", P, CUR, PAT, None),
    ("[Rash] started two days ago.", P, CUR, PAT, None),
    # a clinical-history heading names the indication, not a past illness (practice)
    ("Clinical history: [rectal mass].", P, CUR, PAT, None),
    ("Status post chemotherapy; [residual carcinoma] present.", P, CUR, PAT, None),
    ("No history of [inflammatory bowel disease].", A, HIST, PAT, "history of"),
    # -- hypothetical: ConText "rule out", "to exclude", "if", "evaluate for" (from memory)
    ("Rule out [celiac disease].", P, HYP, PAT, "Rule out"),
    ("R/O [lymphoma].", P, HYP, PAT, "R/O"),
    ("Biopsy to exclude [Barrett esophagus].", P, HYP, PAT, "to exclude"),
    ("Evaluate for [Helicobacter pylori].", P, HYP, PAT, "Evaluate for"),
    ("If [dysplasia] is present, repeat colonoscopy is advised.", P, HYP, PAT, "If"),
    ("Screening for [colorectal cancer].", P, HYP, PAT, "Screening for"),
    ("Clinical: r/o [malignancy].", P, HYP, PAT, "r/o"),
    ("Rule out malignancy; [chronic inflammation] present.", P, CUR, PAT, None),
    # "cannot rule out" is a hedge about this patient now, not a request
    ("Cannot rule out [lymphoma].", U, CUR, PAT, "Cannot rule out"),
    # -- experiencer: ConText "family history of", relatives (from memory)
    ("Family history of [colorectal cancer].", P, HIST, OTH, "Family history of"),
    ("Mother had [breast cancer].", P, CUR, OTH, "Mother"),
    ("[Ovarian carcinoma] in her sister.", P, CUR, OTH, "sister"),
    ("Her mother's [breast cancer] was treated surgically.", P, CUR, OTH, "mother"),
    ("FH: [Lynch syndrome].", P, HIST, OTH, "FH"),
    ("Family history of colon cancer; [tubular adenoma] in the patient.", P, CUR, PAT, None),
    (
        "Family history of colon cancer (father) and a personal history of [adenomatous polyps].",
        P,
        HIST,
        PAT,
        "history of",
    ),
    # "the patient's" does not end a relative's scope
    ("[Colon cancer] in the patient's father.", P, CUR, OTH, "father"),
]


@pytest.mark.parametrize(("sentence", "certainty", "temporality", "experiencer", "trigger"), CASES)
def test_pathology_sentence(
    sentence: str, certainty: str, temporality: str, experiencer: str, trigger: str | None
) -> None:
    text, spans = marked(sentence)
    assert len(spans) == 1
    (a,) = ENGINE.assess(text, spans)
    assert (a.certainty, a.temporality, a.experiencer) == (certainty, temporality, experiencer)
    texts = [h.text for h in a.triggers]
    if trigger is None:
        assert texts == []
    else:
        assert trigger in texts
    for h in a.triggers:
        # evidence points at exact offsets into the original text
        assert text[h.start : h.end] == h.text
        assert h.category in (a.certainty, a.temporality, a.experiencer)


def test_table_is_large_and_covers_every_state() -> None:
    assert len(CASES) >= 100
    assert {c[1] for c in CASES} == {P, L, U, UL, A}
    assert {c[2] for c in CASES} == {CUR, HIST, HYP}
    assert {c[3] for c in CASES} == {PAT, OTH}


# -- lists and conjunctions: one trigger, several mentions -------------------------------


@pytest.mark.parametrize(
    ("sentence", "expected"),
    [
        ("Negative for [high-grade dysplasia] and [malignancy].", [A, A]),
        ("[Tubular adenoma]; negative for [high-grade dysplasia].", [P, A]),
        ("No [carcinoma] or [dysplasia] identified.", [A, A]),
        ("No [polyps], [masses] or [ulcers].", [A, A, A]),
        ("[Lymphovascular invasion] and [perineural invasion] are not identified.", [A, A]),
        ("No [carcinoma]; [tubular adenoma] present.", [A, P]),
        ("No [carcinoma]; possible [dysplasia]; consistent with [adenoma].", [A, U, L]),
        ("[HSIL] (CIN 2); negative for [invasive carcinoma].", [P, A]),
        ("Negative for [dysplasia] and [malignancy]; [Helicobacter pylori] present.", [A, A, P]),
    ],
)
def test_lists_and_conjunctions(sentence: str, expected: list[str]) -> None:
    _, results = assess_marked(sentence)
    assert [a.certainty for a in results] == expected


# -- sentence and section/part boundaries -------------------------------------------


def test_boundary_stops_a_negation() -> None:
    # no period, no blank line: only the part boundary separates the two lines
    text, spans = marked("negative for dysplasia or\n[adenocarcinoma] in the second core")
    assert ENGINE.assess(text, spans)[0].certainty == A
    cut = text.index("adenocarcinoma")
    a = ENGINE.assess(text, spans, boundaries=[cut])[0]
    assert (a.certainty, a.triggers) == (P, ())


def test_boundary_stops_a_backward_trigger() -> None:
    text, spans = marked("[Adenocarcinoma]\nnot identified in part B")
    assert ENGINE.assess(text, spans)[0].certainty == A
    cut = text.index("not")
    assert ENGINE.assess(text, spans, boundaries=[cut])[0].certainty == P


def test_parts_and_sections() -> None:
    sentence = (
        "FINAL DIAGNOSIS:\nA. Colon, sigmoid, biopsy: negative for [dysplasia]\n"
        "B. Colon, rectum, biopsy: [adenocarcinoma]\n"
        "COMMENT: rule out [Lynch syndrome]"
    )
    text, spans = marked(sentence)
    cuts = [text.index("A. Colon"), text.index("B. Colon"), text.index("COMMENT")]
    results = ENGINE.assess(text, spans, boundaries=cuts)
    assert [(a.certainty, a.temporality) for a in results] == [(A, CUR), (P, CUR), (P, HYP)]


@pytest.mark.parametrize(
    ("sentence", "certainty"),
    [
        # a period ends a sentence
        ("No carcinoma. [Adenoma] present.", P),
        # a blank line ends a sentence
        ("No carcinoma\n\n[Adenoma] in the second fragment", P),
        # line-initial list markers end a sentence
        ("- No carcinoma\n- [Adenoma]", P),
        ("1. No carcinoma\n2. [Adenoma]", P),
        ("(a) No carcinoma\n(b) [Adenoma]", P),
        # a line-initial heading ends a sentence
        ("No polyps\nMICROSCOPIC: [adenoma] fragments", P),
        # a semicolon ends a sentence (the lexicon's "break" row)
        ("No carcinoma; [adenoma]", P),
        # abbreviations and a following lowercase word keep the sentence going
        ("Seen by Dr. Fictional, no [dysplasia].", A),
        ("No carcinoma, approx. 3 mm of [dysplasia]", A),
        ("No carcinoma e.g. [invasion]", A),
        # decimals are not sentence ends
        ("No carcinoma in the 2.5 cm [polyp]", A),
    ],
)
def test_sentence_splitting(sentence: str, certainty: str) -> None:
    _, (a,) = assess_marked(sentence)
    assert a.certainty == certainty


def test_trigger_offsets_point_into_the_original_text() -> None:
    text = "A. Colon, biopsy:\n   No  evidence\n   of [dysplasia]."
    clean, spans = marked(text)
    (a,) = ENGINE.assess(clean, spans)
    (hit,) = a.triggers
    assert hit.text == "No  evidence\n   of"
    assert clean[hit.start : hit.end] == hit.text
    assert hit.category == A


def test_several_axes_report_several_triggers() -> None:
    clean, spans = marked("Family history of possible [Lynch syndrome].")
    (a,) = ENGINE.assess(clean, spans)
    assert (a.certainty, a.temporality, a.experiencer) == (U, HIST, OTH)
    assert [h.start for h in a.triggers] == sorted(h.start for h in a.triggers)
    assert {h.category for h in a.triggers} == {U, HIST, OTH}


def test_empty_and_bad_spans() -> None:
    assert ENGINE.assess("No carcinoma.", []) == []
    with pytest.raises(InputError, match="outside the text"):
        ENGINE.assess("No carcinoma.", [(3, 99)])


def test_results_follow_span_order() -> None:
    text, spans = marked("[Adenoma]; no [carcinoma]; possible [dysplasia].")
    forward = [a.certainty for a in ENGINE.assess(text, spans)]
    backward = [a.certainty for a in ENGINE.assess(text, spans[::-1])]
    assert forward == [P, A, U]
    assert backward == forward[::-1]


def test_non_ascii_text_keeps_offsets() -> None:
    # "İ" lower-cases to two characters: offsets must stay those of the original
    text, spans = marked("İleum: no [granulomas]; café-au-lait [macule] present.")
    a, b = ENGINE.assess(text, spans)
    assert a.certainty == A and text[a.triggers[0].start : a.triggers[0].end] == "no"
    assert b.certainty == P
