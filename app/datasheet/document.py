"""Lay the datasheet out: a self-contained HTML file for browsers, and A4 pages for PDF and the preview.

The pages are a QTextDocument (Qt's rich-text subset of HTML) split into A4 pages, with a running
header and footer painted on each; the same routine paints PDF pages (QPdfWriter) and preview images
(QImage), so the preview shows what the PDF will hold.
"""

from __future__ import annotations

import base64
import html
import re

from PySide6.QtCore import QMarginsF, QPointF, QRectF, QSizeF, Qt, QUrl
from PySide6.QtGui import (
    QColor,
    QImage,
    QPageLayout,
    QPageSize,
    QPainter,
    QPdfWriter,
    QPen,
    QTextBlock,
    QTextBlockFormat,
    QTextCursor,
    QTextDocument,
    QTextFormat,
)

from pmdc_sizer.core.results import Results

from ..figures import STATUSES
from ..safety import DEFER_NOTE, ESTIMATES_NOTE
from . import charts
from .content import Chart, Columns, Datasheet, Paragraph, Picture, Table
from .options import PAPER_SIZES_MM
from .paper_units import printed_in

PAGE_MARGINS_MM = (17.0, 16.0, 17.0, 17.0)  #: left, top, right, bottom
HEADER_MM = 7.0  #: band above the body for the running header
FOOTER_MM = 8.0  #: band below the body for the footer
BODY_FONT_PT = 8.6
ACCENT = "#24476b"
STATUS_COLOURS = {**{name: style.colour for name, style in STATUSES.items()}, "worst": ACCENT}
ROW_SHADES = {"fail": STATUSES["fail"].shade, "warning": STATUSES["warning"].shade, "worst": "#e4edf7"}
FAIL = STATUS_COLOURS["fail"]

_e = html.escape


# ----------------------------------------------------------------------------------------------
# HTML for browsers


