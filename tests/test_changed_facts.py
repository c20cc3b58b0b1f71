"""Changes of meaning inside a passage: changed facts, rewording and cosmetic edits.

The end-to-end checks run on lessons generated here by construction (templates on heat pumps
and home heating, deterministic), of 300 to 20,000 words, written as Markdown, DOCX
(python-docx) and PDF (fpdf2). What changed between the two versions is planted, so each
check knows exactly what must be found and where:

- each kind of changed fact, planted in one sentence of its own paragraph, is found, located
  in both versions and shown with its changed words marked;
- each kind of cosmetic edit leaves the content matched;
- a clause added to an otherwise unchanged paragraph is found;
- a one-word change in a three-word list item is one changed word, not a rewritten passage.

The classification rules themselves (docs/comparison.md, "Changes inside a passage") are
checked on single passages, and the edit distance of the typo rule against jellyfish's
Damerau–Levenshtein distance.
"""

from __future__ import annotations

import random
from collections.abc import Callable, Sequence
from pathlib import Path

import pytest

from matcheck.api import Version, compare_versions, read_version
from matcheck.compare.alignment import Pair
from matcheck.compare.content import build_model, compare_content
from matcheck.compare.edits import Classifier, EditClass, Fact, PairEdits, side
from matcheck.compare.wordclasses import american, edit_distance, normalise, number_value
from matcheck.findings import EvidenceKind, Finding, Report, Status
from matcheck.language.analysis import analyze
from matcheck.language.words import iter_words
from matcheck.measures.key_terms import Passage
from matcheck.model import Location

# --- generated lessons -------------------------------------------------------------------

TOPICS = {
    "Heat pumps": ["heat pump", "compressor", "outdoor unit", "coil", "fan", "defrost cycle"],
    "Radiators": ["radiator", "bleed key", "valve", "pipe", "thermostat", "balancing"],
    "Hot water": ["cylinder", "immersion heater", "timer", "tap", "mixing valve", "insulation"],
    "Controls": ["room sensor", "schedule", "app", "setback", "display", "weather curve"],
}
VERBS = ["checks", "warms", "guides", "protects", "feeds", "steadies", "cools", "serves"]
OPENERS = ["In most homes", "In spring", "On newer systems", "When in doubt", "Each autumn"]
TEMPLATES = (
    "{opener}, the {a} usually {verb} the {b}, so look at it first.",
    "A tidy {a} {verb} the {b} better than people expect.",
    "If the {a} {verb} the {b}, write down what you changed and when.",
    "The {a} and the {b} are worth checking together, because each {verb} the other.",
)

Paragraph = list[str]
Lesson = list[tuple[str, list[Paragraph]]]


def make_lesson(total_words: int, seed: int = 3) -> Lesson:
    """Sections of paragraphs (lists of sentences), about ``total_words`` words in all."""
    rng = random.Random(seed)
    sections: Lesson = []
    count = part = 0
    while count < total_words:
        topic = list(TOPICS)[part % len(TOPICS)]
        paragraphs = []
        for _ in range(rng.randint(2, 3)):
            sentences = []
            for _ in range(rng.randint(3, 5)):
                a, b = rng.sample(TOPICS[topic], 2)
                text = rng.choice(TEMPLATES).format(
                    opener=rng.choice(OPENERS), a=a, b=b, verb=rng.choice(VERBS)
                )
                sentences.append(text[0].upper() + text[1:])
            paragraphs.append(sentences)
            count += sum(len(s.split()) for s in sentences)
        sections.append((f"{topic} {part // len(TOPICS) + 1}", paragraphs))
        part += 1
    return sections


def plant(lesson: Lesson, sentences: Sequence[str]) -> tuple[Lesson, list[str]]:
    """Each sentence as the second sentence of its own paragraph, spread over the lesson;
    returns the lesson and the heading of the section each sentence stands in."""
    slots = [(s, p) for s, (_, paragraphs) in enumerate(lesson) for p in range(len(paragraphs))]
    step = len(slots) / (len(sentences) + 1)
    out = [(heading, [list(p) for p in paragraphs]) for heading, paragraphs in lesson]
    headings = []
    for k, sentence in enumerate(sentences):
        s, p = slots[int((k + 1) * step)]
        out[s][1][p].insert(1, sentence)
        headings.append(out[s][0])
    return out, headings


