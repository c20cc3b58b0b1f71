"""Property-based fuzzing of every reader on mutated bytes of the demo fixtures.

The property (docs/limits.md): whatever the bytes, :func:`matcheck.readers.read` returns a
Document or raises one of the project's own errors (a ``MatcheckError``), and prints nothing:
no library exception, warning or log line escapes. Mutations are bit flips, truncations,
insertions, deletions, repeats and splices (chunks copied from elsewhere in the file), on the
raw file and, for DOCX, on the XML parts inside the package, as bytes and as element trees
(dropped, copied, awkward attribute values), so that the parsers and the reader behind the
ZIP layer are reached; for PDF, on a copy whose page content streams are not compressed (so the
content-stream parser is reached).

CI runs a small, derandomised sample (``max_examples`` 25 per reader). Maintainers run the
long fuzz with ``pytest -m slow tests/test_fuzz.py`` (2,000 examples per reader, random).
"""

from __future__ import annotations

import io
import logging
import shutil
import warnings
import zipfile
from collections.abc import Callable
from dataclasses import dataclass
from functools import cache
from pathlib import Path
from typing import Any

import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from matcheck.errors import MatcheckError
from matcheck.model import Document
from matcheck.readers import read

DEMO = Path(__file__).resolve().parent.parent / "fixtures" / "demo"
CI = settings(
    max_examples=25,
    deadline=None,
    derandomize=True,
    database=None,
    suppress_health_check=[HealthCheck.too_slow, HealthCheck.data_too_large],
)
LONG = settings(
    max_examples=2000,
    deadline=None,
    suppress_health_check=[HealthCheck.too_slow, HealthCheck.data_too_large],
)


# -- mutations -------------------------------------------------------------------------------------

# Each mutation is a tuple: a kind and positions as fractions of the data's length, so that
# one strategy fits files of every size.
Mutation = tuple[Any, ...]

_fraction = st.floats(min_value=0.0, max_value=1.0, allow_nan=False)
_mutation = st.one_of(
    st.tuples(st.just("flip"), _fraction, st.integers(0, 7)),
    st.tuples(st.just("truncate"), st.floats(min_value=0.02, max_value=1.0)),
    st.tuples(st.just("insert"), _fraction, st.binary(min_size=1, max_size=64)),
    st.tuples(st.just("delete"), _fraction, st.integers(1, 512)),
    st.tuples(st.just("repeat"), _fraction, st.integers(1, 256), st.integers(2, 16)),
    st.tuples(st.just("splice"), _fraction, _fraction, st.integers(1, 1024)),
)
_mutations = st.lists(_mutation, min_size=1, max_size=6)


def mutate(data: bytes, mutations: list[Mutation]) -> bytes:
    out = bytearray(data)
    for kind, *args in mutations:
        at = min(int(args[0] * len(out)), max(len(out) - 1, 0))
        if kind == "flip" and out:
            out[at] ^= 1 << args[1]
        elif kind == "truncate":
            del out[at:]
        elif kind == "insert":
            out[at:at] = args[1]
        elif kind == "delete":
            del out[at : at + args[1]]
        elif kind == "repeat":
            out[at:at] = out[at : at + args[1]] * (args[2] - 1)
        elif kind == "splice":
            source = int(args[1] * len(out))
            out[at:at] = out[source : source + args[2]]
    return bytes(out)


# -- seeds -----------------------------------------------------------------------------------------


@dataclass(frozen=True)
class Seed:
    name: str  # the file name the mutated bytes are written under
    data: bytes
    members: dict[str, bytes] | None = None  # a DOCX's parts, for mutations inside the ZIP


def _docx_seeds() -> list[Seed]:
    seeds = []
    for name in ("diagrams.docx", "text-only.docx"):
        data = (DEMO / name).read_bytes()
        with zipfile.ZipFile(io.BytesIO(data)) as archive:
            members = {info.filename: archive.read(info) for info in archive.infolist()}
        seeds.append(Seed(name, data, members))
    return seeds


