"""Plain negations agree with the reference NegEx implementation (negspacy, en_clinical).

negspacy's ``negex`` component implements NegEx (Chapman et al., J Biomed Inform
2001); on sentences whose only trigger is in its ``en_clinical`` termset, a
mention it calls negated must be ``absent`` here and one it leaves alone must
not be.  Sentences are invented.
"""

from __future__ import annotations

import pytest

from pathsieve.assertion import AssertionEngine

spacy = pytest.importorskip("spacy")
pytest.importorskip("negspacy")

SENTENCES = [
    "No [carcinoma] is identified.",
    "Negative for [high-grade dysplasia].",
    "No evidence of [invasive carcinoma].",
    "Margins free of [tumor].",
    "Gastric mucosa without [intestinal metaplasia].",
    "Absence of [Helicobacter pylori] organisms.",
    "The patient denies [rectal bleeding].",
    "The patient has never had [colitis].",
    "[Myocardial infarction] was ruled out.",
    "There is not any [granuloma] in the sections.",
    "[Tubular adenoma] with low-grade dysplasia.",
    "Fragments of [sessile serrated lesion].",
    "[Invasive ductal carcinoma], grade 2.",
    "Gram negative [bacilli] in the exudate.",
    "No [dysplasia] but [adenocarcinoma] in the deeper levels.",
]


@pytest.fixture(scope="module")
def negex():
    from negspacy.negation import Negex  # noqa: F401  (registers the factory)
    from negspacy.termsets import termset

    nlp = spacy.blank("en")
    nlp.add_pipe("sentencizer")
    nlp.add_pipe("negex", config={"neg_termset": termset("en_clinical").get_patterns()})
    return nlp


def spans_of(sentence: str) -> tuple[str, list[tuple[int, int]]]:
    text = sentence.replace("[", "").replace("]", "")
    spans, shift = [], 0
    for i, ch in enumerate(sentence):
        if ch == "[":
            start = i - shift
            shift += 1
        elif ch == "]":
            spans.append((start, i - shift))
            shift += 1
    return text, spans


@pytest.mark.parametrize("sentence", SENTENCES)
def test_negation_matches_negspacy(negex, sentence: str) -> None:
    text, spans = spans_of(sentence)
    ours = [a.certainty == "absent" for a in AssertionEngine.load().assess(text, spans)]
    doc = negex.make_doc(text)
    doc.ents = [doc.char_span(s, e, label="FINDING") for s, e in spans]
    for _, proc in negex.pipeline:
        doc = proc(doc)
    theirs = [bool(ent._.negex) for ent in doc.ents]
    assert ours == theirs
