"""Post-test items read from CSV, Markdown, DOCX and text; coverage per condition.

Every input is built in the test. Expected items are known by construction (what the test
wrote); expected coverages follow from the smoothed-idf formula of scikit-learn's
``TfidfVectorizer`` (its documentation: idf = ln((1 + n) / (1 + df)) + 1), checked against
the library itself below (docs/references.md §8).
"""

from __future__ import annotations

import codecs
import json
import math
from collections.abc import Sequence
from pathlib import Path

import pytest

from matcheck.compare.assessment import (
    ANSWER_FACTOR,
    DEFAULT_COVERAGE,
    ItemTerms,
    PostTest,
    smoothed_idf,
    unigrams,
)
from matcheck.compare.assessment import (
    assess_posttest as _assess_posttest,
)
from matcheck.compare.assessment import (
    item_terms as _item_terms,
)
from matcheck.errors import ConfigError, InputError
from matcheck.findings import Finding, Status
from matcheck.language.analysis import Analysis, analyze
from matcheck.limits import DEFAULT_LIMITS
from matcheck.measures.key_terms import passages
from matcheck.model import BlockKind, PostTestItem
from matcheck.readers.builder import DocumentBuilder
from matcheck.readers.posttest import items_document, read_posttest

FIXTURES = Path(__file__).resolve().parent.parent / "fixtures" / "demo"


def assess_posttest(
    items: Sequence[PostTestItem],
    analyses: dict[str, Analysis],
    pairs: Sequence[tuple[str, str]],
    **options: float,
) -> tuple[tuple[Finding, ...], tuple[str, ...]]:
    """The comparison as api.check_study calls it: items read, then analysed like lessons."""
    return _assess_posttest(_posttest(items), analyses, pairs, **options)


def _posttest(items: Sequence[PostTestItem]) -> PostTest:
    document, slots = items_document(items)
    return PostTest(tuple(items), analyze(document), slots)


def item_terms(items: Sequence[PostTestItem]) -> list[ItemTerms]:
    posttest = _posttest(items)
    return _item_terms(posttest.items, posttest.analysis, posttest.slots)


def _write(tmp_path: Path, name: str, text: str, *, bom: bool = False) -> Path:
    path = tmp_path / name
    path.write_bytes((codecs.BOM_UTF8 if bom else b"") + text.encode("utf-8"))
    return path


def _read(path: Path) -> list[PostTestItem]:
    return read_posttest(path, DEFAULT_LIMITS)


def _triples(items: Sequence[PostTestItem]) -> list[tuple[str, str, str]]:
    return [(item.id, item.question, item.answer) for item in items]


# --- reading: CSV ------------------------------------------------------------------------


def test_csv_with_bom_mixed_case_headers_key_column_and_quoted_commas(tmp_path: Path) -> None:
    # RFC 4180: a quoted field may hold commas and doubled quotes (docs/references.md §16).
    path = _write(
        tmp_path,
        "test.CSV",
        " ID ,Question,  KEY , points\r\n"
        'C1,"Why grind coffee beans just before brewing, not the day before?",'
        '"Ground coffee loses its aroma within hours",2\r\n'
        'C2,"What is a ""bloom""?",,1\r\n'
        ",,,\r\n",
        bom=True,
    )
    items = _read(path)
    assert _triples(items) == [
        (
            "C1",
            "Why grind coffee beans just before brewing, not the day before?",
            "Ground coffee loses its aroma within hours",
        ),
        ("C2", 'What is a "bloom"?', ""),
    ]
    assert {item.source for item in items} == {"test.CSV"}
    assert all(item.location is None for item in items)


def test_csv_answer_column(tmp_path: Path) -> None:
    path = _write(
        tmp_path, "t.csv", "question,answer,id\nHow hot should the water be?,Just off the boil,W1\n"
    )
    assert _triples(_read(path)) == [("W1", "How hot should the water be?", "Just off the boil")]


