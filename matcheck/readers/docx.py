"""Read a Word (DOCX) lesson into a :class:`~matcheck.model.Document`.

The archive is inspected with :mod:`zipfile` before python-docx opens it, so a damaged file or
a zip bomb is refused before anything is extracted. python-docx opens the package and its
parts; the body is then read from its XML (see :mod:`matcheck.readers.docx_body`), followed by
footnotes and endnotes. Headers, footers and comments are never lesson text: they are only
recorded in ``Document.excluded``. The ECMA-376 and ZIP sections cited in these modules are
listed in docs/references.md §14.
"""

from __future__ import annotations

import errno
import zipfile
import zlib
from functools import cache
from pathlib import Path
from typing import TYPE_CHECKING

from matcheck.errors import CorruptFile, EncryptedFile, InputError, LimitExceeded, UnsupportedFormat
from matcheck.limits import ReadLimits
from matcheck.model import Document
from matcheck.readers.builder import DocumentBuilder
from matcheck.readers.docx_xml import Element, w
from matcheck.readers.wordlimit import WordBudget

if TYPE_CHECKING:
    from docx.opc.part import Part
    from docx.package import Package

_MAIN_PART = "word/document.xml"
# Small XML parts compress far better than any bomb threshold; only big members are judged.
_RATIO_FLOOR_BYTES = 1024 * 1024
# Word's main-document content types: document, template, and their macro-enabled forms.
_WORD_MAIN_TYPES = {
    "application/vnd.openxmlformats-officedocument.wordprocessingml.document.main+xml",
    "application/vnd.openxmlformats-officedocument.wordprocessingml.template.main+xml",
    "application/vnd.ms-word.document.macroEnabled.main+xml",
    "application/vnd.ms-word.template.macroEnabledTemplate.main+xml",
}
_HINT = "raise it with --limit {}=N if this is really a lesson"
# Footnote entries that are layout, not notes (ECMA-376 17.18.33).
_NOTE_LAYOUT_TYPES = {"separator", "continuationSeparator", "continuationNotice"}


def read_docx(path: Path, limits: ReadLimits) -> Document:
    """Read one DOCX file; raises the project's errors for damaged, hostile or foreign files."""
    from docx.opc.constants import RELATIONSHIP_TYPE as RT

    from matcheck.readers.docx_body import StoryReader
    from matcheck.readers.docx_styles import StyleSheet

    shown = str(path)
    _check_archive(path, limits, shown)
    with zipfile.ZipFile(path) as archive:
        from matcheck.readers.docx_repair import missing_images

        lost = missing_images(archive)
    package = _open(path, shown, lost)
    main = package.main_document_part
    styles_part = _related(main, RT.STYLES)
    styles = StyleSheet(None if styles_part is None else _element(styles_part, shown))
    builder = DocumentBuilder(shown, "docx", WordBudget(limits, shown, "DOCX"))
    try:
        body = _element(main, shown).find(w("body"))
        if body is not None:
            StoryReader(builder, styles, main).read_story(body)
        for reltype, tag in ((RT.FOOTNOTES, "footnote"), (RT.ENDNOTES, "endnote")):
            notes = _related(main, reltype)
            if notes is not None:
                reader = StoryReader(builder, styles, notes)
                for note in _element(notes, shown).iterchildren(w(tag)):
                    if note.get(w("type")) not in _NOTE_LAYOUT_TYPES and note.get(w("id")) not in (
                        "0",
                        "-1",
                    ):
                        reader.read_note(note)
    except RecursionError as error:
        raise CorruptFile("the DOCX nests its content too deeply to read", path=shown) from error
    _record_exclusions(package, builder, shown)
    for part in lost:
        builder.warn(f"the image part {part} is missing from the file; its figure is unreadable")
    return builder.build()


def _check_archive(path: Path, limits: ReadLimits, shown: str) -> None:
    """Refuse a damaged archive, a zip bomb or a ZIP that is not a Word document."""
    try:
        with zipfile.ZipFile(path) as archive:
            infos = archive.infolist()
            _check_sizes(infos, limits, shown)
            _check_xml_size(archive, infos, limits, shown)
            names = {info.filename for info in infos}
            if _MAIN_PART not in names and not _declares_word(archive, names):
                raise UnsupportedFormat("this is a ZIP archive but not a Word document", path=shown)
            if _parser_resolves_entities():
                _refuse_dtds(archive, infos, shown)
    except OSError as error:
        if error.errno != errno.EINVAL:
            raise InputError(f"the file cannot be read ({error.strerror})", path=shown) from error
        # zipfile seeks to the offsets the archive states; a damaged one is before the start.
        raise CorruptFile(
            "the DOCX is damaged or truncated (not a readable ZIP archive)", path=shown
        ) from error
    except (zipfile.BadZipFile, EOFError, ValueError, zlib.error) as error:
        raise CorruptFile(
            "the DOCX is damaged or truncated (not a readable ZIP archive)", path=shown
        ) from error


