"""Structure: headings, sections, lists and tables, the scaffolding a reader navigates by."""

from __future__ import annotations

from collections.abc import Iterator

from matcheck.findings import Tolerance
from matcheck.language.analysis import Analysis
from matcheck.measures.base import EXACT, Group, Measurement, MeasureSpec, causes
from matcheck.model import BlockKind, Capability
from matcheck.settings import Settings

S = Group.STRUCTURE
EXACTLY = Tolerance(reason=EXACT)
HEADINGS = MeasureSpec(
    "headings",
    S,
    "headings",
    "Headings at every level",
    EXACTLY,
    needs=Capability.HEADINGS,
    label="Headings",
    phrase="the number of headings",
)
SECTIONS = MeasureSpec(
    "sections",
    S,
    "sections",
    "Sections: headings at the top level used below the title",
    EXACTLY,
    follows=causes("headings"),
    implied_by="headings",
    needs=Capability.HEADINGS,
)
LISTS = MeasureSpec(
    "lists",
    S,
    "lists",
    "Bulleted or numbered lists (a nested list is part of its outer list)",
    EXACTLY,
    follows=causes("list_items"),
    implied_by="list_items",
    needs=Capability.LISTS,
)
LIST_ITEMS = MeasureSpec(
    "list_items",
    S,
    "items",
    "List items",
    EXACTLY,
    needs=Capability.LISTS,
    label="List items",
    phrase="the number of list items",
)
TABLES = MeasureSpec(
    "tables",
    S,
    "tables",
    "Tables",
    EXACTLY,
    needs=Capability.TABLES,
    label="Tables",
    phrase="the number of tables",
)
ALWAYS_LEVELS = 3


def heading_level_spec(level: int) -> MeasureSpec:
    return MeasureSpec(
        f"headings_level_{level}",
        S,
        "headings",
        f"Headings at level {level}",
        EXACTLY,
        follows=causes("headings"),
        implied_by="headings",
        needs=Capability.HEADINGS,
    )


SPECS = (
    HEADINGS,
    *(heading_level_spec(level) for level in range(1, 7)),
    SECTIONS,
    LISTS,
    LIST_ITEMS,
    TABLES,
)


def measure_structure(analysis: Analysis, settings: Settings) -> Iterator[Measurement]:
    document = analysis.document
    headings = document.blocks_of(BlockKind.HEADING)
    yield Measurement(HEADINGS, float(len(headings)))
    levels = [heading.level for heading in headings]
    deepest = max([ALWAYS_LEVELS, *levels])
    for level in range(1, deepest + 1):
        yield Measurement(heading_level_spec(level), float(levels.count(level)))
    yield Measurement(SECTIONS, float(_sections(levels)))
    items = document.blocks_of(BlockKind.LIST_ITEM)
    yield Measurement(LISTS, float(len({item.group for item in items})))
    yield Measurement(LIST_ITEMS, float(len(items)))
    cells = document.blocks_of(BlockKind.TABLE_CELL)
    yield Measurement(TABLES, float(len({cell.group for cell in cells})))


def _sections(levels: list[int]) -> int:
    """Headings at the shallowest level that occurs more than once.

    A lesson usually has one title at level 1 and its sections at level 2; the title alone
    does not make a section. A lesson whose only headings are one title has one section.
    """
    if not levels:
        return 0
    for level in sorted(set(levels)):
        if levels.count(level) > 1:
            return levels.count(level)
    return 1