def render_md(lesson: Lesson, path: Path, items: Sequence[str] = ()) -> None:
    lines = ["# Looking after home heating", ""]
    for heading, paragraphs in lesson:
        lines += [f"## {heading}", ""]
        for paragraph in paragraphs:
            lines += [" ".join(paragraph), ""]
    lines += [f"- {item}" for item in items]
    path.write_text("\n".join(lines) + "\n", encoding="utf-8")


def render_docx(lesson: Lesson, path: Path, items: Sequence[str] = ()) -> None:
    from docx import Document

    document = Document()
    document.add_heading("Looking after home heating", level=1)
    for heading, paragraphs in lesson:
        document.add_heading(heading, level=2)
        for paragraph in paragraphs:
            document.add_paragraph(" ".join(paragraph))
    for item in items:
        document.add_paragraph(item, style="List Bullet")
    document.save(str(path))


def render_pdf(lesson: Lesson, path: Path, items: Sequence[str] = ()) -> None:
    from fpdf import FPDF

    pdf = FPDF(unit="mm", format="A4")
    pdf.set_margins(20, 20, 20)
    pdf.set_auto_page_break(True, margin=20)
    pdf.add_page()
    pdf.set_font("helvetica", "B", 18)
    pdf.multi_cell(0, 9, "Looking after home heating", new_x="LMARGIN", new_y="NEXT")
    for heading, paragraphs in lesson:
        if pdf.get_y() > pdf.page_break_trigger - 30:
            pdf.add_page()  # keep a heading with its section
        pdf.set_font("helvetica", "B", 14)
        pdf.multi_cell(0, 7, heading, new_x="LMARGIN", new_y="NEXT")
        pdf.ln(2)
        pdf.set_font("helvetica", "", 11)
        for paragraph in paragraphs:
            pdf.multi_cell(0, 5.5, " ".join(paragraph), new_x="LMARGIN", new_y="NEXT")
            pdf.ln(3)
    for item in items:
        pdf.set_x(pdf.l_margin + 4)
        pdf.cell(7, 5.5, chr(149))
        pdf.multi_cell(0, 5.5, item, new_x="LMARGIN", new_y="NEXT")
    pdf.output(str(path))


RENDER: dict[str, Callable[[Lesson, Path, Sequence[str]], None]] = {
    "md": render_md,
    "docx": render_docx,
    "pdf": render_pdf,
}
# 20,000 words in DOCX and PDF take several seconds to write and read: slow runs.
CASES = [
    pytest.param(words, fmt, marks=[pytest.mark.slow] if words > 5000 and fmt != "md" else [])
    for words in (300, 2_000, 20_000)
    for fmt in ("md", "docx", "pdf")
]


def compare(
    tmp_path: Path,
    fmt: str,
    reference: Lesson,
    version: Lesson,
    items: tuple[Sequence[str], Sequence[str]] = ((), ()),
) -> Report:
    a, b = tmp_path / f"a.{fmt}", tmp_path / f"b.{fmt}"
    RENDER[fmt](reference, a, items[0])
    RENDER[fmt](version, b, items[1])
    return compare_versions([Version("a", (a,)), Version("b", (b,))])


def finding(report: Report, dimension: str) -> Finding:
    return next(f for f in report.findings if f.dimension == dimension)


# --- each kind of changed fact ----------------------------------------------------------