@pytest.mark.parametrize(
    ("text", "message"),
    [
        ("id,question\nA1,Why?\n,What?\n", "row 3 has an empty id"),
        ("id,question\nA1,Why?\nA2, \n", "row 3 has an empty question"),
        ("id,question\nA1,Why?\nA1,What?\n", "'A1' is used twice (row 2 and row 3)"),
        ("id,answer\nA1,Yes\n", "no question column"),
        ("id,question,answer,key\nA1,Why?,a,b\n", "both an answer and a key column"),
        ("id,question\n", "no post-test items found"),
    ],
)
def test_csv_errors_name_the_problem(tmp_path: Path, text: str, message: str) -> None:
    path = _write(tmp_path, "t.csv", text)
    with pytest.raises(ConfigError) as caught:
        _read(path)
    assert message in str(caught.value)
    assert str(caught.value).startswith(str(path))


def test_missing_file_is_an_input_error(tmp_path: Path) -> None:
    for name in ("none.csv", "none.md"):
        with pytest.raises(InputError, match="no such file"):
            _read(tmp_path / name)


# --- reading: documents ------------------------------------------------------------------

MARKDOWN = """# Post-test

Answer every question in a sentence or two.

1. Why do you pour a little water on the grounds first?

   Answer: The grounds release gas, and the rest of the water then extracts evenly.

2. What does a burr grinder give you?

   Key: Particles of one size.

3. Why clean the kettle every week?
"""


def test_markdown_numbered_list_with_answer_paragraphs(tmp_path: Path) -> None:
    items = _read(_write(tmp_path, "post.md", MARKDOWN))
    # By construction: three list items, two followed by a labelled answer; the instruction
    # paragraph is neither.
    assert _triples(items) == [
        (
            "Q1",
            "Why do you pour a little water on the grounds first?",
            "The grounds release gas, and the rest of the water then extracts evenly.",
        ),
        ("Q2", "What does a burr grinder give you?", "Particles of one size."),
        ("Q3", "Why clean the kettle every week?", ""),
    ]
    assert items[1].location is not None and items[1].location.line == 9


def test_stated_ids_in_paragraphs_and_text_with_inline_answers(tmp_path: Path) -> None:
    text = (
        "Q4. How fine should the grind be for a stovetop pot?\n"
        "Answer: Like table salt.\n\n"
        "Question 7: When should you stop the brew?\n\nKey: When it starts to gurgle.\n\n"
        "5) Which beans suit espresso?\n\n"
        "This paragraph is an instruction, not an item.\n"
    )
    items = _read(_write(tmp_path, "post.txt", text))
    assert _triples(items) == [
        ("Q4", "How fine should the grind be for a stovetop pot?", "Like table salt."),
        ("Q7", "When should you stop the brew?", "When it starts to gurgle."),
        ("Q5", "Which beans suit espresso?", ""),
    ]


def test_docx_list_number_items_with_answers(tmp_path: Path) -> None:
    import docx

    document = docx.Document()
    document.add_heading("Post-test", level=1)
    document.add_paragraph("Why let the grounds bloom?", style="List Number")
    document.add_paragraph("Answer: Trapped gas escapes before brewing.")
    document.add_paragraph("Which grinder gives even particles?", style="List Number")
    document.add_paragraph("a blade grinder", style="List Number 2")  # an option, not read
    document.add_paragraph("Key: A burr grinder.", style="List Number 2")
    path = tmp_path / "post.docx"
    document.save(str(path))
    assert _triples(_read(path)) == [
        ("Q1", "Why let the grounds bloom?", "Trapped gas escapes before brewing."),
        ("Q2", "Which grinder gives even particles?", "A burr grinder."),
    ]


@pytest.mark.parametrize(
    ("name", "text", "message"),
    [
        ("a.md", "# Post-test\n\nSome instructions only.\n", "no post-test items found"),
        ("b.md", "1. Why?\n2. Q1. What?\n", "'Q1' is used twice"),
        ("c.md", "Answer: too early\n\n1. Why?\n", "comes before any question"),
        ("d.txt", "Q2.\n\nAnswer: nothing asked\n", "has no question text"),
    ],
)
def test_document_errors(tmp_path: Path, name: str, text: str, message: str) -> None:
    with pytest.raises(ConfigError) as caught:
        _read(_write(tmp_path, name, text))
    assert message in str(caught.value)
    if "no post-test items" in message:
        assert caught.value.hint and "Answer:" in caught.value.hint


