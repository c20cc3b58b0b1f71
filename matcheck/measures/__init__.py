"""Measures of one lesson version.

Each module of this package declares its measures' specs and one function; the registrations
below put them in the catalogue (:mod:`matcheck.measures.registry`), in report order. A new
measure is one module plus one line here (see DEVELOPERS.md).
"""

from __future__ import annotations

from dataclasses import replace

from matcheck.language.analysis import Analysis
from matcheck.measures import (
    code,
    comparisons,
    figures,
    key_terms,
    length,
    readability,
    registry,
    signaling,
    structure,
)
from matcheck.measures.base import Group, Measurement, MeasureSpec, Profile
from matcheck.settings import Settings

registry.register_measures(length.measure_length, length.SPECS)
registry.register_measures(readability.measure_readability, readability.SPECS)
registry.register_measures(key_terms.measure_key_terms, key_terms.SPECS)
registry.register_measures(figures.measure_figures, figures.SPECS)
registry.register_measures(structure.measure_structure, structure.SPECS)
registry.register_measures(code.measure_code, code.SPECS)
registry.register_measures(signaling.measure_signaling, signaling.SPECS)
registry.register_specs(comparisons.SPECS)


def catalogue() -> dict[str, MeasureSpec]:
    """Every registered spec by id, in report order."""
    return {spec.id: spec for spec in registry.specs()}


def measure(analysis: Analysis, settings: Settings) -> Profile:
    """Every measure of one analysed version."""
    document = analysis.document
    measurements: list[Measurement] = []
    for function in registry.MEASURE_FUNCTIONS:
        for measurement in function(analysis, settings):
            needs = measurement.spec.needs
            if needs is not None and needs in document.cannot_show:
                # The format cannot show it: unknown, never a misleading zero.
                note = f"{document.format} cannot show {needs.value}"
                measurement = replace(measurement, value=None, items=(), note=note)
            measurements.append(measurement)
    return Profile(analysis, tuple(measurements))


__all__ = ["Group", "MeasureSpec", "Measurement", "Profile", "catalogue", "measure"]