# (reference sentence, changed sentence, evidence kind, marked in reference, marked in
# version). Latin-1 only, so that fpdf2's core fonts can write every one into a PDF.
FACTS = (
    (
        "For each unit of electricity the pump delivers three to four units of heat.",
        "For each unit of electricity the pump delivers two to three units of heat.",
        EvidenceKind.NUMBER_CHANGED,
        "«three to four»",
        "«two to three»",
    ),
    (
        "Bleed each radiator for 15 seconds until water appears.",
        "Bleed each radiator for 45 seconds until water appears.",
        EvidenceKind.NUMBER_CHANGED,
        "«15 seconds»",
        "«45 seconds»",
    ),
    (
        "Keep the indoor humidity near 45% in winter.",
        "Keep the indoor humidity near 60% in winter.",
        EvidenceKind.NUMBER_CHANGED,
        "«45%»",
        "«60%»",
    ),
    (
        "Fill the expansion vessel to 3/4 of its height.",
        "Fill the expansion vessel to 1/2 of its height.",
        EvidenceKind.NUMBER_CHANGED,
        "«3/4»",
        "«1/2»",
    ),
    (
        "Set the flow temperature to 45 °C for radiators.",
        "Set the flow temperature to 45 °F for radiators.",
        EvidenceKind.UNIT_CHANGED,
        "«45 °C»",
        "«45 °F»",
    ),
    (
        "Let the system rest for ten minutes after a restart.",
        "Let the system rest for ten hours after a restart.",
        EvidenceKind.UNIT_CHANGED,
        "«ten minutes»",
        "«ten hours»",
    ),
    (
        "The outdoor fan does not affect the result on mild days.",
        "The outdoor fan also affects the result on mild days.",
        EvidenceKind.NEGATION_CHANGED,
        "«does not affect»",
        "«also affects»",
    ),
    (
        "You can't reset the controller without the code.",
        "You can reset the controller without the code.",
        EvidenceKind.NEGATION_CHANGED,
        # "can't" is "can not": the negation is cut, shown with the word before it.
        "«can't»",
        "«can»",
    ),
    (
        "A higher flow temperature lowers the efficiency of the system.",
        "A lower flow temperature lowers the efficiency of the system.",
        EvidenceKind.COMPARISON_CHANGED,
        "«higher»",
        "«lower»",
    ),
    (
        "Clean the filter before the heating season starts.",
        "Clean the filter after the heating season starts.",
        EvidenceKind.COMPARISON_CHANGED,
        "«before»",
        "«after»",
    ),
    (
        "The installer registers the system with Norvent for the warranty.",
        "The installer registers the system with Calorix for the warranty.",
        EvidenceKind.TERM_SWAPPED,
        "«Norvent»",
        "«Calorix»",
    ),
    (
        "Most new systems hold the refrigerant R32 in a sealed circuit.",
        "Most new systems hold the refrigerant R290 in a sealed circuit.",
        EvidenceKind.TERM_SWAPPED,
        "«R32»",
        "«R290»",
    ),
)


@pytest.mark.parametrize(("words", "fmt"), CASES)
def test_each_kind_of_changed_fact_is_found_located_and_marked(
    tmp_path: Path, words: int, fmt: str
) -> None:
    lesson = make_lesson(words)
    reference, headings = plant(lesson, [fact[0] for fact in FACTS])
    version, _ = plant(lesson, [fact[1] for fact in FACTS])
    report = compare(tmp_path, fmt, reference, version)
    facts = finding(report, "facts_changed")
    assert facts.status is Status.DIFFERS
    # By construction: one changed fact per planted sentence, nothing else changed.
    assert facts.difference == len(FACTS)
    assert len(facts.evidence) == len(FACTS)
    for (_, _, kind, marked_a, marked_b), heading in zip(FACTS, headings, strict=True):
        [evidence] = [e for e in facts.evidence if marked_a in e.text]
        assert evidence.kind is kind
        assert marked_b in evidence.counterpart_text
        assert evidence.condition == "a"
        assert evidence.location is not None and evidence.location.section == heading
        assert evidence.counterpart is not None and evidence.counterpart.section == heading
    # Nothing else is content: no passage rewritten, none reworded.
    assert finding(report, "passages_rewritten").difference == 0
    assert finding(report, "passages_reworded").difference == 0


# --- each kind of cosmetic edit -----------------------------------------------------------

# (reference, edited, formats): quote and dash styles outside Latin-1 only where the format
# can carry them (fpdf2's core fonts cannot).
COSMETIC = (
    ("Check the outdoor unit for leaves.", "Check the Outdoor Unit for leaves.", "all"),
    ("Once a year, clean the coil gently.", "Once a year clean the coil gently!", "all"),
    (
        "Match the colour of the cable to the centre terminal.",
        "Match the color of the cable to the center terminal.",
        "all",
    ),
    ("Organise the hoses before the visit.", "Organize the hoses before the visit.", "all"),
    (
        "You will recieve a report after the visit.",
        "You will receive a report after the visit.",
        "all",
    ),
    ("The pump does not need any oil.", "The pump doesn't need any oil.", "all"),
    ("Read the e-mail from the installer.", "Read the email from the installer.", "all"),
    (
        "Press the 'reset' button on the display.",
        "Press the \u2018reset\u2019 button on the display.",
        "md docx",
    ),
    (
        "Warm the tank for 5-10 minutes in the morning.",
        "Warm the tank for 5\u201310 minutes in the morning.",
        "md docx",
    ),
)