BROWSER_CSS = """
@page { size: PAPER; margin: 16mm 17mm 17mm 17mm;
        @top-left { content: "TITLE"; font-size: 7.5pt; color: #5b6470; }
        @bottom-right { content: "page " counter(page) " of " counter(pages); font-size: 7.5pt; color: #5b6470; } }
* { box-sizing: border-box; }
body { font-family: "DejaVu Sans", "Segoe UI", Helvetica, Arial, sans-serif; font-size: 10pt; color: #1b1f24;
       max-width: 190mm; margin: 0 auto; padding: 8mm 0; line-height: 1.35; }
header.sheet { border-bottom: 3px solid ACCENT; padding-bottom: 4mm; margin-bottom: 4mm; }
header.sheet img.logo { float: right; max-height: 14mm; max-width: 50mm; margin-left: 4mm; }
header.sheet .kind { color: ACCENT; font-size: 9pt; letter-spacing: 0.04em; text-transform: uppercase; }
header.sheet h1 { font-size: 18pt; margin: 1mm 0 2mm 0; }
header.sheet p.description { margin: 0 0 3mm 0; }
dl.identity { display: grid; grid-template-columns: repeat(3, auto 1fr); gap: 1mm 3mm; margin: 0; font-size: 9pt; }
dl.identity dt { color: #5b6470; } dl.identity dd { margin: 0; font-weight: 600; }
section.headline { display: grid; grid-template-columns: repeat(4, 1fr); gap: 2mm; margin: 0 0 5mm 0; }
section.headline div { border: 1px solid #c9d3de; border-top: 3px solid ACCENT; padding: 2mm 3mm; }
section.headline span { display: block; color: #5b6470; font-size: 8.5pt; }
section.headline b { font-size: 12pt; }
h2 { font-size: 12.5pt; color: ACCENT; border-bottom: 1px solid #c9d3de; padding-bottom: 1mm; margin: 6mm 0 2mm 0; }
table { border-collapse: collapse; width: 100%; margin: 2mm 0; font-size: 9pt; }
th { background: ACCENT; color: white; text-align: left; padding: 1.2mm 2mm; font-weight: 600; }
td { padding: 1mm 2mm; border-bottom: 1px solid #e3e7ec; vertical-align: top; }
td.num, th.num { text-align: right; white-space: nowrap; }
tr.group td { background: #eef2f6; font-weight: 700; color: ACCENT; }
tr.fail td { background: SHADE_fail; } tr.warning td { background: SHADE_warning; }
tr.worst td { background: SHADE_worst; }
tr.fail td.status, p.fail { color: COLOUR_fail; font-weight: 700; }
tr.warning td.status { color: COLOUR_warning; font-weight: 700; }
tr.pass td.status { color: COLOUR_pass; font-weight: 700; }
p.caption, p.note { color: #5b6470; font-size: 8.5pt; margin: 1mm 0 3mm 0; }
p.strong { font-weight: 700; }
p.caution { border-left: 3px solid COLOUR_fail; padding-left: 3mm; margin: 1.5mm 0; }
figure { margin: 3mm 0; } figure svg { width: 100%; height: auto; display: block; }
figcaption { color: #5b6470; font-size: 8.5pt; }
footer.sheet { margin-top: 8mm; border-top: 1px solid #c9d3de; padding-top: 2mm; color: #5b6470; font-size: 8pt; }
.pagebreak { break-before: page; }
h3 { font-size: 10pt; margin: 3mm 0 1mm 0; color: #1b1f24; }
div.columns { display: grid; grid-template-columns: 1fr 1fr; gap: 6mm; }
dl.identity { grid-template-columns: repeat(4, auto 1fr); }
section.headline { grid-template-columns: repeat(5, 1fr); }
div.block, table, figure, tr, p.caution { break-inside: avoid; page-break-inside: avoid; }
section.keep { break-inside: avoid; page-break-inside: avoid; }
h2, h3 { break-after: avoid; page-break-after: avoid; }
.pagebreak { page-break-before: always; }
@media print { body { padding: 0; max-width: none; } footer.sheet { break-inside: avoid; } }
"""
for _name, _value in (*((f"COLOUR_{k}", v) for k, v in STATUS_COLOURS.items()),
                      *((f"SHADE_{k}", v) for k, v in ROW_SHADES.items()), ("ACCENT", ACCENT)):
    BROWSER_CSS = BROWSER_CSS.replace(_name, _value)


def _strip_xml_prolog(svg: str) -> str:
    """An SVG document made fit to sit inside HTML: no XML declaration or DOCTYPE."""
    svg = re.sub(r"<\?xml[^>]*\?>", "", svg)
    svg = re.sub(r"<!DOCTYPE[^>]*>", "", svg, flags=re.IGNORECASE)
    return svg.strip()


def _browser_table(table: Table) -> str:
    columns = len(table.header)
    out = ['<div class="block">']
    if table.title:
        out.append(f'<h3>{_e(table.title)}</h3>')
    out.append(f'<table id="{table.key}">' if table.key else "<table>")
    if any(table.header):
        out.append("<thead><tr>" + "".join(
            f'<th class="{"num" if table.is_numeric(i) else ""}">{_e(h)}</th>' for i, h in enumerate(table.header))
            + "</tr></thead>")
    out.append("<tbody>")
    for row in table.rows:
        if row.kind == "group":
            out.append(f'<tr class="group"><td colspan="{columns}">{_e(row.cells[0])}</td></tr>')
            continue
        cells = []
        for i, cell in enumerate(row.cells):
            classes = []
            if table.is_numeric(i):
                classes.append("num")
            if i == 0 and table.numeric_from == 99:
                classes.append("status")
            cells.append(f'<td class="{" ".join(classes)}">{_e(cell)}</td>')
        out.append(f'<tr class="{row.kind}">' + "".join(cells) + "</tr>")
    out.append("</tbody></table>")
    if table.caption:
        out.append(f'<p class="caption">{_e(table.caption)}</p>')
    out.append("</div>")
    return "\n".join(out)


