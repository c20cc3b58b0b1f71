"""Export one lesson with real converters, so readers can be checked against real output.

The lesson (``fixtures/converters/lesson.md``) is written once, in Markdown. This script draws
its two figures (a PNG with Pillow and an SVG written by hand), then exports it with the tools
researchers use:

- pandoc: Markdown → DOCX (the ``#`` title becomes Word's Title style, ``##`` Heading 1,
  ``###`` Heading 2) and that DOCX → Markdown again (a round trip);
- LibreOffice headless: the pandoc DOCX → PDF, once tagged and once untagged (the
  ``writer_pdf_Export`` filter with ``UseTaggedPDF`` true or false);
- python-docx: the same lesson built directly (Heading 1-3, List Bullet / List Number styles,
  code paragraphs set entirely in a monospace font, pictures with alt text).

The demo lesson's ``diagrams.docx`` is exported to a tagged PDF by LibreOffice too
(``demo-diagrams-libreoffice.pdf``), a second lesson through a real converter.

``lesson-changed.md`` is the same lesson with three planted differences (a paragraph removed,
a passage rewritten, a figure added); it goes through the same pandoc, LibreOffice and
python-docx steps.

The test suite reads the committed outputs and never needs pandoc or LibreOffice. Run from the
repository root (needs pandoc, rsvg-convert, LibreOffice, and the project's venv for Pillow
and python-docx)::

    python scripts/build_converter_fixtures.py

The outputs are not byte-for-byte reproducible (LibreOffice stamps dates and ids), which is
why they are committed rather than rebuilt in CI.
"""

from __future__ import annotations

import re
import shutil
import subprocess
import sys
import tempfile
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent
OUT = ROOT / "fixtures" / "converters"
IMAGES = OUT / "images"

# LibreOffice >= 7.4 takes the export filter's options as JSON after the filter name.
PDF_FILTER = 'pdf:writer_pdf_Export:{{"UseTaggedPDF":{{"type":"boolean","value":"{tagged}"}}}}'

SVG = """<?xml version="1.0" encoding="UTF-8"?>
<svg xmlns="http://www.w3.org/2000/svg" width="480" height="200" viewBox="0 0 480 200">
  <rect width="480" height="200" fill="#ffffff"/>
  <path d="M 80 120 Q 160 40 240 120" fill="none" stroke="#3a7bd5" stroke-width="4"/>
  <path d="M 240 120 Q 320 40 400 120" fill="none" stroke="#3a7bd5" stroke-width="4"/>
  <circle cx="80" cy="120" r="22" fill="#2d6a4f"/>
  <circle cx="240" cy="120" r="22" fill="#52b788"/>
  <circle cx="400" cy="120" r="22" fill="#52b788"/>
  <text x="80" y="175" font-family="sans-serif" font-size="16" text-anchor="middle">main</text>
  <text x="240" y="175" font-family="sans-serif" font-size="16" text-anchor="middle">node 2</text>
  <text x="400" y="175" font-family="sans-serif" font-size="16" text-anchor="middle">node 3</text>
</svg>
"""


def draw_images() -> None:
    """The floor plan (PNG, 600x375 px at 96 dpi) and the mesh diagram (SVG, 480x200)."""
    from PIL import Image, ImageDraw

    IMAGES.mkdir(parents=True, exist_ok=True)
    image = Image.new("RGB", (600, 375), "white")
    draw = ImageDraw.Draw(image)
    draw.rectangle((20, 20, 290, 355), outline="black", width=4)
    draw.rectangle((310, 20, 580, 355), outline="black", width=4)
    draw.line((155, 20, 155, 200), fill="black", width=3)
    draw.line((445, 20, 445, 355), fill="black", width=3)
    for x, y, colour in ((80, 120, "#2d6a4f"), (220, 260, "#52b788"), (500, 120, "#52b788")):
        draw.ellipse((x - 14, y - 14, x + 14, y + 14), fill=colour)
    image.save(IMAGES / "floor-plan.png", dpi=(96, 96))
    # The changed lesson's extra figure: a router's back panel.
    extra = Image.new("RGB", (400, 200), "#eeeeee")
    panel = ImageDraw.Draw(extra)
    for index in range(4):
        panel.rectangle((40 + index * 80, 80, 90 + index * 80, 130), outline="black", width=3)
    extra.save(IMAGES / "router-ports.png", dpi=(96, 96))
    (IMAGES / "mesh-links.svg").write_text(SVG, encoding="utf-8")


def run(*command: str, cwd: Path = OUT) -> None:
    print("$", " ".join(command))
    subprocess.run(command, cwd=cwd, check=True)


def pandoc_docx(source: str, target: str) -> None:
    # --shift-heading-level-by=-1: the single "#" heading becomes the document title (Word's
    # Title style) and "##"/"###" become Heading 1/2, as pandoc users commonly do.
    # -implicit_figures: pandoc would otherwise print each image's alt text again as a visible
    # caption, text the Markdown shows nowhere (CommonMark has no captions).
    run(
        "pandoc",
        source,
        "-f",
        "markdown-implicit_figures",
        "--shift-heading-level-by=-1",
        "-o",
        target,
    )


def pandoc_markdown(source: str, target: str) -> None:
    # -s keeps the title (as YAML front matter); pipe tables, no grid or simple tables, no
    # {width=...} attributes (not CommonMark); media extracted beside the file.
    run(
        "pandoc",
        source,
        "-s",
        "-t",
        "markdown-grid_tables-multiline_tables-simple_tables-link_attributes",
        "--wrap=none",
        "--extract-media=roundtrip-media",
        "-o",
        target,
    )