@pytest.mark.parametrize(("words", "fmt"), CASES)
def test_each_kind_of_cosmetic_edit_leaves_content_matched(
    tmp_path: Path, words: int, fmt: str
) -> None:
    chosen = [(a, b) for a, b, formats in COSMETIC if formats == "all" or fmt in formats]
    lesson = make_lesson(words)
    reference, _ = plant(lesson, [a for a, _ in chosen])
    version, _ = plant(lesson, [b for _, b in chosen])
    report = compare(tmp_path, fmt, reference, version)
    content = [f for f in report.findings if f.group == "content"]
    # By construction two of them are edits judged cosmetic (the typo and the hyphen); the
    # others (case, punctuation, spelling, contraction, quotes, dashes) vanish when folded.
    assert "; 2 cosmetic edits ignored" in finding(report, "passages_reworded").reason
    assert content and all(f.status is Status.MATCHED for f in content), [
        (f.dimension, [e.text for e in f.evidence])
        for f in content
        if f.status is not Status.MATCHED
    ]


# --- a clause added; a list item changed by one word --------------------------------------


@pytest.mark.parametrize(("words", "fmt"), CASES)
def test_clause_added_to_an_unchanged_paragraph_is_found(
    tmp_path: Path, words: int, fmt: str
) -> None:
    # By construction: the same sentence, with a five-word clause (three content words) added
    # in the version. Runs of six words or more with new content were found before; this one
    # is shorter and its words stand elsewhere in the lesson.
    lesson = make_lesson(words)
    reference, headings = plant(lesson, ["Clean the coil of the outdoor unit."])
    version, _ = plant(lesson, ["Clean the coil of the outdoor unit gently with a soft brush."])
    report = compare(tmp_path, fmt, reference, version)
    reworded = finding(report, "passages_reworded")
    assert reworded.status is Status.DIFFERS
    [evidence] = reworded.evidence
    assert evidence.kind is EvidenceKind.TEXT_REWORDED
    # The clause is marked with the word before it, which the reference shows marked alone.
    assert "«unit gently with a soft brush»" in evidence.counterpart_text
    assert "«unit»" in evidence.text
    assert evidence.location is not None and evidence.location.section == headings[0]


ITEMS = ("Book a workshop", "Check the filter", "Note the reading")


@pytest.mark.parametrize("fmt", ["md", "docx", "pdf"])
def test_one_word_changed_in_a_short_list_item_is_one_changed_word(
    tmp_path: Path, fmt: str
) -> None:
    lesson = make_lesson(300)
    changed = ("Book a training", *ITEMS[1:])
    a, b = tmp_path / f"a.{fmt}", tmp_path / f"b.{fmt}"
    RENDER[fmt](lesson, a, ITEMS)
    RENDER[fmt](lesson, b, changed)
    analyses = {
        name: analyze(read_version(Version(name, (path,)))) for name, path in (("a", a), ("b", b))
    }
    content = compare_content(build_model(analyses), "a", "b")
    changed_pairs = [found for found in content.compared if found.edits]
    [found] = changed_pairs
    assert found.short and not found.rewritten and not found.reworded
    assert found.changed_words == 1
    assert [e.kind for e in found.edits] == [EditClass.REWORDED]
    assert content.rewritten == () and content.facts == ()
    report = compare_versions([Version("a", (a,)), Version("b", (b,))])
    assert not [f for f in report.findings if f.group == "content" and f.status is Status.DIFFERS]


# --- the rules on single passages ---------------------------------------------------------


def _passage(text: str) -> Passage:
    return Passage(text, Location(block=0, section="S"), tuple(iter_words(text)), ())


def classify(a: str, b: str, key_terms: frozenset[str] = frozenset(), uses: int = 1) -> PairEdits:
    """The edits of one pair of passages; each word used ``uses`` times in the lessons."""
    from collections import Counter

    left, right = side([_passage(a)]), side([_passage(b)])
    vocabulary = Counter({token: uses for token in (*left.tokens, *right.tokens)})
    classifier = Classifier(key_terms, vocabulary, lambda run, removed: False)
    return classifier.compare(Pair((0,), (0,), 1.0), left, right)