def _uncompressed_pdf(path: Path) -> bytes:
    from pypdf import PdfWriter
    from pypdf.generic import ContentStream

    writer = PdfWriter(clone_from=str(path))
    for page in writer.pages:
        contents = page.get_contents()
        if contents is not None:
            page.replace_contents(ContentStream(contents, writer))  # written unfiltered
    stream = io.BytesIO()
    writer.write(stream)
    return stream.getvalue()


def _pdf_seeds() -> list[Seed]:
    seeds = [Seed(name, (DEMO / name).read_bytes()) for name in ("diagrams.pdf", "text-only.pdf")]
    seeds.append(Seed("plain-streams.pdf", _uncompressed_pdf(DEMO / "diagrams.pdf")))
    return seeds


def _text_seeds(suffix: str) -> list[Seed]:
    names = ("diagrams.md", "text-only.md")
    return [Seed(Path(name).stem + suffix, (DEMO / name).read_bytes()) for name in names]


SEEDS: dict[str, Callable[[], list[Seed]]] = {
    "docx": _docx_seeds,
    "pdf": _pdf_seeds,
    "markdown": lambda: _text_seeds(".md"),
    "text": lambda: _text_seeds(".txt"),
}


# Element-tree mutations of a DOCX part, which keep the XML well-formed so that the reader
# behind the parser is reached: drop an element, copy one into another, set an attribute or
# a text to an awkward value.
_AWKWARD = ("", "0", "-1", "1", "9", "999999999", "-2147483649", "1e308", "nan", "x", "true")
_tree_mutation = st.one_of(
    st.tuples(st.just("drop"), _fraction),
    st.tuples(st.just("copy"), _fraction, _fraction),
    st.tuples(st.just("attribute"), _fraction, st.integers(0, 5), st.sampled_from(_AWKWARD)),
    st.tuples(st.just("text"), _fraction, st.sampled_from(_AWKWARD)),
)
_tree_mutations = st.lists(_tree_mutation, min_size=1, max_size=8)


def mutate_tree(data: bytes, mutations: list[Mutation]) -> bytes:
    import copy

    from lxml import etree

    root = etree.fromstring(data, etree.XMLParser(resolve_entities=False))
    for kind, *args in mutations:
        elements = list(root.iter())
        element = elements[min(int(args[0] * len(elements)), len(elements) - 1)]
        if kind == "drop" and element is not root:
            element.getparent().remove(element)
        elif kind == "copy":
            target = elements[min(int(args[1] * len(elements)), len(elements) - 1)]
            if element is not root and not any(node is element for node in target.iterancestors()):
                target.append(copy.deepcopy(element))
        elif kind == "attribute" and element.attrib:
            names = sorted(element.attrib)
            element.set(names[args[1] % len(names)], args[2])
        elif kind == "text":
            element.text = args[1]
    return bytes(etree.tostring(root, xml_declaration=True, encoding="UTF-8", standalone=True))


def _inside_zip(
    seed: Seed, part: int, mutations: list[Mutation], change: Callable[..., bytes] = mutate
) -> bytes:
    assert seed.members is not None
    xml = sorted(name for name in seed.members if name.endswith((".xml", ".rels")))
    target = xml[part % len(xml)]
    stream = io.BytesIO()
    with zipfile.ZipFile(stream, "w", zipfile.ZIP_DEFLATED) as archive:
        for name, data in seed.members.items():
            archive.writestr(name, change(data, mutations) if name == target else data)
    return stream.getvalue()


# -- the property ----------------------------------------------------------------------------------


class _Records(logging.Handler):
    def __init__(self) -> None:
        super().__init__(logging.WARNING)
        self.records: list[logging.LogRecord] = []

    def emit(self, record: logging.LogRecord) -> None:
        self.records.append(record)


def check_reads_or_refuses(path: Path) -> Document | MatcheckError:
    """Read ``path``; only a Document or a MatcheckError may come out, and nothing printed."""
    handler = _Records()
    root = logging.getLogger()
    root.addHandler(handler)
    try:
        with warnings.catch_warnings(record=True) as caught:
            warnings.simplefilter("always")
            try:
                result: Document | MatcheckError = read(path)
            except MatcheckError as error:
                result = error
                assert str(error).startswith(str(path)), str(error)  # it names the file
                assert "\n" not in str(error)  # one line
    finally:
        root.removeHandler(handler)
    assert [str(warning.message) for warning in caught] == []
    assert [record.getMessage() for record in handler.records] == []
    return result