def _browser_block(block, svgs: dict[str, str]) -> str:
    if isinstance(block, Table):
        return _browser_table(block)
    if isinstance(block, Chart):
        return (f'<figure id="chart-{block.name}">{svgs[block.name]}'
                f'<figcaption>{_e(block.caption)}</figcaption></figure>')
    if isinstance(block, Picture):
        data = base64.b64encode(block.png).decode("ascii")
        return (f'<figure id="picture-{block.name}"><img src="data:image/png;base64,{data}" alt="{_e(block.caption)}"'
                f' style="width: 100%;"/><figcaption>{_e(block.caption)}</figcaption></figure>')
    if isinstance(block, Columns):
        halves = ("\n".join(_browser_block(b, svgs) for b in side) for side in (block.left, block.right))
        return '<div class="columns">' + "".join(f"<div>{half}</div>" for half in halves) + "</div>"
    if isinstance(block, Paragraph):
        return f'<p class="{block.kind}">{_e(block.text)}</p>'
    raise TypeError(f"unknown datasheet block {block!r}")


def browser_css(sheet: Datasheet) -> str:
    """The stylesheet, with the sheet's paper size and its running header for printing."""
    title = f"{sheet.title}, revision {sheet.revision}".replace("\\", "").replace('"', "'")
    return BROWSER_CSS.replace("PAPER", sheet.options.paper).replace("TITLE", _e(title, quote=False))


def _logo_html(sheet: Datasheet, logo_png: bytes | None) -> str:
    if not logo_png:
        return ""
    data = base64.b64encode(logo_png).decode("ascii")
    return f'<img class="logo" src="data:image/png;base64,{data}" alt="logo"/>'


def browser_html(sheet: Datasheet, results: Results, logo_png: bytes | None = None) -> str:
    """The datasheet as one self-contained HTML file (well-formed XHTML syntax; charts as inline SVG)."""
    with printed_in(sheet.options.units):
        svgs = {name: _strip_xml_prolog(charts.chart_svg(name, results, f"{sheet.title}: {name} chart"))
                for name in charts.SHEET_DRAWINGS}
    identity = "".join(f"<dt>{_e(k)}</dt><dd>{_e(v)}</dd>" for k, v in sheet.identity)
    headline = "".join(f"<div><span>{_e(k)}</span><b>{_e(v)}</b></div>" for k, v in sheet.headline)
    body = []
    for section in sheet.sections:
        css = ' class="pagebreak"' if section.new_page else ""
        blocks = "\n".join(_browser_block(b, svgs) for b in section.blocks)
        body.append(f'<section id="{section.key}"{css}><h2>{_e(section.title)}</h2>\n{blocks}</section>')
    return (
        "<!DOCTYPE html>\n"
        '<html xmlns="http://www.w3.org/1999/xhtml" lang="en"><head><meta charset="utf-8"/>'
        f"<title>{_e(sheet.title)}, revision {_e(sheet.revision)}</title>"
        '<meta name="generator" content="pmdc-sizer"/>'
        f"<style>{browser_css(sheet)}</style></head><body>\n"
        f'<header class="sheet">{_logo_html(sheet, logo_png)}<div class="kind">{_e(sheet.subtitle)}</div>'
        f'<h1>{_e(sheet.title)}</h1>'
        + (f'<p class="description">{_e(sheet.description)}</p>' if sheet.description else "")
        + f'<dl class="identity">{identity}</dl></header>\n'
        f'<section class="headline" id="headline">{headline}</section>\n'
        + "\n".join(body)
        + f'\n<footer class="sheet">{_e(sheet.title)}, revision {_e(sheet.revision)}, issued {_e(sheet.issued)}. '
        f"Made with pmdc-sizer. {_e(ESTIMATES_NOTE)} {_e(DEFER_NOTE)}</footer>\n</body></html>\n"
    )


# ----------------------------------------------------------------------------------------------
# Qt rich text for the paged document