@pytest.mark.parametrize(
    ("a", "b", "fact"),
    [
        ("It takes three to four hours.", "It takes two to three hours.", Fact.NUMBER),
        ("Add 1,200 ml of water.", "Add 1,500 ml of water.", Fact.NUMBER),
        ("Add half a cup.", "Add a quarter of a cup.", Fact.NUMBER),
        ("Fill it to \u00bd of its height.", "Fill it to \u00be of its height.", Fact.NUMBER),
        ("Use the second valve.", "Use the third valve.", Fact.NUMBER),
        ("Wait 5 minutes.", "Wait 5 hours.", Fact.UNIT),
        ("Tighten to 20 Nm.", "Tighten to 20 psi.", Fact.UNIT),
        ("The valve is never opened.", "The valve is opened.", Fact.NEGATION),
        ("It works without power.", "It works with power.", Fact.NEGATION),
        ("Pressure will increase.", "Pressure will decrease.", Fact.COMPARISON),
        ("Use more water.", "Use less water.", Fact.COMPARISON),
    ],
)
def test_changed_fact_classes(a: str, b: str, fact: Fact) -> None:
    found = classify(a, b)
    [edit] = found.edits
    assert edit.kind is EditClass.FACT
    assert fact in edit.facts


def test_key_terms_swapped_are_a_changed_fact_but_plain_words_are_reworded() -> None:
    a, b = "Check the compressor every spring.", "Check the condenser every spring."
    [edit] = classify(a, b, frozenset({"compressor", "condenser"}), uses=3).edits
    assert edit.kind is EditClass.FACT and edit.facts == (Fact.TERM,)
    [edit] = classify(a, b, uses=3).edits  # neither is a key term
    assert edit.kind is EditClass.REWORDED and edit.content_words == 1
    # A key term the lessons use once is no term of the lesson (in a short lesson every
    # word is heavy): a plain substitution.
    [edit] = classify(a, b, frozenset({"compressor", "condenser"}), uses=1).edits
    assert edit.kind is EditClass.REWORDED and edit.content_words == 1


def test_the_same_quantity_in_other_units_is_no_changed_fact() -> None:
    # 20 minutes = 1/3 hour (1,200 s either way; SI: 1 min = 60 s, 1 h = 3,600 s).
    [edit] = classify("Wait about twenty minutes.", "Wait roughly a third of an hour.").edits
    assert edit.kind is EditClass.REWORDED


@pytest.mark.parametrize(
    ("a", "b"),
    [
        ("The Colour Of The Valve", "the colour of the valve"),
        ("“Bleed” the radiator — slowly.", '"Bleed" the radiator - slowly.'),
        ("Centre the aluminium tyre.", "Center the aluminum tire."),
        ("Analyse and organise it.", "Analyze and organize it."),
        ("It doesn't leak.", "It does not leak."),
        ("Use the set-up menu.", "Use the setup menu."),
        # NFKC (Unicode Standard Annex #15) writes ½ as 1⁄2; the fraction slash reads as "/".
        ("Fill it to \u00bd of its height.", "Fill it to 1/2 of its height."),
    ],
)
def test_cosmetic_edits_are_no_difference(a: str, b: str) -> None:
    found = classify(a, b)
    assert all(e.kind is EditClass.COSMETIC for e in found.edits)
    assert found.changed_words == 0 and not found.facts


def test_typo_rule() -> None:
    # A misspelt word used once is a typo fixed; two real words a letter apart that the
    # lessons use more than once are not.
    [edit] = classify("Turn the spidnle slowly.", "Turn the spindle slowly.").edits
    assert edit.kind is EditClass.COSMETIC
    [edit] = classify("Turn the bolt slowly.", "Turn the boot slowly.", uses=3).edits
    assert edit.kind is EditClass.REWORDED


@pytest.mark.parametrize(
    ("a", "b"),
    [
        ("recieve", "receive"),
        ("spidnle", "spindle"),
        ("kitten", "sitting"),  # the classic example: 3 (docs/references.md §24)
        ("valve", "valves"),
        ("thermostat", "thermostats"),
        ("cylinder", "cilynder"),
        ("flow", "glow"),
    ],
)
def test_edit_distance_matches_a_reference_library(a: str, b: str) -> None:
    # Source: jellyfish's Damerau–Levenshtein distance (adjacent transpositions count one, as
    # in Damerau 1964; docs/references.md §24); on these pairs it equals the
    # restricted variant wordclasses.py computes.
    import jellyfish

    assert edit_distance(a, b, limit=5) == jellyfish.damerau_levenshtein_distance(a, b)


