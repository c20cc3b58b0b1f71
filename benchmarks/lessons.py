"""Generated lessons for the benchmark: any length, with headings, lists, tables and figures.

The text is made from templates on everyday technical topics (home networking, bicycle repair,
composting, coffee brewing), deterministically from a seed, so every run measures the same
files. A lesson is a list of blocks; it is rendered to Markdown, DOCX (python-docx) and PDF
(fpdf2). The second version of a pair drops one paragraph and rewrites a few sentences, as an
editor would between two conditions.
"""

from __future__ import annotations

import random
from dataclasses import dataclass, field
from pathlib import Path
from typing import Literal


def _items(text: str) -> list[str]:
    return [item.strip() for item in text.split(",")]


TOPICS: dict[str, list[str]] = {
    "Home networking": _items(
        "router, firmware, antenna, channel, cable, switch, gateway, subnet, password, "
        "repeater, printer, signal, lease, hostname, update"
    ),
    "Bicycle repair": _items(
        "chain, derailleur, brake pad, spoke, tyre, inner tube, valve, crank, saddle, headset, "
        "cassette, cable housing, rim, hub, pedal"
    ),
    "Composting": _items(
        "heap, bin, leaf litter, kitchen scrap, worm, moisture, straw, lid, nitrogen, carbon, "
        "fork, thermometer, mulch, sieve, grass clipping"
    ),
    "Coffee brewing": _items(
        "grinder, filter, kettle, scale, bean, brew ratio, bloom, carafe, dripper, water, "
        "roast, burr, timer, mug, sediment"
    ),
}
VERBS = _items(
    "checks, changes, blocks, carries, needs, replaces, protects, slows, warms, loosens, "
    "cleans, measures, supports, drains, shapes, guides"
)
ADJECTIVES = _items(
    "loose, worn, fresh, damp, noisy, heavy, spare, cheap, sturdy, dusty, narrow, bright, "
    "careful, gentle, regular, sudden"
)
OPENERS = _items(
    "In most homes, Before you start, After a long week, On older models, At night, "
    "In cold weather, With a little practice, Once a month, If in doubt, Later on"
)
TEMPLATES = (
    "{opener}, the {adj} {a} usually {verb} the {b}, so look at it first.",
    "A {adj} {a} {verb} the {b} more often than people expect.",
    "If the {a} {verb} the {b}, write down what you changed and when it happened.",
    "{opener}, a second {a} rarely {verb} the {b} on its own.",
    "The {a} and the {b} are worth checking together, because each one {verb} the other.",
    "Keep a {adj} {a} near the {b}; it saves a trip when something goes wrong.",
    "Most problems with the {b} start at the {a}, which {verb} it without much warning.",
    "{opener}, measure the {a} twice and note the reading beside step {n}.",
)
ALTERED = "Nobody expects the {a} to matter, yet in step {n} it quietly {verb} the {b} again."

FIGURE_EVERY_WORDS = 1500
TABLE_EVERY_WORDS = 5000
LIST_EVERY_WORDS = 2000

Kind = Literal["heading", "paragraph", "bullets", "table", "figure"]


@dataclass
class Block:
    kind: Kind
    text: str = ""
    level: int = 0
    items: list[str] = field(default_factory=list)
    rows: list[list[str]] = field(default_factory=list)
    figure: int = 0


def _sentence(rng: random.Random, words: list[str], template: str | None = None) -> str:
    a, b = rng.sample(words, 2)
    text = (template or rng.choice(TEMPLATES)).format(
        opener=rng.choice(OPENERS),
        adj=rng.choice(ADJECTIVES),
        a=a,
        b=b,
        verb=rng.choice(VERBS),
        n=rng.randint(1, 40),
    )
    return text[0].upper() + text[1:]


def _count(text: str) -> int:
    return len(text.split())