# --- coverage ----------------------------------------------------------------------------

OPENING = (
    "Good coffee starts with fresh beans. Buy whole beans in small bags and keep them in a "
    "sealed jar away from light."
)
BLOOM = (
    "Pour a little hot water over the grounds and wait thirty seconds. The grounds swell and "
    "release gas, a step called the bloom, which lets the rest of the water extract the "
    "flavour evenly."
)
GRINDER = (
    "Grind the beans just before brewing. A burr grinder makes particles of one size, while a "
    "blade grinder chops them unevenly."
)
KETTLE = "Clean the kettle and the filter holder every week, because old oils turn bitter."

BLOOM_ITEM = PostTestItem(
    "Q1",
    "What is the bloom, and why does it help?",
    "Hot water poured on the grounds releases gas, so the rest of the water extracts the "
    "flavour evenly.",
    "post.md",
    None,
)
GRINDER_ITEM = PostTestItem(
    "Q2", "Which grinder makes particles of one size?", "A burr grinder.", "post.md", None
)
TEA_ITEM = PostTestItem(
    "Q3", "How many minutes should green tea steep?", "Two minutes.", "post.md", None
)


def _lesson(name: str, paragraphs: Sequence[str]) -> Analysis:
    builder = DocumentBuilder(f"{name}.md", "markdown")
    builder.add_block(BlockKind.HEADING, "Brewing Coffee", level=1)
    for text in paragraphs:
        builder.add_block(BlockKind.PARAGRAPH, text)
    return analyze(builder.build())


def _by_item(findings: Sequence[Finding]) -> dict[str, Finding]:
    return {finding.item or "": finding for finding in findings}


def test_item_whose_teaching_paragraph_is_missing_differs(tmp_path: Path) -> None:
    analyses = {
        "full": _lesson("full", [OPENING, BLOOM, GRINDER, KETTLE]),
        "cut": _lesson("cut", [OPENING, GRINDER, KETTLE]),
    }
    findings, warnings = assess_posttest([BLOOM_ITEM, GRINDER_ITEM], analyses, [("full", "cut")])
    found = _by_item(findings)
    assert set(found) == {"Q1", "Q2"}
    bloom = found["Q1"]
    assert bloom.status is Status.DIFFERS
    assert bloom.group == "assessment" and bloom.unit == "share"
    assert bloom.reason == "Q1 is taught in full but not in cut"
    assert bloom.values["full"] is not None and bloom.values["full"] >= DEFAULT_COVERAGE
    assert bloom.values["cut"] is not None and bloom.values["cut"] < DEFAULT_COVERAGE
    assert bloom.difference == pytest.approx(bloom.values["cut"] - bloom.values["full"])
    assert bloom.tolerance is not None and bloom.tolerance.absolute == 0.10
    taught, not_taught = bloom.evidence
    assert taught.kind == "item_taught" and taught.condition == "full"
    # By construction the bloom paragraph is body paragraph 2 of "full".
    assert taught.location is not None and taught.location.paragraph == 2
    assert taught.text.startswith("Pour a little hot water")
    assert not_taught.kind == "item_not_taught" and not_taught.condition == "cut"
    assert not_taught.text == BLOOM_ITEM.question
    # Words only the bloom paragraph holds are missing from "cut".
    for term in ("bloom", "gas", "flavour"):
        assert term in not_taught.counterpart_text
    assert found["Q2"].status is Status.MATCHED
    assert found["Q2"].reason == "taught in both"
    assert warnings == ()


def test_identical_conditions_match_on_every_item() -> None:
    paragraphs = [OPENING, BLOOM, GRINDER, KETTLE]
    analyses = {"a": _lesson("a", paragraphs), "b": _lesson("b", paragraphs)}
    findings, _ = assess_posttest([BLOOM_ITEM, GRINDER_ITEM, TEA_ITEM], analyses, [("a", "b")])
    assert len(findings) == 3
    assert all(f.status is Status.MATCHED and f.difference == 0 for f in findings)
    assert all(not f.evidence for f in findings)