def _gap(table: Table, column: int, px_per_mm: float, nowrap: bool = False) -> str:
    """Extra room on the left of a cell that follows another column, so right-aligned figures and the next
    column's words never touch ("95.0 kA/m safe")."""
    styles = [f"padding-left: {1.6 * px_per_mm:.0f}px"] if column > 0 else []
    if nowrap:
        styles.append("white-space: nowrap")
    return f' style="{"; ".join(styles)};"' if styles else ""


def _header_text(header: str) -> str:
    """A column heading whose words wrap but whose unit ("[kA/m]") stays whole on one line."""
    name, bracket, unit = header.rpartition(" [")
    if not bracket:
        return _e(header)
    # Qt's rich text ignores white-space on a span; a word joiner after each solidus forbids the break there.
    return f"{_e(name)} [{_e(unit).replace('/', '/' + chr(0x2060))}"


def _qt_table(table: Table, px_per_mm: float) -> str:
    columns = len(table.header)
    widths = table.widths or (1,) * columns
    total = sum(widths)
    pad = f"{0.42 * px_per_mm:.0f}"
    out = []
    if table.title:
        # A heading (level 3), so that the page breaker keeps it with its table.
        out.append(f'<h3 style="font-weight: 700; font-size: {BODY_FONT_PT + 0.8}pt; margin-top: 6pt; '
                   'margin-bottom: 2pt;">'
                   f"{_e(table.title)}</h3>")
    out.append(f'<table width="100%" cellspacing="0" cellpadding="{pad}" style="border-collapse: collapse;">')
    if any(table.header):
        out.append("<thead><tr>" + "".join(
            f'<th width="{100 * w / total:.0f}%" bgcolor="{ACCENT}" '
            f'align="{"right" if table.is_numeric(i) else "left"}"{_gap(table, i, px_per_mm)}>'
            f'<span style="color: white; font-weight: 600;">{_header_text(h)}</span></th>'
            for i, (h, w) in enumerate(zip(table.header, widths, strict=False))) + "</tr></thead>")
    shade = False
    for index, row in enumerate(table.rows):
        if row.kind == "group":
            out.append(f'<tr><td colspan="{columns}" bgcolor="#e6ecf2"><b><span style="color: {ACCENT};">'
                       f"{_e(row.cells[0])}</span></b></td></tr>")
            shade = False
            continue
        background = ROW_SHADES.get(row.kind) or ("#f4f6f9" if shade else "#ffffff")
        shade = not shade
        cells = []
        for i, cell in enumerate(row.cells):
            width = f' width="{100 * widths[i] / total:.0f}%"' if index == 0 and not any(table.header) else ""
            numeric = table.is_numeric(i)
            align = "right" if numeric else "left"
            text = _e(cell)
            if i == 0 and table.numeric_from == 99 and row.kind in STATUS_COLOURS:
                text = f'<b><span style="color: {STATUS_COLOURS[row.kind]};">{text}</span></b>'
            elif row.kind == "fail" and i == len(row.cells) - 1 and table.numeric_from != 99:
                text = f'<b><span style="color: {STATUS_COLOURS["fail"]};">{text}</span></b>'
            # Figures, and the verdict words after them, stay on one line.
            nowrap = ' style="white-space: nowrap;"' if i >= table.numeric_from and any(table.header) else ""
            gap = _gap(table, i, px_per_mm, nowrap=bool(nowrap))
            cells.append(f'<td{width} align="{align}" bgcolor="{background}"{gap}>{text}</td>')
        out.append("<tr>" + "".join(cells) + "</tr>")
    out.append("</table>")
    if table.caption:
        out.append(f'<p style="color: #5b6470; font-size: {BODY_FONT_PT - 0.8}pt; margin-top: 1pt;">'
                   f'{_e(table.caption)}</p>')
    return "".join(out)


