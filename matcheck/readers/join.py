"""Join the parts of a lesson (several files, in order) into one document."""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import replace

from matcheck.model import Block, BlockKind, Document, Figure


def join_documents(parts: Sequence[Document]) -> Document:
    """One document whose blocks and figures are the parts' in order, re-indexed.

    Locations keep their page and line (which belong to each part's own file) and get
    block indices and paragraph numbers that run through the whole lesson. Headings are ranked
    over the whole lesson by the levels their sources gave them: a part that starts at ``##``
    continues the outline of a part with ``#`` instead of starting its own.
    """
    outline = sorted({level for part in parts for level in part.outline})
    rank = {level: index for index, level in enumerate(outline, start=1)}
    blocks: list[Block] = []
    figures: list[Figure] = []
    paragraphs = 0
    warnings: list[str] = []
    excluded: list[str] = []
    group_offset = 0
    for index, part in enumerate(parts):
        offset = len(blocks)
        before = paragraphs  # paragraphs of the earlier parts
        # List and table ids are numbered per file; shift them so parts never share one.
        groups = [block.group for block in part.blocks if block.group is not None]
        for block in part.blocks:
            paragraph = block.location.paragraph
            if paragraph is not None:
                paragraphs += 1
                paragraph = paragraphs
            location = replace(
                block.location,
                block=offset + block.location.block,
                paragraph=paragraph,
                part=index,
                after_paragraph=_shift(block.location.after_paragraph, before),
            )
            group = None if block.group is None else block.group + group_offset
            level = block.level
            if block.kind is BlockKind.HEADING and 0 < level <= len(part.outline):
                level = rank[part.outline[level - 1]]
            blocks.append(replace(block, location=location, group=group, level=level))
        for figure in part.figures:
            location = replace(
                figure.location,
                block=offset + figure.location.block,
                part=index,
                after_paragraph=_shift(figure.location.after_paragraph, before),
            )
            figures.append(replace(figure, location=location))
        group_offset += max(groups, default=0)
        warnings += [f"{part.name}: {w}" for w in part.warnings]
        excluded += [f"{part.name}: {e}" for e in part.excluded]
    pages = [part.pages for part in parts]
    return Document(
        path=" + ".join(part.path for part in parts),
        format="+".join(dict.fromkeys(part.format for part in parts)),
        blocks=tuple(blocks),
        figures=tuple(figures),
        pages=sum(p for p in pages if p) if any(pages) else None,
        excluded=tuple(excluded),
        warnings=tuple(warnings),
        cannot_show=frozenset().union(*(part.cannot_show for part in parts)),
        outline=tuple(outline),
    )


def _shift(after: int | None, before: int) -> int | None:
    return None if after is None else after + before
