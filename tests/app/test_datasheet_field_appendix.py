"""``datasheet --with-field``: an appendix with the field solution's pictures and the agreement table,
in the PDF and in the HTML, after the sheet's own pages."""

from __future__ import annotations

from pathlib import Path

from pypdf import PdfReader

from pmdc_sizer.app.cli import main

REPO = Path(__file__).resolve().parents[2]
FERRITE = REPO / "demo_projects" / "appliance_ferrite_12v.toml"


def test_pdf_gains_the_appendix_after_its_own_pages(capsys, tmp_path):
    plain, with_field = tmp_path / "plain.pdf", tmp_path / "field.pdf"
    assert main(["datasheet", str(FERRITE), "-o", str(plain), "--edition", "internal"]) == 0
    assert main(["datasheet", str(FERRITE), "-o", str(with_field), "--with-field", "--edition", "internal"]) == 0
    capsys.readouterr()
    before, after = PdfReader(plain), PdfReader(with_field)
    assert len(after.pages) > len(before.pages)
    appendix = " ".join(" ".join(page.extract_text().split()) for page in after.pages[len(before.pages) - 1:])
    assert "Appendix: field solution" in appendix
    assert "flux per pole" in appendix and "Field solution" in appendix
    assert "no end effects" in appendix or "end effects" in appendix
    assert "Appendix: field solution" not in " ".join(" ".join(page.extract_text().split()) for page in before.pages)


def test_html_carries_the_pictures_inline(capsys, tmp_path):
    out = tmp_path / "sheet.html"
    assert main(["datasheet", str(FERRITE), "-o", str(out), "--with-field", "--edition", "internal"]) == 0
    capsys.readouterr()
    text = out.read_text(encoding="utf-8")
    assert '<section id="field"' in text
    assert text.count('src="data:image/png;base64,') == 2  # no load and the worst case
    assert "worst magnet field" in text