def _qt_block(block, body_width_px: float, px_per_mm: float) -> str:
    if isinstance(block, Table):
        return _qt_table(block, px_per_mm)
    if isinstance(block, Columns):
        halves = ["".join(_qt_block(b, body_width_px / 2, px_per_mm) for b in side)
                  for side in (block.left, block.right)]
        return ('<table width="100%" cellspacing="0" cellpadding="0" style="margin-top: 6pt;"><tr>'
                f'<td width="48%" valign="top">{halves[0]}</td><td width="4%"></td>'
                f'<td width="48%" valign="top">{halves[1]}</td></tr></table>')
    if isinstance(block, Picture):
        return (f'<p align="center" style="margin-top: 4pt; margin-bottom: 0;"><img src="picture:{block.name}" '
                f'width="{body_width_px:.0f}"/></p>'
                f'<p style="color: #5b6470; font-size: {BODY_FONT_PT - 0.8}pt; margin-top: 0;">{_e(block.caption)}</p>')
    if isinstance(block, Chart):
        return (f'<p align="center" style="margin-top: 4pt; margin-bottom: 0;"><img src="chart:{block.name}" '
                f'width="{body_width_px:.0f}"/></p>'
                f'<p style="color: #5b6470; font-size: {BODY_FONT_PT - 0.8}pt; margin-top: 0;">{_e(block.caption)}</p>')
    if isinstance(block, Paragraph):
        style = {
            "note": f"color: #5b6470; font-size: {BODY_FONT_PT - 0.6}pt;",
            "strong": "font-weight: 700;",
            "fail": f"font-weight: 700; color: {FAIL};",
        }.get(block.kind, "")
        prefix = f'<span style="color: {FAIL}; font-weight: 700;">⚠ </span>' if block.kind == "caution" else ""
        return f'<p style="{style} margin-top: 3pt; margin-bottom: 3pt;">{prefix}{_e(block.text)}</p>'
    raise TypeError(f"unknown datasheet block {block!r}")


def qt_html(sheet: Datasheet, body_width_px: float, px_per_mm: float, logo: bool = False) -> str:
    def grid(items, per_row, cell):
        rows = []
        for start in range(0, len(items), per_row):
            rows.append("<tr>" + "".join(cell(k, v) for k, v in items[start:start + per_row]) + "</tr>")
        return "".join(rows)

    identity = grid(list(sheet.identity), 4, lambda k, v: (
        f'<td width="9%"><span style="color: #5b6470;">{_e(k)}</span></td><td width="16%"><b>{_e(v)}</b></td>'))
    headline = grid(list(sheet.headline), 5, lambda k, v: (
        f'<td width="20%" bgcolor="#eef2f6"><span style="color: #5b6470; font-size: {BODY_FONT_PT - 0.6}pt;">'
        f'{_e(k)}</span><br/><span style="font-size: {BODY_FONT_PT + 2.6}pt; font-weight: 700;">{_e(v)}</span></td>'))
    parts = [
        f'<img src="picture:logo" height="{14 * px_per_mm:.0f}" style="float: right;"/>' if logo else "",
        f'<p style="color: {ACCENT}; font-size: {BODY_FONT_PT - 0.4}pt; margin: 0;">{_e(sheet.subtitle.upper())}</p>',
        f'<h1 style="font-size: {BODY_FONT_PT + 8}pt; margin-top: 2pt; margin-bottom: 4pt;">{_e(sheet.title)}</h1>',
    ]
    if sheet.description:
        parts.append(f'<p style="margin-top: 0; margin-bottom: 6pt;">{_e(sheet.description)}</p>')
    parts.append(f'<table width="100%" cellspacing="0" cellpadding="{0.4 * px_per_mm:.0f}">{identity}</table>')
    parts.append(f'<table width="100%" cellspacing="{1.2 * px_per_mm:.0f}" cellpadding="{1.2 * px_per_mm:.0f}" '
                 f'style="margin-top: 6pt;">{headline}</table>')
    for section in sheet.sections:
        page_break = "page-break-before: always; " if section.new_page else ""
        parts.append(f'<h2 style="{page_break}font-size: {BODY_FONT_PT + 3}pt; color: {ACCENT}; margin-top: 10pt; '
                     f'margin-bottom: 3pt;">{_e(section.title)}</h2>')
        parts.extend(_qt_block(b, body_width_px, px_per_mm) for b in section.blocks)
    return "".join(parts)


