"""Figures: how many pictures, how large, and how they are labelled."""

from __future__ import annotations

from collections.abc import Iterator

from matcheck.findings import Tolerance
from matcheck.language.analysis import Analysis
from matcheck.language.words import iter_words
from matcheck.measures.base import (
    EXACT,
    JUDGMENT,
    Group,
    Measurement,
    MeasureSpec,
    Role,
    causes,
)
from matcheck.model import BlockKind, Capability
from matcheck.settings import Settings

F = Group.FIGURES
FIGURES = MeasureSpec(
    "figures",
    F,
    "figures",
    "Pictures in the lesson",
    Tolerance(reason=EXACT),
    label="Figures",
    phrase="the number of figures",
)
# Everything below follows the number of figures: an echo of it, intended when it is.
PIXEL_AREA = MeasureSpec(
    "figure_pixel_area",
    F,
    "megapixels",
    "Total pixel area of the readable pictures (information; size is compared by display area)",
    Tolerance(reason="information only, not compared"),
    role=Role.INFORMATION,
)
DISPLAY_AREA = MeasureSpec(
    "figure_display_area",
    F,
    "cm²",
    "Total displayed area, where the format states it",
    Tolerance(relative=0.10, reason=f"10%; {JUDGMENT}"),
    follows=causes("figures"),
    implied_by="figures",
    label="Figure area (cm²)",
    phrase="figure area",
    prose_unit=" cm²",
)
CAPTIONS = MeasureSpec(
    "captions",
    F,
    "captions",
    "Figure captions",
    Tolerance(reason=EXACT),
    follows=causes("figures"),
    implied_by="figures",
    label="Captions",
    phrase="the number of captions",
)
CAPTION_WORDS = MeasureSpec(
    "caption_words",
    F,
    "words",
    "Words in captions",
    Tolerance(relative=0.10, absolute=2, reason=f"10% (at least 2); {JUDGMENT}"),
    follows=causes("figures"),
    implied_by="figures",
)
NO_ALT = MeasureSpec(
    "figures_without_alt_text",
    F,
    "figures",
    "Pictures without alt text",
    Tolerance(reason=EXACT),
    follows=causes("figures"),
    implied_by="figures",
    needs=Capability.ALT_TEXT,
)
UNREADABLE = MeasureSpec(
    "figures_unreadable",
    F,
    "figures",
    "Pictures whose image could not be read or measured",
    Tolerance(reason="an unreadable picture cannot be compared"),
    follows=causes("figures"),
    implied_by="figures",
)
SPECS = (FIGURES, PIXEL_AREA, DISPLAY_AREA, CAPTIONS, CAPTION_WORDS, NO_ALT, UNREADABLE)


def measure_figures(analysis: Analysis, settings: Settings) -> Iterator[Measurement]:
    document = analysis.document
    figures = document.figures
    yield Measurement(FIGURES, float(len(figures)))
    pixel_areas = [area for figure in figures if (area := figure.pixel_area) is not None]
    if not figures:
        yield Measurement(PIXEL_AREA, 0.0)
    elif pixel_areas:
        unmeasured = len(figures) - len(pixel_areas)
        note = f"{unmeasured} picture(s) could not be measured" if unmeasured else ""
        yield Measurement(PIXEL_AREA, sum(pixel_areas) / 1e6, note=note)
    else:
        yield Measurement(PIXEL_AREA, None, note="no picture could be measured")
    display = [cm2 for figure in figures if (cm2 := figure.display_area_cm2) is not None]
    if not figures:
        yield Measurement(DISPLAY_AREA, 0.0)
    elif len(display) == len(figures):
        yield Measurement(DISPLAY_AREA, sum(display))
    else:
        yield Measurement(DISPLAY_AREA, None, note="the format does not state every display size")
    captions = document.blocks_of(BlockKind.CAPTION)
    caption_texts = [block.text for block in captions]
    # A caption a reader attached to a figure but did not emit as a block still counts.
    caption_texts += [f.caption for f in figures if f.caption and f.caption not in caption_texts]
    yield Measurement(CAPTIONS, float(len(caption_texts)))
    yield Measurement(
        CAPTION_WORDS, float(sum(len(list(iter_words(text))) for text in caption_texts))
    )
    yield Measurement(NO_ALT, float(sum(1 for figure in figures if not figure.alt_text)))
    yield Measurement(UNREADABLE, float(sum(1 for figure in figures if not figure.readable)))
