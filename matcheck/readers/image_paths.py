"""Where an image a lesson refers to lives, and its pixel size: the sandbox of text formats.

Markdown today, and an HTML or slide reader later, name images by address. This module turns
one address into a :class:`LocatedImage` without ever reaching the network or leaving the
lesson's folder:

- ``http(s):``, ``//host/...`` and any other addressed resource but ``file:`` are remote:
  counted as figures, never fetched;
- ``data:image/...;base64,`` URIs are decoded in memory and measured;
- a path (relative, absolute, ``file:`` or a Windows drive) is resolved against the lesson's
  folder, following symlinks, and refused if it ends outside that folder unless the user
  allowed it (``--allow-outside``, :attr:`~matcheck.limits.ReadLimits.allow_outside_files`);
- a local file is measured from its header only (:func:`~matcheck.readers.images.image_size`).

The caller warns with :attr:`LocatedImage.warning` when there is one and records the figure.
"""

from __future__ import annotations

import base64
import binascii
from dataclasses import dataclass
from pathlib import Path
from typing import NamedTuple
from urllib.parse import unquote, urlsplit

from matcheck.limits import ReadLimits
from matcheck.readers.images import image_size


@dataclass
class ImageRef:
    """An image reference found in a lesson's text, before it is resolved."""

    source: str  # the address as written (percent-escapes normalised by the reader)
    alt: str
    line: int | None
    title: str = ""
    # Display size stated by an HTML ``<img>`` (width/height attributes or style), in cm.
    width_cm: float | None = None
    height_cm: float | None = None


class LocatedImage(NamedTuple):
    """Where an image reference led: the source shown, its pixel size if measured.

    ``problem`` says why the image could not be measured ("" when it was, or when it is
    remote and so deliberately not read).
    """

    source: str
    size: tuple[int, int] | None = None
    remote: bool = False
    problem: str = ""

    @property
    def readable(self) -> bool:
        return not self.problem

    @property
    def warning(self) -> str:
        """The line for the report's warnings, or "" if there is nothing to warn about."""
        return f"image {self.source} {self.problem}" if self.problem else ""


@dataclass(frozen=True)
class ImageSandbox:
    """Resolve image addresses inside one lesson folder (see the module docstring)."""

    folder: Path  # absolute, not resolved: symlinks are followed per image
    allow_outside: bool = False

    @classmethod
    def for_lesson(cls, path: Path, limits: ReadLimits) -> ImageSandbox:
        """The sandbox of the lesson file ``path``: its folder, and the user's permission."""
        return cls(path.absolute().parent, limits.allow_outside_files)

    def locate(self, source: str) -> LocatedImage:
        """Find and measure the image ``source`` names; never fetches, never raises."""
        try:
            parts = urlsplit(source)
        except ValueError:
            return _unreadable(source, "has a malformed address; not read")
        scheme = parts.scheme.lower()
        if scheme == "data":
            return _inline_data(source)
        # http(s) and any other addressed resource but file: are remote: counted, never
        # fetched. A one-letter "scheme" is a Windows drive (C:\...), so a local path.
        if source.startswith("//") or (len(scheme) > 1 and scheme != "file"):
            return LocatedImage(source, remote=True)
        relative = unquote(source if len(scheme) == 1 else parts.path)
        if not relative:
            return _unreadable(source, "names no file; not read")
        target = self.folder / relative  # an absolute path replaces the folder
        try:
            real = target.resolve()  # follows symlinks, so a link out of the folder is seen
            inside = real.is_relative_to(self.folder.resolve())
            exists = real.is_file()
        except (OSError, RuntimeError, ValueError):  # symlink loops, NUL bytes, ...
            return _unreadable(source, "cannot be located; not read")
        if not inside and not self.allow_outside:
            return _unreadable(
                source, "is outside the lesson folder; not read (allow it with --allow-outside)"
            )
        if not exists:
            return _unreadable(source, "not found")
        from matcheck.inputs import note

        note(target)  # an input of the run: no output may replace it
        return _measured(source, image_size(real))


def _inline_data(source: str) -> LocatedImage:
    header, _, payload = source.partition(",")
    shown = f"{header},…"  # the payload is the image itself: too long to show
    size = None
    if header.lower().startswith("data:image/") and header.lower().endswith(";base64"):
        try:
            size = image_size(base64.b64decode(unquote(payload)))
        except (binascii.Error, ValueError):
            size = None
    return _measured(shown, size)


def _measured(source: str, size: tuple[int, int] | None) -> LocatedImage:
    if size is None:
        return _unreadable(source, "cannot be decoded; its size is unknown")
    return LocatedImage(source, size=size)


def _unreadable(source: str, problem: str) -> LocatedImage:
    return LocatedImage(source, problem=problem)