# ----------------------------------------------------------------------------------------------
# Pages


PDF_DPI = 300  #: the one resolution the pages are laid out at, so the preview breaks pages as the PDF does


class PagedDatasheet:
    """The datasheet laid out once on A4 pages, painted on a PDF writer or as page images."""

    def __init__(self, sheet: Datasheet, results: Results, logo_png: bytes | None = None):
        self.sheet = sheet
        self.dpi = dots_per_inch = PDF_DPI
        mm = dots_per_inch / 25.4
        left, top, right, bottom = PAGE_MARGINS_MM
        paper_width, paper_height = PAPER_SIZES_MM[sheet.options.paper]
        self.page_size = QSizeF(paper_width * mm, paper_height * mm)
        self.body = QRectF(left * mm, (top + HEADER_MM) * mm, (paper_width - left - right) * mm,
                           (paper_height - top - bottom - HEADER_MM - FOOTER_MM) * mm)
        self.mm = mm
        self.document = QTextDocument()
        self.document.setDocumentMargin(0)
        # Point sizes are resolved against the device resolution through this pixel size.
        self.document.setDefaultFont(charts.plain_font(BODY_FONT_PT / 72.0 * dots_per_inch))
        self.document.setDefaultStyleSheet(
            f"body {{ color: #1b1f24; }} h1, h2 {{ font-family: '{charts.FONT_FAMILY}'; }}")
        chart_width = self.body.width()
        with printed_in(sheet.options.units):
            for name in charts.SHEET_DRAWINGS:
                image = charts.chart_image(name, results, width_px=max(1200, int(chart_width * 1.25)))
                self.document.addResource(QTextDocument.ResourceType.ImageResource, QUrl(f"chart:{name}"), image)
        if logo_png:
            self.document.addResource(QTextDocument.ResourceType.ImageResource, QUrl("picture:logo"),
                                      QImage.fromData(logo_png))
        for section in sheet.sections:
            for block in section.blocks:
                if isinstance(block, Picture):
                    self.document.addResource(QTextDocument.ResourceType.ImageResource, QUrl(f"picture:{block.name}"),
                                              QImage.fromData(block.png, "PNG"))
        self.document.setHtml(self._with_pixel_sizes(qt_html(sheet, chart_width, mm, bool(logo_png))))
        self.document.setPageSize(QSizeF(self.body.width(), self.body.height()))
        keep_together(self.document)

    def _with_pixel_sizes(self, text: str) -> str:
        """Qt resolves pt against the screen, not the page: give every size in device pixels."""
        return re.sub(r"(\d+(?:\.\d+)?)pt", lambda m: f"{float(m.group(1)) / 72.0 * self.dpi:.0f}px", text)

    @property
    def page_count(self) -> int:
        return self.document.pageCount()

    def paint_page(self, painter: QPainter, index: int) -> None:
        mm = self.mm
        body = self.body
        painter.save()
        painter.fillRect(QRectF(0, 0, self.page_size.width(), self.page_size.height()), QColor("white"))
        # Running header and footer.
        painter.setFont(charts.plain_font(7.2 / 72.0 * self.dpi))
        painter.setPen(QColor("#5b6470"))
        header = QRectF(body.left(), PAGE_MARGINS_MM[1] * mm, body.width(), HEADER_MM * mm - 2.5 * mm)
        painter.drawText(header, Qt.AlignmentFlag.AlignLeft | Qt.AlignmentFlag.AlignBottom,
                         f"{self.sheet.title}  ·  revision {self.sheet.revision}")
        painter.drawText(header, Qt.AlignmentFlag.AlignRight | Qt.AlignmentFlag.AlignBottom, "Motor design datasheet")
        painter.setPen(QPen(QColor(ACCENT), 0.35 * mm))
        rule = header.bottom() + 1.2 * mm
        painter.drawLine(QPointF(header.left(), rule), QPointF(header.right(), rule))
        footer = QRectF(body.left(), body.bottom() + 2.5 * mm, body.width(), FOOTER_MM * mm - 2.5 * mm)
        painter.setPen(QColor("#c9d3de"))
        painter.drawLine(footer.topLeft(), footer.topRight())
        painter.setPen(QColor("#5b6470"))
        painter.drawText(footer, Qt.AlignmentFlag.AlignLeft | Qt.AlignmentFlag.AlignVCenter,
                         f"Issued {self.sheet.issued}. {ESTIMATES_NOTE} {DEFER_NOTE}")
        painter.drawText(footer, Qt.AlignmentFlag.AlignRight | Qt.AlignmentFlag.AlignVCenter,
                         f"page {index + 1} of {self.page_count}")
        # The body: the document's slice for this page.
        height = self.document.pageSize().height()
        painter.translate(body.left(), body.top() - index * height)
        self.document.drawContents(painter, QRectF(0, index * height, body.width(), height))
        painter.restore()

    def page_image(self, index: int, dots_per_inch: float) -> QImage:
        scale = dots_per_inch / self.dpi
        image = QImage(round(self.page_size.width() * scale), round(self.page_size.height() * scale),
                       QImage.Format.Format_RGB32)
        image.setDotsPerMeterX(round(dots_per_inch / 0.0254))
        image.setDotsPerMeterY(round(dots_per_inch / 0.0254))
        image.fill(QColor("white"))
        painter = QPainter(image)
        painter.setRenderHint(QPainter.RenderHint.Antialiasing)
        painter.setRenderHint(QPainter.RenderHint.TextAntialiasing)
        painter.setRenderHint(QPainter.RenderHint.SmoothPixmapTransform)
        painter.scale(scale, scale)
        self.paint_page(painter, index)
        painter.end()
        return image