def libreoffice_pdf(source: str, target: str, *, tagged: bool) -> None:
    office = shutil.which("soffice") or shutil.which("libreoffice")
    if office is None:
        sys.exit("LibreOffice (soffice) is needed to build these fixtures")
    with tempfile.TemporaryDirectory() as work, tempfile.TemporaryDirectory() as profile:
        run(
            office,
            f"-env:UserInstallation=file://{profile}",
            "--headless",
            "--convert-to",
            PDF_FILTER.format(tagged="true" if tagged else "false"),
            "--outdir",
            work,
            str(OUT / source),
        )
        produced = Path(work) / (Path(source).stem + ".pdf")
        shutil.move(produced, OUT / target)


def python_docx(source: Path, target: Path) -> None:
    """Build the lesson with python-docx from the Markdown, block by block.

    Only the constructs this lesson uses are handled. Code paragraphs carry no code style, only
    a monospace font on every run, as hand-made Word lessons often do; the SVG figure is drawn
    again as a PNG (python-docx cannot embed SVG), shown at the size pandoc gives the SVG.
    """
    from docx import Document
    from docx.shared import Cm, Pt
    from PIL import Image

    document = Document()
    lines = source.read_text(encoding="utf-8").splitlines()
    svg_png = OUT / "build-mesh-links.png"
    Image.new("RGB", (480, 200), "white").save(svg_png, dpi=(96, 96))
    index = 0
    while index < len(lines):
        line = lines[index]
        if not line.strip():
            index += 1
            continue
        if line.startswith("#"):
            hashes = len(line) - len(line.lstrip("#"))
            document.add_heading(line[hashes:].strip(), level=hashes)
            index += 1
        elif line.startswith("```"):
            index += 1
            while not lines[index].startswith("```"):
                paragraph = document.add_paragraph()
                run_ = paragraph.add_run(lines[index])
                run_.font.name = "Courier New"
                run_.font.size = Pt(10)
                index += 1
            index += 1
        elif line.startswith("!["):
            match = re.match(r"!\[(.*)\]\((.*)\)", line)
            assert match is not None
            alt, src = match.groups()
            path = OUT / src
            if path.suffix == ".svg":
                path = svg_png
            # As pandoc shows a picture: its pixels at 96 dpi, at most the 5.833 in text width.
            with Image.open(path) as image:
                width = Cm(min(image.width / 96, 5.8333) * 2.54)
            document.add_picture(str(path), width=width)
            inline = document.inline_shapes[-1]._inline
            inline.docPr.set("descr", alt)
            index += 1
        elif line.startswith("|"):
            rows = []
            while index < len(lines) and lines[index].startswith("|"):
                cells = [cell.strip() for cell in lines[index].strip("|").split("|")]
                if not set("".join(cells)) <= set("-:"):
                    rows.append(cells)
                index += 1
            table = document.add_table(rows=len(rows), cols=len(rows[0]))
            table.style = "Table Grid"
            for row, cells in zip(table.rows, rows, strict=True):
                for cell, text in zip(row.cells, cells, strict=True):
                    cell.text = text
        elif line.startswith("- ") or re.match(r"\d+\. ", line):
            style = "List Bullet" if line.startswith("- ") else "List Number"
            text = line.split(" ", 1)[1]
            _inline(document.add_paragraph(style=style), text)
            index += 1
        else:
            paragraph_lines = []
            while index < len(lines) and lines[index].strip() and not _starts_block(lines[index]):
                paragraph_lines.append(lines[index].strip())
                index += 1
            _inline(document.add_paragraph(), " ".join(paragraph_lines))
    svg_png.unlink()
    document.core_properties.title = ""
    document.save(str(target))


def _starts_block(line: str) -> bool:
    return line.startswith(("#", "```", "![", "|", "- ")) or bool(re.match(r"\d+\. ", line))


def _inline(paragraph: object, text: str) -> None:
    """Runs for **bold**, *italic* and `code` marks."""
    from docx.shared import Pt

    for piece in re.split(r"(\*\*[^*]+\*\*|\*[^*]+\*|`[^`]+`)", text):
        if not piece:
            continue
        if piece.startswith("**"):
            paragraph.add_run(piece[2:-2]).bold = True  # type: ignore[attr-defined]
        elif piece.startswith("*"):
            paragraph.add_run(piece[1:-1]).italic = True  # type: ignore[attr-defined]
        elif piece.startswith("`"):
            run_ = paragraph.add_run(piece[1:-1])  # type: ignore[attr-defined]
            run_.font.name = "Courier New"
            run_.font.size = Pt(10)
        else:
            paragraph.add_run(piece)  # type: ignore[attr-defined]


def main() -> None:
    # rsvg-convert (Debian: librsvg2-bin) lets pandoc give the SVG picture a PNG fallback;
    # without it pandoc 2.17 reads the picture back as its alt text, losing the figure.
    for tool in ("pandoc", "rsvg-convert"):
        if shutil.which(tool) is None:
            sys.exit(f"{tool} is needed to build these fixtures")
    draw_images()
    for stem in ("lesson", "lesson-changed"):
        pandoc_docx(f"{stem}.md", f"{stem}-pandoc.docx")
        libreoffice_pdf(f"{stem}-pandoc.docx", f"{stem}-tagged.pdf", tagged=True)
        libreoffice_pdf(f"{stem}-pandoc.docx", f"{stem}-untagged.pdf", tagged=False)
        pandoc_markdown(f"{stem}-pandoc.docx", f"{stem}-roundtrip.md")
        python_docx(OUT / f"{stem}.md", OUT / f"{stem}-python-docx.docx")
    # The demo lesson's own DOCX (python-docx, scripts/build_fixtures.py) through LibreOffice.
    libreoffice_pdf("../demo/diagrams.docx", "demo-diagrams-libreoffice.pdf", tagged=True)


if __name__ == "__main__":
    main()
