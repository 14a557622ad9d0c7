"""Checks that an exported file is whole, run on the temporary file before it replaces anything.

Each check reads the file back from disk and parses its structure, so a writer that failed quietly
(a full disk under Qt's PDF writer, a killed painter) is caught while the previous file is still in
place. They raise ``ValueError`` with the reason, which :func:`pmdc_sizer.core.atomic_files.replacing`
turns into one line naming the file.

References
----------
.. [1] ISO 32000-1:2008, 7.5 (PDF file structure: header, cross-reference table, trailer, ``startxref``
   and ``%%EOF``).
.. [2] ISO/IEC 15948:2004 (PNG): the signature, chunks of length, type, data and CRC-32, ending in IEND.
"""

from __future__ import annotations

import csv
import io
import re
import struct
import zlib
from collections.abc import Callable
from pathlib import Path
from xml.etree import ElementTree

_PNG_SIGNATURE = b"\x89PNG\r\n\x1a\n"
_XREF_ENTRY = re.compile(rb"(\d{10}) (\d{5}) ([nf])")
_OBJECT_AT = re.compile(rb"\s*\d+\s+\d+\s+obj\b")


def check_pdf(path: Path, pages: int | None = None) -> None:
    """A PDF whose header, trailer and cross-reference table are whole, with every object where it says.

    Parameters
    ----------
    path : Path
        The temporary PDF, read back whole from disk.
    pages : int, optional
        The number of pages it must have (the page tree's ``/Count``).

    Raises
    ------
    ValueError
        Naming what is missing or out of place.
    """
    data = path.read_bytes()
    if not data.startswith(b"%PDF-"):
        raise ValueError("it does not start as a PDF file")
    tail = data[-2048:]
    found = list(re.finditer(rb"startxref\s+(\d+)\s+%%EOF", tail))
    if not found:
        raise ValueError(f"the PDF ends early ({len(data):,} bytes, no trailer)")
    offset = int(found[-1].group(1))
    if not 0 < offset < len(data):
        raise ValueError("the PDF's cross-reference offset points outside the file")
    section = data[offset:]
    if section.startswith(b"xref"):
        header = re.match(rb"xref\s+(\d+)\s+(\d+)\s+", section)
        if header is None:
            raise ValueError("the PDF's cross-reference table is damaged")
        count = int(header.group(2))
        entries = _XREF_ENTRY.findall(section[header.end():header.end() + 20 * count + 40])
        if len(entries) < count:
            raise ValueError("the PDF's cross-reference table is incomplete")
        for position, _generation, kind in entries[:count]:
            if kind == b"n" and not _OBJECT_AT.match(data, int(position)):
                raise ValueError("an object of the PDF is not where its cross-reference table says")
    elif not _OBJECT_AT.match(section):  # a cross-reference stream (PDF 1.5) starts with its object
        raise ValueError("the PDF's cross-reference section is missing")
    if pages is not None:
        counts = re.findall(rb"/Type\s*/Pages\b[^>]*?/Count\s+(\d+)", data) or re.findall(
            rb"/Count\s+(\d+)[^>]*?/Type\s*/Pages\b", data)
        if not counts or int(counts[0]) != pages:
            raise ValueError(f"the PDF does not have the {pages} pages it was given")


def check_png(path: Path) -> None:
    """A PNG whose every chunk is whole (length, CRC-32) and that ends with its IEND chunk.

    Parameters
    ----------
    path : Path
        The written file.

    Raises
    ------
    ValueError
        Naming what is wrong.
    """
    data = path.read_bytes()
    if not data.startswith(_PNG_SIGNATURE):
        raise ValueError("it does not start as a PNG image")
    position = len(_PNG_SIGNATURE)
    kind = b""
    while position + 12 <= len(data):
        (length,) = struct.unpack(">I", data[position:position + 4])
        kind = data[position + 4:position + 8]
        end = position + 12 + length
        if end > len(data):
            raise ValueError("the PNG image ends inside a chunk")
        (crc,) = struct.unpack(">I", data[end - 4:end])
        if zlib.crc32(data[position + 4:end - 4]) != crc:
            raise ValueError(f"the PNG image's {kind.decode('latin-1')} chunk is damaged")
        position = end
        if kind == b"IEND":
            break
    if kind != b"IEND":
        raise ValueError("the PNG image ends early")


def check_svg(path: Path) -> None:
    """An SVG drawing that parses as XML with an ``svg`` root.

    Raises
    ------
    ValueError
        When it does not parse or is not an SVG drawing.
    """
    try:
        root = ElementTree.fromstring(path.read_bytes())
    except ElementTree.ParseError as error:
        raise ValueError(f"the SVG drawing does not parse ({error})") from None
    if not root.tag.endswith("svg"):
        raise ValueError("the file is not an SVG drawing")


def check_html(path: Path) -> None:
    """A UTF-8 web page that ends with its closing ``</html>``.

    Raises
    ------
    ValueError
        When it is not UTF-8 or stops before its end.
    """
    try:
        text = path.read_bytes().decode("utf-8")
    except UnicodeDecodeError:
        raise ValueError("the web page is not whole UTF-8 text") from None
    if "<html" not in text[:2000].lower() or not text.rstrip().lower().endswith("</html>"):
        raise ValueError("the web page stops before its end")


def check_csv(path: Path, rows: int | None = None) -> None:
    """A CSV table whose every row has the header's number of columns.

    Parameters
    ----------
    path : Path
        The temporary table, read back as UTF-8.
    rows : int, optional
        The number of data rows (after the header) it must have.

    Raises
    ------
    ValueError
        When a row is short or rows are missing.
    """
    table = list(csv.reader(io.StringIO(path.read_bytes().decode("utf-8"))))
    if not table:
        raise ValueError("the table is empty")
    width = len(table[0])
    if any(len(row) != width for row in table[1:]):
        raise ValueError("a row of the table is incomplete")
    if rows is not None and len(table) - 1 != rows:
        raise ValueError(f"the table has {len(table) - 1} rows instead of {rows}")


def check_for(path: str | Path) -> Callable[[Path], None] | None:
    """The check for a file of this kind (by its extension), or None for a kind without one.

    Parameters
    ----------
    path : str or Path
        The target's name.

    Returns
    -------
    callable or None
        One of the checks above.
    """
    return {".pdf": check_pdf, ".png": check_png, ".svg": check_svg, ".html": check_html, ".htm": check_html,
            ".csv": check_csv}.get(Path(path).suffix.lower())