KEEP_WHOLE_SHARE = 0.6  #: a table up to this share of a page moves whole to the next page rather than split
MAX_PAGE_BREAKS = 40  #: breaks the pass may add (each one lays the document out again)


def _page_of(y: float, page_height: float) -> int:
    return int(y // page_height)


def _straddles(rect: QRectF, page_height: float) -> bool:
    return _page_of(rect.top(), page_height) != _page_of(rect.bottom() - 1.0, page_height)


def _break_before(block: QTextBlock) -> None:
    form = QTextBlockFormat()
    form.setPageBreakPolicy(QTextFormat.PageBreakFlag.PageBreak_AlwaysBefore)
    QTextCursor(block).mergeBlockFormat(form)


def _short_section_split(document: QTextDocument, heading: QTextBlock, page_height: float) -> bool:
    """Whether the section under ``heading`` (to the next h2) is short enough to keep whole but split."""
    if heading.blockFormat().pageBreakPolicy() != QTextFormat.PageBreakFlag.PageBreak_Auto:
        return False
    layout = document.documentLayout()
    top = layout.blockBoundingRect(heading).top()
    if top % page_height < 1.0:
        return False  # already at the top of a page
    bottom = top
    block = heading.next()
    while block.isValid():  # to the end of the section's last block, not the next heading: it may open a page
        table = QTextCursor(block).currentTable()
        if table is None and block.blockFormat().headingLevel() == 2:
            break
        while table is not None and table.parentFrame() is not document.rootFrame():
            table = table.parentFrame()
        rect = layout.frameBoundingRect(table) if table is not None else layout.blockBoundingRect(block)
        if block.length() > 1 or table is not None:  # the empty block Qt puts after a table has no height to keep
            bottom = max(bottom, rect.bottom())
        block = block.next()
    section = QRectF(0.0, top, 1.0, bottom - top)
    return _straddles(section, page_height) and section.height() < KEEP_WHOLE_SHARE * page_height


def _first_break(document: QTextDocument, page_height: float) -> bool:
    """Add the first page break the layout needs (True), or none is needed (False).

    QTextDocument ignores CSS page-break-inside and keep-with-next, so the pass does their job: a heading
    (h2 or a table's title) is never the last thing on a page, and a section or a table that fits in
    :data:`KEEP_WHOLE_SHARE` of a page is not split (it moves, with the headings just above it).
    """
    layout = document.documentLayout()
    block = document.begin()
    while block.isValid():
        table = QTextCursor(block).currentTable()
        if table is not None and table.parentFrame() is document.rootFrame():
            rect = layout.frameBoundingRect(table)
            if _straddles(rect, page_height) and rect.height() < KEEP_WHOLE_SHARE * page_height:
                lead = QTextCursor(table.firstCursorPosition())
                lead.movePosition(QTextCursor.MoveOperation.PreviousBlock)
                first = lead.block() if lead.block() != block else block
                while first.previous().isValid() and first.blockFormat().headingLevel() > 0 \
                        and first.previous().blockFormat().headingLevel() > 0:
                    first = first.previous()
                if first.blockFormat().headingLevel() > 0 and first.blockNumber() < block.blockNumber():
                    _break_before(first)
                else:
                    form = table.frameFormat()
                    form.setPageBreakPolicy(QTextFormat.PageBreakFlag.PageBreak_AlwaysBefore)
                    table.setFrameFormat(form)
                return True
            block = document.findBlock(table.lastPosition() + 1)
            continue
        if block.blockFormat().headingLevel() == 2 and _short_section_split(document, block, page_height):
            _break_before(block)
            return True
        if block.blockFormat().headingLevel() > 0 and block.next().isValid():
            here = _page_of(layout.blockBoundingRect(block).top(), page_height)
            following = block.next()
            following_table = QTextCursor(following).currentTable()
            top = (layout.frameBoundingRect(following_table).top() if following_table is not None
                   else layout.blockBoundingRect(following).top())
            if _page_of(top, page_height) > here and block.blockFormat().pageBreakPolicy() == \
                    QTextFormat.PageBreakFlag.PageBreak_Auto:
                first = block
                while first.previous().isValid() and first.previous().blockFormat().headingLevel() > 0:
                    first = first.previous()
                _break_before(first)
                return True
        block = block.next()
    return False


def keep_together(document: QTextDocument) -> int:
    """Break pages where a heading would end a page or a short table would split; returns the breaks added."""
    page_height = document.pageSize().height()
    for added in range(MAX_PAGE_BREAKS):
        if not _first_break(document, page_height):
            return added
    return MAX_PAGE_BREAKS


_PAGE_SIZE_IDS = {"A4": QPageSize.PageSizeId.A4, "Letter": QPageSize.PageSizeId.Letter}


def write_pdf_file(sheet: Datasheet, results: Results, path: str, logo_png: bytes | None = None) -> int:
    """Write the PDF to ``path`` (the caller makes it atomic); returns the number of pages."""
    writer = QPdfWriter(path)
    writer.setResolution(PDF_DPI)
    writer.setPageLayout(QPageLayout(QPageSize(_PAGE_SIZE_IDS[sheet.options.paper]), QPageLayout.Orientation.Portrait,
                                     QMarginsF(0, 0, 0, 0), QPageLayout.Unit.Millimeter))
    writer.setTitle(f"{sheet.title}, revision {sheet.revision}")
    writer.setCreator("pmdc-sizer")
    paged = PagedDatasheet(sheet, results, logo_png)
    painter = QPainter()
    if not painter.begin(writer):
        raise OSError(f"{path}: the PDF writer could not open the file")
    painter.setRenderHint(QPainter.RenderHint.Antialiasing)
    painter.setRenderHint(QPainter.RenderHint.SmoothPixmapTransform)
    for index in range(paged.page_count):
        if index:
            writer.newPage()
        paged.paint_page(painter, index)
    if not painter.end():  # the PDF engine writes as it goes: a full disk shows only here
        raise OSError(f"{path}: the PDF writer could not finish the file")
    return paged.page_count