def test_number_and_spelling_tables() -> None:
    assert number_value("three") == "3"
    assert number_value("1,200") == "1200"
    assert number_value("3.50") == "3.5"
    # Source: Unicode Character Database, U+00BD has the numeric value 1/2 (docs/references.md
    # §26).
    assert number_value("\u00bd") == "0.5"
    assert number_value("one") is None  # a pronoun or an article as often as a number
    # Common British/American pairs (common practice; the table is in wordclasses.py).
    assert american("colour") == "color" and american("organised") == "organized"
    assert american("prise") == "prise"  # "prize" is another word
    assert normalise("Doesn\u2019t") == ("does", "not")


# --- post-test items see facts --------------------------------------------------------------

FACT_ITEM = """# Post-test

1. How many units of heat does the pump deliver for each unit of electricity?

   Answer: Three to four units of heat.

2. What should you keep the indoor humidity near in winter?

   Answer: Near 45%.
"""


@pytest.mark.parametrize("fmt", ["md", "docx", "pdf"])
def test_post_test_item_whose_fact_is_stated_differently_is_taught_differently(
    tmp_path: Path, fmt: str
) -> None:
    from matcheck.api import check_study
    from matcheck.study import load_study

    # By construction: both versions teach item 1 with the same words but another range;
    # item 2's fact (45%) is stated alike in both.
    lesson = make_lesson(2_000)
    same = "Keep the indoor humidity near 45% in winter."
    reference, _ = plant(lesson, [FACTS[0][0], same])
    version, _ = plant(lesson, [FACTS[0][1], same])
    RENDER[fmt](reference, tmp_path / f"a.{fmt}", ())
    RENDER[fmt](version, tmp_path / f"b.{fmt}", ())
    (tmp_path / "posttest.md").write_text(FACT_ITEM, encoding="utf-8")
    (tmp_path / "study.toml").write_text(
        f"""[study]
reference = "a"

[[conditions]]
name = "a"
files = ["a.{fmt}"]

[[conditions]]
name = "b"
files = ["b.{fmt}"]

[posttest]
files = ["posttest.md"]
""",
        encoding="utf-8",
    )
    report = check_study(load_study(tmp_path / "study.toml"))
    items = {f.item: f for f in report.findings if f.item is not None}
    assert set(items) == {"Q1", "Q2"}
    first, second = items["Q1"], items["Q2"]
    assert first.status is Status.DIFFERS
    assert "taught differently" in first.reason and "3, 4" in first.reason
    [evidence] = first.evidence
    assert evidence.kind is EvidenceKind.ITEM_TAUGHT_DIFFERENTLY
    assert "«three to four»" in evidence.text
    assert "«two to three»" in evidence.counterpart_text
    assert second.status is Status.MATCHED


# --- reports: changed facts first among content findings -----------------------------------

DEMO = Path(__file__).resolve().parent.parent / "fixtures" / "demo"


def test_every_format_shows_changed_facts_first_among_content_findings() -> None:
    import json
    import subprocess
    import sys

    from matcheck.report.github import render_github
    from matcheck.report.json_report import render_json
    from matcheck.report.markdown import render_markdown

    # fixtures/README.md: the confounded version lost a paragraph and states one fact
    # differently; both are content findings that differ.
    pair = [DEMO / "text-only.md", DEMO / "diagrams-confounded.md"]
    report = compare_versions([Version(p.stem, (p,)) for p in pair], manipulated=("figures",))
    dimensions = [f["dimension"] for f in json.loads(render_json(report))["findings"]]
    content = [d for d in dimensions if finding(report, d).group == "content"]
    assert content[0] == "facts_changed" and "passages_removed" in content
    markdown = render_markdown(report)
    assert markdown.index("<code>facts_changed</code>") < markdown.index(
        "<code>passages_removed</code>"
    )
    assert "«five minutes»" in markdown and "«two minutes»" in markdown
    github = render_github(report)
    assert github.index("facts_changed differs") < github.index("passages_removed differs")
    text = subprocess.run(
        [sys.executable, "-m", "matcheck", "compare", *map(str, pair), "-m", "figures"],
        capture_output=True,
        text=True,
        check=False,
    ).stdout
    assert text.index("content · facts_changed") < text.index("content · passages_removed")
    assert "«five minutes»" in text