def test_item_no_condition_teaches_is_a_warning() -> None:
    analyses = {
        "a": _lesson("a", [OPENING, BLOOM]),
        "b": _lesson("b", [OPENING, GRINDER]),
        "c": _lesson("c", [OPENING, KETTLE]),
    }
    findings, warnings = assess_posttest(
        [TEA_ITEM, GRINDER_ITEM], analyses, [("a", "b"), ("a", "c")]
    )
    assert warnings == (
        "post-test item Q3 (How many minutes should green tea steep?) is taught in no "
        "condition: the test asks for what no version teaches",
    )
    tea = [f for f in findings if f.item == "Q3"]
    assert [f.reason for f in tea] == ["taught in neither", "taught in neither"]
    grinder = {f.condition: f for f in findings if f.item == "Q2"}
    # Taught in b only: a-b differs (b teaches it), a-c matches (neither does).
    assert grinder["b"].status is Status.DIFFERS
    assert grinder["b"].reason == "Q2 is taught in b but not in a"
    assert grinder["b"].evidence[0].condition == "b"
    assert grinder["c"].status is Status.MATCHED


def test_smoothed_idf_matches_scikit_learn() -> None:
    from sklearn.feature_extraction.text import TfidfVectorizer

    analyses = [_lesson("a", [OPENING, BLOOM, GRINDER]), _lesson("b", [GRINDER, KETTLE])]
    docs = [sorted(unigrams(unit)) for analysis in analyses for unit in passages(analysis)]
    vectorizer = TfidfVectorizer(analyzer=lambda terms: terms, lowercase=False)
    vectorizer.fit(docs)
    for term, idf in zip(vectorizer.get_feature_names_out(), vectorizer.idf_, strict=True):
        df = sum(term in doc for doc in docs)
        assert smoothed_idf(len(docs), df) == pytest.approx(idf)


def test_common_terms_weigh_less_than_distinctive_ones() -> None:
    # Five passages in all; "coffee" is in each, "bloom" in one (n = 5, df = 5 and 1).
    analyses = {
        "a": _lesson("a", ["Coffee bloom.", "Coffee grinder.", "Coffee kettle."]),
        "b": _lesson("b", ["Coffee grinder.", "Coffee kettle."]),
    }
    question_only = PostTestItem("Q1", "Coffee bloom?", "", "t", None)
    with_answer = PostTestItem("Q2", "Coffee?", "Bloom.", "t", None)
    findings, warnings = assess_posttest(
        [question_only, with_answer], analyses, [("a", "b")], threshold=0.5
    )
    found = _by_item(findings)
    common = math.log(6 / 6) + 1  # sklearn smoothed idf, df = n = 5
    rare = math.log(6 / 2) + 1  # df = 1
    # Best window in b holds "coffee" only.
    assert found["Q1"].values == {"a": 1.0, "b": pytest.approx(common / (common + rare))}
    # Below one half: an unweighted share would be exactly 1/2.
    share = found["Q1"].values["b"]
    assert share is not None and share < 0.5
    # The answer's "bloom" counts double (the module's documented choice).
    assert found["Q2"].values["b"] == pytest.approx(common / (common + 2 * rare))
    assert found["Q1"].status is Status.DIFFERS
    assert warnings == ()


def test_window_spans_two_adjacent_passages_but_not_three() -> None:
    item = PostTestItem("Q1", "Bloom grinder?", "", "t", None)
    analyses = {
        "adjacent": _lesson("adjacent", ["Coffee bloom.", "Coffee grinder.", "Coffee kettle."]),
        "apart": _lesson("apart", ["Coffee bloom.", "Coffee kettle.", "Coffee grinder."]),
    }
    findings, _ = assess_posttest([item], analyses, [("adjacent", "apart")])
    (finding,) = findings
    # By construction both terms have df = 2 of n = 6, so each is half the weight.
    assert finding.values == {"adjacent": 1.0, "apart": 0.5}
    assert finding.reason == "Q1 is taught in adjacent but not in apart"
    missing = finding.evidence[1].counterpart_text
    assert missing in ("missing: bloom", "missing: grinder")


