"""What an output format is: the subject it renders, its options, and its entry.

Kept apart from the registry so that the built-in list (:mod:`matcheck.report.formats`) and
every renderer can name these types without importing the registry.
"""

from __future__ import annotations

import importlib
from collections.abc import Callable
from dataclasses import dataclass
from enum import StrEnum
from typing import Any


class Subject(StrEnum):
    """What a format renders."""

    REPORT = "report"
    STUDIES = "studies"
    PROFILES = "profiles"
    METHODS = "methods"
    POWER = "power"


@dataclass(frozen=True, slots=True)
class RenderOptions:
    """What the user asked of the output beyond its format."""

    show_matched: bool = True
    width: int = 140  # for console formats written to a file


@dataclass(frozen=True, slots=True)
class Formatter:
    name: str
    subject: Subject
    target: str  # "package.module:function"
    description: str
    binary: bool = False
    console: bool = False
    extension: str = ".txt"

    def load(self) -> Callable[..., Any]:
        module, _, function = self.target.partition(":")
        loaded: Callable[..., Any] = getattr(importlib.import_module(module), function)
        return loaded