def make_lesson(total_words: int, seed: int = 11) -> list[Block]:
    """About ``total_words`` words of sections, paragraphs, lists, tables and figures."""
    rng = random.Random(seed)
    blocks: list[Block] = [Block("heading", "Looking after things at home", level=1)]
    count = next_figure = next_table = next_list = 0
    figures = 0
    part = 0
    names = list(TOPICS)
    while count < total_words:
        topic = names[part % len(names)]
        words = TOPICS[topic]
        blocks.append(Block("heading", f"{topic}, part {part // len(names) + 1}", level=2))
        for _ in range(rng.randint(3, 5)):
            text = " ".join(_sentence(rng, words) for _ in range(rng.randint(3, 6)))
            blocks.append(Block("paragraph", text))
            count += _count(text)
        if count >= next_list:
            items = [_sentence(rng, words) for _ in range(rng.randint(3, 5))]
            blocks.append(Block("bullets", items=items))
            count += sum(map(_count, items))
            next_list = count + LIST_EVERY_WORDS
        if count >= next_table:
            rows = [["Part", "What to check", "How often"]]
            rows += [
                [
                    item.capitalize(),
                    f"Look at the {item} for wear",
                    rng.choice(["weekly", "monthly"]),
                ]
                for item in rng.sample(words, 4)
            ]
            blocks.append(Block("table", rows=rows))
            count += sum(_count(cell) for row in rows for cell in row)
            next_table = count + TABLE_EVERY_WORDS
        if count >= next_figure:
            figures += 1
            caption = f"Figure {figures}. The {rng.choice(words)} seen from the side."
            blocks.append(Block("figure", text=caption, figure=figures))
            count += _count(caption)
            next_figure = count + FIGURE_EVERY_WORDS
        part += 1
    return blocks