def _check_sizes(infos: list[zipfile.ZipInfo], limits: ReadLimits, shown: str) -> None:
    # Declared sizes are safe to trust: zipfile stops reading a member at its declared size
    # and fails the CRC check if the data runs longer, so no member can inflate beyond them.
    if len(infos) > limits.max_zip_members:
        raise LimitExceeded(
            f"the DOCX archive has {len(infos)} members, above max_zip_members "
            f"({limits.max_zip_members})",
            path=shown,
            hint=_HINT.format("max_zip_members"),
        )
    total = sum(info.file_size for info in infos)
    if total > limits.max_zip_uncompressed_bytes:
        raise LimitExceeded(
            f"the DOCX would unpack to {total / 2**20:.0f} MiB, above max_zip_uncompressed_bytes "
            f"({limits.max_zip_uncompressed_bytes / 2**20:.0f} MiB)",
            path=shown,
            hint=_HINT.format("max_zip_uncompressed_bytes"),
        )
    for info in infos:
        if info.flag_bits & 0x1:  # APPNOTE.TXT 4.4.4: bit 0 marks an encrypted member
            raise EncryptedFile("the DOCX archive is password-protected", path=shown)
        if info.file_size <= _RATIO_FLOOR_BYTES:
            continue
        ratio = info.file_size / max(info.compress_size, 1)
        if ratio > limits.max_zip_ratio:
            raise LimitExceeded(
                f"the DOCX member {info.filename} is compressed {ratio:.0f}:1, above "
                f"max_zip_ratio ({limits.max_zip_ratio:g}:1); this looks like a zip bomb",
                path=shown,
                hint=_HINT.format("max_zip_ratio"),
            )


def _check_xml_size(
    archive: zipfile.ZipFile, infos: list[zipfile.ZipInfo], limits: ReadLimits, shown: str
) -> None:
    """Refuse a package whose XML parts unpack beyond ``max_xml_bytes`` in total.

    python-docx parses every XML part into a tree when it opens the package, at several
    times the text's size in memory. A part is XML if its name says so or its declared content
    type does (a hostile package may give an XML part any name).
    """
    types = _content_types(archive, infos, limits, shown)
    total = 0
    for info in infos:
        name = info.filename
        declared = types.get("/" + name.lower()) or types.get(name.rpartition(".")[2].lower(), "")
        if name.lower().endswith((".xml", ".rels")) or declared.endswith("xml"):
            total += info.file_size
    if total > limits.max_xml_bytes:
        raise LimitExceeded(
            f"the DOCX's XML parts unpack to {total / 2**20:.0f} MiB, above max_xml_bytes "
            f"({limits.max_xml_bytes / 2**20:.0f} MiB)",
            path=shown,
            hint=_HINT.format("max_xml_bytes"),
        )


def _content_types(
    archive: zipfile.ZipFile, infos: list[zipfile.ZipInfo], limits: ReadLimits, shown: str
) -> dict[str, str]:
    """``[Content_Types].xml`` as a map of lower-case part names and extensions to types."""
    from docx.oxml.parser import parse_xml

    info = next((info for info in infos if info.filename == "[Content_Types].xml"), None)
    if info is None or info.file_size > limits.max_xml_bytes:
        return {}  # no map: python-docx refuses the package; too big: the total refuses it
    try:
        root = parse_xml(archive.read(info))
    except (SyntaxError, ValueError):  # lxml's XMLSyntaxError is a SyntaxError
        return {}  # python-docx reports the broken part when it opens the package
    types: dict[str, str] = {}
    for element in root.iter():
        kind = str(element.get("ContentType") or "").lower()
        key = element.get("PartName") or element.get("Extension")
        if key:
            types[str(key).lower()] = kind
    return types


def _declares_word(archive: zipfile.ZipFile, names: set[str]) -> bool:
    """Whether a package without word/document.xml still declares a Word main part elsewhere."""
    if "[Content_Types].xml" not in names:
        return False
    declared = archive.read("[Content_Types].xml")
    return any(kind.encode() in declared for kind in _WORD_MAIN_TYPES)