def test_item_terms_follow_the_lesson_rules() -> None:
    (terms,) = item_terms([GRINDER_ITEM])
    # spaCy's English stop words ("which", "of", "one", "a") go, and so does "makes", whose
    # lemma "make" is one; lemmas from spaCy's lookup table ("particles" -> "particle").
    # Answer terms count double.
    assert terms.factors == {
        "grinder": ANSWER_FACTOR,
        "particle": 1.0,
        "size": 1.0,
        "burr": ANSWER_FACTOR,
    }


@pytest.mark.parametrize("threshold", [0.0, 1.5])
def test_threshold_out_of_range(threshold: float) -> None:
    analyses = {"a": _lesson("a", [OPENING]), "b": _lesson("b", [OPENING])}
    with pytest.raises(ConfigError, match="threshold"):
        assess_posttest([GRINDER_ITEM], analyses, [("a", "b")], threshold=threshold)


def test_same_id_in_two_files_is_refused() -> None:
    analyses = {"a": _lesson("a", [OPENING]), "b": _lesson("b", [OPENING])}
    other = PostTestItem("Q2", "Why?", "", "part2.csv", None)
    with pytest.raises(ConfigError, match="'Q2' is used twice"):
        assess_posttest([GRINDER_ITEM, other], analyses, [("a", "b")])


# --- the demo ----------------------------------------------------------------------------


@pytest.mark.skipif(not (FIXTURES / "posttest.md").exists(), reason="demo post-test not built")
def test_demo_posttest_text_only_against_confounded() -> None:
    from matcheck.readers import read

    expected = json.loads((FIXTURES / "expected.json").read_text(encoding="utf-8"))["posttest"]
    analyses = {
        name: analyze(read(FIXTURES / f"{name}.md"))
        for name in ("text-only", "diagrams-confounded")
    }
    for source in ("posttest.md", "posttest.csv"):
        items = _read(FIXTURES / source)
        assert [item.id for item in items] == [item["id"] for item in expected["items"]]
        findings, warnings = assess_posttest(
            items, analyses, [("text-only", "diagrams-confounded")]
        )
        found = _by_item(findings)
        for item in expected["items"]:
            finding = found[item["id"]]
            versions = set(item["taught_in_versions"])
            if {"text-only", "diagrams-confounded"} <= versions:
                assert finding.status is Status.MATCHED, item["id"]
                assert finding.reason == "taught in both"
            elif "text-only" in versions:
                assert finding.status is Status.DIFFERS, item["id"]
                assert finding.reason == (
                    f"{item['id']} is taught in text-only but not in diagrams-confounded"
                )
                taught = finding.evidence[0]
                assert taught.location is not None
                assert taught.location.section == item["taught_by"]["section"]
                # The quoted sentences come from the teaching paragraph (known by construction).
                paragraph = next(
                    b.block.text
                    for b in analyses["text-only"].blocks
                    if b.block.text.startswith(item["taught_by"]["first_words"])
                )
                for part in taught.text.removesuffix(" …").split(" … "):
                    assert part in paragraph
                for word in item.get("unique_words", []):
                    # Lemmas: "deeper" is looked up as "deep".
                    assert word.removesuffix("er") in finding.evidence[1].counterpart_text
            else:
                assert finding.reason == "taught in neither", item["id"]
        untaught = [w for w in warnings if "taught in no condition" in w]
        assert [w.split()[2] for w in untaught] == expected["untaught"]
        assert expected["taught_only_by_removed_paragraph"] == [
            f.item for f in findings if f.status is Status.DIFFERS
        ]