@pytest.fixture(scope="module")
def workdir(tmp_path_factory: pytest.TempPathFactory) -> Path:
    folder = tmp_path_factory.mktemp("fuzz")
    shutil.copytree(DEMO / "images", folder / "images")  # the Markdown fixtures link them
    return folder


@cache
def seeds(fmt: str) -> tuple[Seed, ...]:
    return tuple(SEEDS[fmt]())


def _fuzz_once(workdir: Path, fmt: str, data: st.DataObject) -> None:
    # Seeds are drawn by index so that a failure report shows a number, not megabytes.
    index = data.draw(st.integers(0, len(seeds(fmt)) - 1), label="seed")
    seed = seeds(fmt)[index]
    where = "bytes"
    if seed.members is not None:
        where = data.draw(st.sampled_from(["bytes", "part bytes", "part tree"]), label="where")
    if where == "part tree":
        mutations = data.draw(_tree_mutations, label="mutations")
    else:
        mutations = data.draw(_mutations, label="mutations")
    if where == "bytes":
        content = mutate(seed.data, mutations)
    else:
        part = data.draw(st.integers(0, 100), label="part")
        change = mutate_tree if where == "part tree" else mutate
        content = _inside_zip(seed, part, mutations, change)
    path = workdir / seed.name
    path.write_bytes(content)
    check_reads_or_refuses(path)


@pytest.mark.parametrize("fmt", list(SEEDS))
@CI
@given(data=st.data())
def test_fuzz_readers(fmt: str, workdir: Path, data: st.DataObject) -> None:
    _fuzz_once(workdir, fmt, data)


@pytest.mark.slow
@pytest.mark.parametrize("fmt", list(SEEDS))
@LONG
@given(data=st.data())
def test_fuzz_readers_long(fmt: str, workdir: Path, data: st.DataObject) -> None:
    _fuzz_once(workdir, fmt, data)


def test_unmutated_seeds_read(workdir: Path) -> None:
    # The fuzz starts from files that read: each seed gives a Document with text.
    for fmt in SEEDS:
        for seed in seeds(fmt):
            path = workdir / seed.name
            path.write_bytes(seed.data)
            result = check_reads_or_refuses(path)
            assert isinstance(result, Document), (fmt, seed.name, result)
            assert result.format == fmt
            assert result.blocks


@pytest.mark.parametrize(
    ("mutations", "expected"),
    [
        ([("flip", 0.0, 0)], b"\x01bc"),
        ([("truncate", 0.5)], b"a"),
        ([("insert", 0.0, b"zz")], b"zzabc"),
        ([("delete", 0.34, 1)], b"ac"),
        ([("repeat", 0.0, 1, 3)], b"aaabc"),
        ([("splice", 0.0, 0.67, 1)], b"cabc"),
    ],
)
def test_mutations_do_what_they_say(mutations: list[Mutation], expected: bytes) -> None:
    data = b"\x00bc" if mutations[0][0] == "flip" else b"abc"
    assert mutate(data, mutations) == expected


# -- regressions: what the long fuzz found, each fixed in the readers ------------------------------


def test_regression_lxml_message_is_one_line(workdir: Path) -> None:
    # Found: a NUL byte appended to [Content_Types].xml. lxml's message ends in a newline
    # and a position, which made the CLI's error two lines.
    seed = seeds("docx")[0]
    path = workdir / "nul.docx"
    path.write_bytes(_inside_zip(seed, 0, [("insert", 1.0, b"\x00")]))
    result = check_reads_or_refuses(path)
    assert isinstance(result, MatcheckError)
    assert "damaged" in str(result)


def test_regression_unknown_pdf_filter_is_corrupt(workdir: Path) -> None:
    # Found: one flipped bit turned /FlateDecode into /FlateDecodd; pypdf raised
    # NotImplementedError("Unsupported filter"), which escaped the page reader.
    data = (DEMO / "diagrams.pdf").read_bytes()
    assert b"/FlateDecode" in data
    path = workdir / "filter.pdf"
    path.write_bytes(data.replace(b"/FlateDecode", b"/FlateDecodd"))  # same length: xref holds
    result = check_reads_or_refuses(path)
    assert isinstance(result, MatcheckError)
    assert "Unsupported filter /FlateDecodd" in str(result)


