"""The comparison's defaults on lessons of 300 to 20,000 words, none of them a fixture.

The lessons are generated here from templates on home-networking topics (deterministic, by
construction), so that what changed between two versions is known exactly. The same checks
run at every length: a reflowed copy is matched; a removed paragraph of about 40 words is
found and located; sentences joined in pairs are a readability difference only.
"""

from __future__ import annotations

import random
import textwrap
from pathlib import Path

import pytest

from matcheck.api import Version, compare_versions
from matcheck.findings import Report, Status

TOPICS = {
    "Routers": ["router", "firmware", "antenna", "channel", "band", "admin page", "reset button"],
    "Cables": ["cable", "connector", "socket", "patch lead", "shielding", "crimp tool", "jack"],
    "Addresses": ["address", "lease", "subnet", "gateway", "hostname", "reservation", "pool"],
    "Security": ["password", "passphrase", "guest network", "update", "encryption", "key"],
    "Signal": ["signal", "wall", "repeater", "mesh node", "interference", "microwave", "floor"],
    "Printers": ["printer", "driver", "queue", "tray", "cartridge", "scanner", "share"],
}
VERBS = ["checks", "changes", "blocks", "carries", "needs", "replaces", "protects", "slows"]
OPENERS = ["In most homes", "Before you start", "After a power cut", "On older models", "At night"]
TEMPLATES = (
    "{opener}, the {a} usually {verb} the {b}, so look at it first.",
    "A loose {a} {verb} the {b} more often than people expect.",
    "If the {a} {verb} the {b}, write down what you changed and when.",
    "{opener}, a second {a} rarely {verb} the {b} on its own.",
    "The {a} and the {b} are worth checking together, because each {verb} the other.",
)


def _sentence(rng: random.Random, words: list[str]) -> str:
    a, b = rng.sample(words, 2)
    template = rng.choice(TEMPLATES)
    text = template.format(opener=rng.choice(OPENERS), a=a, b=b, verb=rng.choice(VERBS))
    return text[0].upper() + text[1:]


def make_lesson(total_words: int, seed: int = 7) -> list[tuple[str, list[str]]]:
    """Sections of paragraphs (lists of sentences), about ``total_words`` words in all."""
    rng = random.Random(seed)
    sections: list[tuple[str, list[str]]] = []
    count = 0
    part = 0
    while count < total_words:
        topic = list(TOPICS)[part % len(TOPICS)]
        heading = f"{topic} {part // len(TOPICS) + 1}"
        paragraphs = []
        for _ in range(rng.randint(2, 4)):
            sentences = [_sentence(rng, TOPICS[topic]) for _ in range(rng.randint(3, 5))]
            paragraphs.append(" ".join(sentences))
            count += sum(len(s.split()) for s in sentences)
        sections.append((heading, paragraphs))
        part += 1
    return sections


def render(sections: list[tuple[str, list[str]]], *, width: int | None = None) -> str:
    lines = ["# Looking after a home network", ""]
    for heading, paragraphs in sections:
        lines += [f"## {heading}", ""]
        for paragraph in paragraphs:
            lines += [textwrap.fill(paragraph, width) if width else paragraph, ""]
    return "\n".join(lines)


def _compare(tmp_path: Path, a: str, b: str) -> tuple[Report, set[str]]:
    (tmp_path / "a.md").write_text(a, encoding="utf-8")
    (tmp_path / "b.md").write_text(b, encoding="utf-8")
    report = compare_versions(
        [Version("a", (tmp_path / "a.md",)), Version("b", (tmp_path / "b.md",))]
    )
    return report, {f.group for f in report.root_findings(Status.DIFFERS)}


LENGTHS = [300, 2_000, 5_000, 20_000]


@pytest.mark.parametrize("words", LENGTHS)
def test_reflowed_copy_is_matched(tmp_path: Path, words: int) -> None:
    sections = make_lesson(words)
    _, groups = _compare(tmp_path, render(sections), render(sections, width=60))
    assert groups == set()


@pytest.mark.parametrize("words", LENGTHS)
def test_removed_forty_word_paragraph_is_found(tmp_path: Path, words: int) -> None:
    sections = make_lesson(words)
    middle = len(sections) // 2
    heading, paragraphs = sections[middle]
    # By construction: a paragraph of 40 words (four 10-word sentences) inserted in the
    # reference and absent from the other version.
    planted = (
        "Label both ends of every cable before you unplug it. "
        "A strip of masking tape and a pen will do nicely. "
        "Write the port number and the room on each label. "
        "Later you can plug everything back without any guessing."
    )
    assert len(planted.split()) == 40
    with_paragraph = [
        *sections[:middle],
        (heading, [*paragraphs, planted]),
        *sections[middle + 1 :],
    ]
    report, groups = _compare(tmp_path, render(with_paragraph), render(sections))
    assert "content" in groups
    removed = next(f for f in report.findings if f.dimension == "passages_removed")
    assert removed.status is Status.DIFFERS
    [evidence] = removed.evidence
    assert evidence.location is not None
    assert evidence.location.section == heading
    assert evidence.text.startswith("Label both ends of every cable")


@pytest.mark.parametrize("words", LENGTHS)
def test_sentences_joined_in_pairs_are_readability_only(tmp_path: Path, words: int) -> None:
    sections = make_lesson(words)

    def joined(paragraph: str) -> str:
        sentences = paragraph.split(". ")
        out = []
        for i in range(0, len(sentences), 2):
            pair = sentences[i : i + 2]
            if len(pair) == 2:
                out.append(f"{pair[0]}, and {pair[1][0].lower()}{pair[1][1:]}")
            else:
                out.append(pair[0])
        return ". ".join(out)

    longer = [(heading, [joined(p) for p in paragraphs]) for heading, paragraphs in sections]
    _, groups = _compare(tmp_path, render(sections), render(longer))
    assert groups == {"readability"}


@pytest.mark.parametrize("words", LENGTHS)
def test_sentence_cut_from_inside_a_paragraph_is_found(tmp_path: Path, words: int) -> None:
    # By construction: one sentence of new content (about a power cut and the modem) stands
    # inside a paragraph of the reference and is cut from the other version.
    sections = make_lesson(words)
    middle = len(sections) // 2
    heading, paragraphs = sections[middle]
    sentence = (
        "When a storm knocks out the electricity overnight, unplug the modem and wait until "
        "the supply has been steady for ten minutes before plugging it back in."
    )
    first, *rest = paragraphs[0].split(". ")
    with_sentence = ". ".join([first, sentence.rstrip("."), *rest])
    planted = [(heading, [with_sentence, *paragraphs[1:]])]
    reference = render([*sections[:middle], *planted, *sections[middle + 1 :]])
    report, groups = _compare(tmp_path, reference, render(sections))
    # In a 300-word lesson the 27 words are also 9% of its length (beyond the 5% tolerance).
    assert groups == ({"content", "length"} if words < 500 else {"content"})
    cut = next(f for f in report.findings if f.dimension == "text_removed")
    assert cut.status is Status.DIFFERS
    [evidence] = cut.evidence
    assert evidence.location is not None and evidence.location.section == heading
    assert "storm knocks out the electricity" in evidence.text