def test_a_drop_of_coverage_beyond_tolerance_differs_though_both_teach() -> None:
    # By construction: b keeps "bloom" but loses "release" and "gas"; at a threshold of 0.3
    # both versions teach the item, and the drop (well over 10 points) is still reported.
    analyses = {
        "a": _lesson("a", ["Coffee bloom releases gas.", "Coffee grinder."]),
        "b": _lesson("b", ["Coffee bloom here.", "Coffee grinder."]),
    }
    item = PostTestItem("Q1", "What happens in the bloom?", "The bloom releases gas.", "t", None)
    findings, _ = assess_posttest([item], analyses, [("a", "b")], threshold=0.2)
    (finding,) = findings
    a, b = finding.values["a"], finding.values["b"]
    assert a is not None and b is not None
    assert b >= 0.2 and a - b > 0.10  # taught in both (threshold 0.2), fell by over 0.10
    assert finding.status is Status.DIFFERS
    assert finding.reason.endswith("taught differently")
    assert [e.kind.value for e in finding.evidence] == ["item_taught", "item_covered_less"]
    assert finding.evidence[0].condition == "a"


def test_a_small_drop_of_coverage_is_within_tolerance() -> None:
    # Fourteen answer terms; b lacks one ("fresh"), under a tenth of the weight.
    answer = (
        "The bloom releases carbon dioxide gas from fresh roasted beans and grounds when hot "
        "water first wets them evenly in the brewer."
    )
    analyses = {
        "a": _lesson("a", [f"Wait for it. {answer}", "Tea kettle."]),
        "b": _lesson("b", [f"Wait for it. {answer.replace('fresh ', '')}", "Tea kettle."]),
    }
    item = PostTestItem("Q1", "Why wait for the bloom?", answer, "t", None)
    findings, _ = assess_posttest([item], analyses, [("a", "b")], threshold=0.3)
    (finding,) = findings
    a, b = finding.values["a"], finding.values["b"]
    assert a is not None and b is not None and 0 < a - b <= 0.10
    assert finding.status is Status.MATCHED


def test_taught_evidence_quotes_the_teaching_sentences_not_the_paragraphs_start() -> None:
    # Issue 20: the bloom is taught by the 3rd and 4th sentences of a long paragraph; the
    # evidence must quote those (what a reader checks), not its first words. Known by
    # construction: the opening sentences share no term with the item.
    long = (
        "Coffee has a long history in many countries. Traders once carried sacks of it across "
        "the sea for months. " + BLOOM + " Many people drink it with milk in the morning."
    )
    analyses = {
        "long": _lesson("long", [OPENING, long, GRINDER, KETTLE]),
        "cut": _lesson("cut", [OPENING, GRINDER, KETTLE]),
    }
    findings, _ = assess_posttest([BLOOM_ITEM], analyses, [("long", "cut")])
    taught = _by_item(findings)["Q1"].evidence[0]
    assert taught.kind == "item_taught" and taught.condition == "long"
    assert not taught.text.startswith("Coffee has a long history")
    assert "release gas" in taught.text and "Traders" not in taught.text
    assert taught.location is not None and taught.location.paragraph == 2


def _sections(name: str, sections: Sequence[tuple[str, Sequence[str]]]) -> Analysis:
    builder = DocumentBuilder(f"{name}.md", "markdown")
    for heading, paragraphs in sections:
        builder.add_block(BlockKind.HEADING, heading, level=2)
        for text in paragraphs:
            builder.add_block(BlockKind.PARAGRAPH, text)
    return analyze(builder.build())


def test_not_taught_points_at_the_gap_not_at_an_early_passage() -> None:
    # Issue 20: the "not taught" side pointed at the introduction. By construction the early
    # "Buying Beans" paragraph shares two of the item's words (grounds, water) and is the
    # cut version's best window overall; the bloom paragraph stood in "Brewing", which the
    # cut version still has. The evidence must point into "Brewing", where the gap is.
    beans = "Keep the grounds dry and away from water until you brew."
    heat = "Heat the kettle until it is just below boiling."
    analyses = {
        "full": _sections("full", [("Buying Beans", [beans]), ("Brewing", [heat, BLOOM])]),
        "cut": _sections("cut", [("Buying Beans", [beans]), ("Brewing", [heat, KETTLE])]),
    }
    findings, _ = assess_posttest([BLOOM_ITEM], analyses, [("full", "cut")])
    taught, not_taught = _by_item(findings)["Q1"].evidence
    assert taught.location is not None and taught.location.section == "Brewing"
    assert not_taught.location is not None and not_taught.location.section == "Brewing"
    assert taught.counterpart == not_taught.location