def test_regression_file_name_with_a_newline(workdir: Path) -> None:
    # A hostile name must not split the one-line error; it is shown escaped.
    path = workdir / "two\nlines.md"
    path.write_bytes(b"")
    with pytest.raises(MatcheckError) as caught:
        read(path)
    assert "\n" not in str(caught.value)
    assert "two\\nlines.md" in str(caught.value)


# -- study files and the post-test CSV -----------------------------------------------------------

# Byte strings a hostile study would try: paths out of the folder, special files, a BOM,
# control characters, TOML structure and deep nesting.
_HOSTILE = st.sampled_from(
    [
        b"../",
        b"/etc/passwd",
        b"/dev/zero",
        b"\xef\xbb\xbf",
        b"\x00",
        b"\x1b[31m",
        b'"\n::error::x\n"',
        b"[[conditions]]\n",
        b"[" * 2000,
        b"{ a = " * 200,
        b"\r",
        b"\xff\xfe",
        b"\\u0000",
    ]
)
_study_mutations = st.lists(
    st.one_of(_mutation, st.tuples(st.just("insert"), _fraction, _HOSTILE)), min_size=1, max_size=6
)


@pytest.fixture(scope="module")
def study_folder(tmp_path_factory: pytest.TempPathFactory) -> Path:
    folder = tmp_path_factory.mktemp("study") / "demo"
    shutil.copytree(DEMO, folder, ignore=shutil.ignore_patterns("*.json"))
    return folder


def _loads_or_refuses(load: Callable[[], Any], name: str) -> Any:
    """Run ``load``: only a result or a one-line MatcheckError naming ``name`` may come out."""
    with warnings.catch_warnings(record=True) as caught:
        warnings.simplefilter("always")
        try:
            result = load()
        except MatcheckError as error:
            assert name in str(error), str(error)
            assert "\n" not in str(error) and "\r" not in str(error)
            result = error
    assert [str(warning.message) for warning in caught] == []
    return result


@CI
@given(mutations=_study_mutations)
def test_fuzz_study_files(study_folder: Path, mutations: list[Mutation]) -> None:
    _fuzz_study(study_folder, mutations)


@pytest.mark.slow
@LONG
@given(mutations=_study_mutations)
def test_fuzz_study_files_long(study_folder: Path, mutations: list[Mutation]) -> None:
    _fuzz_study(study_folder, mutations)


def _fuzz_study(study_folder: Path, mutations: list[Mutation]) -> None:
    from matcheck.paths import inside
    from matcheck.study import Study, load_study

    path = study_folder / "fuzzed.toml"
    path.write_bytes(mutate((DEMO / "study.toml").read_bytes(), mutations))
    result = _loads_or_refuses(lambda: load_study(path), "fuzzed.toml")
    if isinstance(result, Study):  # every file it names stays in the folder (docs/limits.md)
        named = [*(f for c in result.conditions for f in c.files), *result.posttest]
        assert all(inside(file, study_folder) and file.is_file() for file in named)


@CI
@given(mutations=_study_mutations)
def test_fuzz_posttest_csv(study_folder: Path, mutations: list[Mutation]) -> None:
    _fuzz_posttest(study_folder, mutations)


@pytest.mark.slow
@LONG
@given(mutations=_study_mutations)
def test_fuzz_posttest_csv_long(study_folder: Path, mutations: list[Mutation]) -> None:
    _fuzz_posttest(study_folder, mutations)


def _fuzz_posttest(study_folder: Path, mutations: list[Mutation]) -> None:
    from matcheck.limits import DEFAULT_LIMITS
    from matcheck.readers.posttest import read_posttest

    path = study_folder / "fuzzed.csv"
    path.write_bytes(mutate((DEMO / "posttest.csv").read_bytes(), mutations))
    result = _loads_or_refuses(lambda: read_posttest(path, DEFAULT_LIMITS), "fuzzed.csv")
    assert isinstance(result, list | MatcheckError)
