"""The paged datasheet keeps a heading with what follows it and does not split a short table.

QTextDocument ignores CSS ``page-break-inside`` and keep-with-next; app/datasheet/document.py adds the
breaks itself (keep_together). These tests measure the laid-out pages, the way a reader sees them.
"""

from __future__ import annotations

import datetime as dt

import pytest
from PySide6.QtGui import QTextCursor

from pmdc_sizer.app import datasheet
from pmdc_sizer.app.datasheet.document import KEEP_WHOLE_SHARE, PagedDatasheet
from pmdc_sizer.app.datasheet.options import SheetOptions

ISSUED = dt.date(2026, 1, 15)


def _top_level_table(block, document):
    table = QTextCursor(block).currentTable()
    while table is not None and table.parentFrame() is not document.rootFrame():
        table = table.parentFrame()
    return table


def _pages(evaluated, edition: str) -> PagedDatasheet:
    datasheet.ensure_qt()
    design, results = evaluated
    sheet = datasheet.build(design, results, ISSUED, options=SheetOptions(edition=edition))
    return PagedDatasheet(sheet, results)


@pytest.mark.parametrize("edition", ["customer", "internal"])
def test_no_heading_ends_a_page_and_no_short_table_splits(evaluated, edition):
    paged = _pages(evaluated, edition)
    document, layout = paged.document, paged.document.documentLayout()
    height = document.pageSize().height()
    faults = []
    block = document.begin()
    while block.isValid():
        table = _top_level_table(block, document)
        if table is not None:
            rect = layout.frameBoundingRect(table)
            first, last = int(rect.top() // height), int((rect.bottom() - 1) // height)
            if first != last and rect.height() < KEEP_WHOLE_SHARE * height:
                faults.append(f"table at block {block.blockNumber()} ({block.text()[:30]!r}) split over pages "
                              f"{first + 1} and {last + 1}")
            block = document.findBlock(table.lastPosition() + 1)
            continue
        if block.blockFormat().headingLevel() > 0 and block.next().isValid():
            following = block.next()
            following_table = _top_level_table(following, document)
            top = (layout.frameBoundingRect(following_table) if following_table is not None
                   else layout.blockBoundingRect(following)).top()
            if int(top // height) > int(layout.blockBoundingRect(block).top() // height):
                faults.append(f"heading {block.text()!r} is the last thing on its page")
        block = block.next()
    assert not faults, "\n".join(faults)
    # a cap on the sheet's length; the internal edition of the scooter demo takes 8: its grade carries a
    # data note (a recoil permeability made consistent) that leaves the grade's table too tall for the
    # magnet page, and a table is kept whole rather than split
    assert paged.page_count <= (6 if edition == "customer" else 8)


def _broken_words(block) -> list[str]:
    """The places where the block's laid-out lines break inside a word (no space or hyphen at the break)."""
    text, layout = block.text(), block.layout()
    broken = []
    for index in range(layout.lineCount() - 1):
        end = layout.lineAt(index).textStart() + layout.lineAt(index).textLength()
        before, after = text[end - 1:end], text[end:end + 1]
        if before.strip() and after.strip() and before not in "-/,":
            broken.append(f"{text[:end]}|{text[end:]}")
    return broken


@pytest.mark.parametrize("edition", ["customer", "internal"])
def test_no_table_heading_breaks_a_word_or_its_unit(evaluated, edition):
    # A heading is read at a glance: "temperatur|e" or "[kA/|m]" is a layout fault (both were printed once).
    paged = _pages(evaluated, edition)
    document = paged.document
    faults = []
    block = document.begin()
    while block.isValid():
        if QTextCursor(block).currentTable() is not None:
            faults.extend(_broken_words(block))
            if "[" in block.text() and "/" in block.text() and block.layout().lineCount() > 1:
                unit = block.text()[block.text().rindex("["):]
                lines = [block.text()[block.layout().lineAt(i).textStart():][:block.layout().lineAt(i).textLength()]
                         for i in range(block.layout().lineCount())]
                if not any(unit.replace("\u2060", "") in line.replace("\u2060", "") for line in lines):
                    faults.append(f"unit {unit!r} split in {block.text()!r}")
        block = block.next()
    assert not faults, "\n".join(faults)