@cache
def _parser_resolves_entities() -> bool:
    """Whether python-docx's XML parser would expand entities declared in a part.

    python-docx 1.2 parses every part with ``XMLParser(resolve_entities=False)``
    (docx/oxml/parser.py), and lxml loads no external DTD and uses no network by default, so
    an entity-expansion attack stays an unexpanded reference. This probe checks it at run
    time, so a python-docx that changed its parser would switch the DTD guard on.
    """
    from docx.oxml.parser import parse_xml

    probe = parse_xml(b'<!DOCTYPE t [<!ENTITY e "expanded">]><t>&e;</t>')
    return "expanded" in "".join(probe.itertext())


def _refuse_dtds(archive: zipfile.ZipFile, infos: list[zipfile.ZipInfo], shown: str) -> None:
    for info in infos:
        if info.filename.endswith((".xml", ".rels")) and b"<!DOCTYPE" in archive.read(info):
            # Word never writes a DTD; one in a part can only be an entity attack.
            raise CorruptFile(f"the DOCX part {info.filename} declares a DTD", path=shown)


def _open(path: Path, shown: str, lost: list[str]) -> Package:
    from docx.package import Package

    try:
        if lost:  # read what is there; each lost image becomes an empty, unreadable part
            from matcheck.readers.docx_repair import with_empty_parts

            package = Package.open(with_empty_parts(path, lost))
        else:
            package = Package.open(str(path))
        main = package.main_document_part
    except MemoryError:
        raise
    except Exception as error:
        _refuse_entity_bomb(error, shown)
        # python-docx and lxml signal a broken package with many unrelated types (KeyError,
        # ValueError, XMLSyntaxError, zlib.error, ...); here each of them means a broken file.
        raise CorruptFile(
            f"the DOCX is damaged and cannot be opened ({type(error).__name__}: "
            f"{_one_line(str(error))})",
            path=shown,
        ) from error
    if main.content_type not in _WORD_MAIN_TYPES:
        raise UnsupportedFormat("this is a ZIP archive but not a Word document", path=shown)
    return package


def _related(part: Part, reltype: str) -> Part | None:
    for rel in part.rels.values():
        if rel.reltype == reltype and not rel.is_external:
            target: Part = rel.target_part
            return target
    return None


def _element(part: Part, shown: str) -> Element:
    """The root XML element of a part; python-docx parses only the part types it knows."""
    from docx.opc.part import XmlPart
    from docx.oxml.parser import parse_xml

    if isinstance(part, XmlPart):
        return part.element
    try:
        return parse_xml(part.blob)
    except (SyntaxError, ValueError) as error:  # lxml's XMLSyntaxError is a SyntaxError
        _refuse_entity_bomb(error, shown)
        raise CorruptFile(
            f"the DOCX part {part.partname} is damaged (not well-formed XML)", path=shown
        ) from error


def _one_line(text: str, limit: int = 120) -> str:
    """A library's message as one short line (lxml's end in a newline and a position)."""
    text = " ".join(text.split())
    return text if len(text) <= limit else text[: limit - 3] + "..."


def _refuse_entity_bomb(error: Exception, shown: str) -> None:
    """Name an entity-expansion attack that libxml2 stopped, rather than call it damage.

    Entities are never expanded (see :func:`_parser_resolves_entities`), but libxml2 2.11+
    still measures what a referenced entity would expand to and stops at its amplification
    limit ("Maximum entity amplification factor exceeded").
    """
    if "amplification" in str(error):
        raise CorruptFile(
            "the DOCX declares XML entities that would expand enormously (an "
            "entity-expansion attack); it was not read",
            path=shown,
        ) from error


def _record_exclusions(package: Package, builder: DocumentBuilder, shown: str) -> None:
    from docx.opc.constants import CONTENT_TYPE as CT

    running_text = False
    comments = 0
    for part in package.iter_parts():
        if part.content_type in (CT.WML_HEADER, CT.WML_FOOTER) and not running_text:
            root = _element(part, shown)
            running_text = any((node.text or "").strip() for node in root.iter(w("t")))
        elif part.content_type == CT.WML_COMMENTS:
            comments += sum(1 for _ in _element(part, shown).iterchildren(w("comment")))
    if running_text:
        builder.exclude("page headers and footers")
    if comments:
        builder.exclude(f"{comments} comment{'s' if comments != 1 else ''}")
