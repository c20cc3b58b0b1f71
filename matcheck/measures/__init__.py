"""Measures of one lesson version.

:data:`MEASURE_GROUPS` lists the measure functions in report order; :data:`CATALOGUE` every
measure spec by id. A new measure is a spec plus a function in one module of this package
and one line here (see DEVELOPERS.md).
"""

from __future__ import annotations

from matcheck.language.analysis import Analysis
from matcheck.measures import figures, key_terms, length, readability, signaling, structure
from matcheck.measures.base import Group, MeasureFunction, Measurement, MeasureSpec, Profile
from matcheck.settings import Settings

MEASURE_GROUPS: tuple[tuple[Group, MeasureFunction], ...] = (
    (Group.LENGTH, length.measure_length),
    (Group.READABILITY, readability.measure_readability),
    (Group.CONTENT, key_terms.measure_key_terms),
    (Group.FIGURES, figures.measure_figures),
    (Group.STRUCTURE, structure.measure_structure),
    (Group.SIGNALING, signaling.measure_signaling),
)

CATALOGUE: dict[str, MeasureSpec] = {
    spec.id: spec
    for module in (length, readability, key_terms, figures, structure, signaling)
    for spec in module.SPECS
}


def measure(analysis: Analysis, settings: Settings) -> Profile:
    """Every measure of one analysed version."""
    measurements: list[Measurement] = []
    unseen = set(analysis.document.undetected)
    for _group, function in MEASURE_GROUPS:
        for measurement in function(analysis, settings):
            if measurement.id in unseen:
                # The format cannot show it: unknown, never a misleading zero.
                note = f"{analysis.document.format} cannot show this"
                measurement = Measurement(measurement.spec, None, note=note)
            measurements.append(measurement)
    return Profile(analysis, tuple(measurements))


__all__ = ["CATALOGUE", "Group", "MeasureSpec", "Measurement", "Profile", "measure"]
