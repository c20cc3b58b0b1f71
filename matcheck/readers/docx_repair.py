"""A DOCX whose relationships name parts that are not in the archive (a lost image).

python-docx loads every part a relationship names and fails on the first one missing, so a
document that lost one picture could not be read at all. Here a missing **image** part is
replaced, in memory, by an empty one: the document is read with what is there, the figure is
counted as unreadable (its size cannot be decoded), and a warning names the missing part. A
missing part of any other kind (the document itself, its styles) still makes the file
damaged. The file on disk is never changed.
"""

from __future__ import annotations

import io
import posixpath
import zipfile
from pathlib import Path

_IMAGE_RELATIONSHIP = "http://schemas.openxmlformats.org/officeDocument/2006/relationships/image"


def missing_images(archive: zipfile.ZipFile) -> list[str]:
    """Internal image parts that a relationship names but the archive does not hold."""
    from xml.etree import ElementTree

    names = set(archive.namelist())
    missing: list[str] = []
    for name in sorted(names):
        if not name.endswith(".rels"):
            continue
        # word/_rels/document.xml.rels describes word/document.xml: targets are relative to
        # the folder of that source part (OPC, ECMA-376 Part 2, 9.3).
        source_folder = posixpath.dirname(posixpath.dirname(name))
        try:
            data = archive.read(name)
            if b"<!DOCTYPE" in data:
                continue  # no entity is ever expanded here; python-docx's parser judges it
            root = ElementTree.fromstring(data)
        except (ElementTree.ParseError, KeyError, ValueError, zipfile.BadZipFile):
            continue  # python-docx reports a broken relationships part itself
        for rel in root:
            if rel.get("Type") != _IMAGE_RELATIONSHIP or rel.get("TargetMode") == "External":
                continue
            target = rel.get("Target") or ""
            part = posixpath.normpath(
                target.lstrip("/")
                if target.startswith("/")
                else posixpath.join(source_folder, target)
            )
            if part not in names and part not in missing:
                missing.append(part)
    return missing


def with_empty_parts(path: Path, parts: list[str]) -> io.BytesIO:
    """The archive at ``path`` with an empty member for each of ``parts``, in memory."""
    buffer = io.BytesIO()
    with zipfile.ZipFile(path) as source, zipfile.ZipFile(buffer, "w") as copy:
        for info in source.infolist():
            copy.writestr(info, source.read(info))
        for part in parts:
            copy.writestr(part, b"")
    buffer.seek(0)
    return buffer