def alter(blocks: list[Block], seed: int = 5) -> list[Block]:
    """The second version: one paragraph removed, one sentence in every ~25 paragraphs rewritten."""
    rng = random.Random(seed)
    paragraphs = [i for i, block in enumerate(blocks) if block.kind == "paragraph"]
    dropped = paragraphs[len(paragraphs) // 2]
    words = [word for topic in TOPICS.values() for word in topic]
    out: list[Block] = []
    for index, block in enumerate(blocks):
        if index == dropped:
            continue
        if block.kind == "paragraph" and index in paragraphs[::25]:
            sentences = block.text.split(". ")
            sentences[0] = _sentence(rng, words, ALTERED).rstrip(".")
            block = Block("paragraph", ". ".join(sentences))
        out.append(block)
    return out


def draw_figure(number: int, path: Path) -> None:
    """A small diagram (240 x 140 px): a few boxes and a line, different for each figure."""
    from PIL import Image, ImageDraw

    image = Image.new("RGB", (240, 140), "white")
    draw = ImageDraw.Draw(image)
    rng = random.Random(number)
    for _ in range(3):
        x, y = rng.randint(5, 150), rng.randint(5, 80)
        draw.rectangle((x, y, x + 80, y + 50), outline="black", width=2)
    draw.line((10, 130, 230, rng.randint(90, 130)), fill="gray", width=3)
    image.save(path, optimize=True)


def figure_path(folder: Path, number: int) -> Path:
    return folder / "images" / f"figure-{number}.png"


def write_figures(blocks: list[Block], folder: Path) -> None:
    (folder / "images").mkdir(parents=True, exist_ok=True)
    for block in blocks:
        if block.kind == "figure" and not figure_path(folder, block.figure).exists():
            draw_figure(block.figure, figure_path(folder, block.figure))


def render_markdown(blocks: list[Block], path: Path) -> None:
    chunks: list[str] = []
    for block in blocks:
        if block.kind == "heading":
            chunks.append("#" * block.level + " " + block.text)
        elif block.kind == "paragraph":
            chunks.append(block.text)
        elif block.kind == "bullets":
            chunks.append("\n".join(f"- {item}" for item in block.items))
        elif block.kind == "table":
            header, *body = block.rows
            lines = [
                "| " + " | ".join(header) + " |",
                "|" + "|".join(" --- " for _ in header) + "|",
            ]
            lines += ["| " + " | ".join(row) + " |" for row in body]
            chunks.append("\n".join(lines))
        elif block.kind == "figure":
            chunks.append(f"![A diagram](images/figure-{block.figure}.png)")
            chunks.append(block.text)
    path.write_text("\n\n".join(chunks) + "\n", encoding="utf-8")


def render_docx(blocks: list[Block], path: Path) -> None:
    from docx import Document
    from docx.shared import Cm

    document = Document()
    for block in blocks:
        if block.kind == "heading":
            document.add_heading(block.text, level=block.level)
        elif block.kind == "paragraph":
            document.add_paragraph(block.text)
        elif block.kind == "bullets":
            for item in block.items:
                document.add_paragraph(item, style="List Bullet")
        elif block.kind == "table":
            table = document.add_table(rows=len(block.rows), cols=len(block.rows[0]))
            for row, cells in zip(table.rows, block.rows, strict=True):
                for cell, text in zip(row.cells, cells, strict=True):
                    cell.paragraphs[0].text = text
        elif block.kind == "figure":
            picture = figure_path(path.parent, block.figure)
            document.add_paragraph().add_run().add_picture(str(picture), width=Cm(8))
            document.add_paragraph(block.text, style="Caption")
    document.save(str(path))


def render_pdf(blocks: list[Block], path: Path) -> None:
    from fpdf import FPDF

    pdf = FPDF(unit="mm", format="A4")
    pdf.set_margins(20, 20, 20)
    pdf.set_auto_page_break(True, margin=20)
    pdf.add_page()
    line = 5.5
    for block in blocks:
        if block.kind == "heading":
            if pdf.get_y() > pdf.page_break_trigger - 30:
                pdf.add_page()  # keep a heading with its section
            size = 18 if block.level == 1 else 14
            pdf.set_font("helvetica", "B", size)
            pdf.multi_cell(0, size * 0.5, block.text, new_x="LMARGIN", new_y="NEXT")
            pdf.ln(2)
        elif block.kind == "paragraph":
            pdf.set_font("helvetica", "", 11)
            pdf.multi_cell(0, line, block.text, new_x="LMARGIN", new_y="NEXT")
            pdf.ln(3)
        elif block.kind == "bullets":
            pdf.set_font("helvetica", "", 11)
            for item in block.items:
                pdf.set_x(pdf.l_margin + 4)
                pdf.cell(7, line, chr(149))
                pdf.multi_cell(0, line, item, new_x="LMARGIN", new_y="NEXT")
            pdf.ln(3)
        elif block.kind == "table":
            pdf.set_font("helvetica", "", 11)
            if pdf.get_y() > pdf.page_break_trigger - 40:
                pdf.add_page()
            with pdf.table(col_widths=(30, 90, 30), text_align="LEFT", line_height=line) as table:
                for cells in block.rows:
                    row = table.row()
                    for text in cells:
                        row.cell(text)
            pdf.ln(4)
        elif block.kind == "figure":
            if pdf.get_y() > pdf.page_break_trigger - 60:
                pdf.add_page()
            top = pdf.get_y()
            picture = figure_path(path.parent, block.figure)
            pdf.image(str(picture), x=(pdf.w - 80) / 2, y=top, w=80, h=80 * 140 / 240)
            pdf.set_y(top + 80 * 140 / 240 + 2)
            pdf.set_font("helvetica", "", 9)
            pdf.multi_cell(0, 4.5, block.text, align="C", new_x="LMARGIN", new_y="NEXT")
            pdf.ln(4)
    pdf.output(str(path))


RENDERERS = {"md": render_markdown, "docx": render_docx, "pdf": render_pdf}


def write_pair(words: int, fmt: str, folder: Path) -> tuple[Path, Path]:
    """Write version A and version B of a ``words``-word lesson in ``fmt`` into ``folder``."""
    folder.mkdir(parents=True, exist_ok=True)
    first = make_lesson(words)
    second = alter(first)
    write_figures(first, folder)
    a, b = folder / f"a-{words}.{fmt}", folder / f"b-{words}.{fmt}"
    RENDERERS[fmt](first, a)
    RENDERERS[fmt](second, b)
    return a, b


def lesson_words(blocks: list[Block]) -> int:
    """Words of running text, headings, lists, tables and captions (whitespace-separated)."""
    total = 0
    for block in blocks:
        total += _count(block.text) + sum(map(_count, block.items))
        total += sum(_count(cell) for row in block.rows for cell in row)
    return total
