"""Check texts and the comparison follow the display units, to the same significant figures as in SI."""

from __future__ import annotations

import re

import pytest

from pmdc_sizer.app.compare_text import figure_rows, refit_lines
from pmdc_sizer.app.datasheet import content
from pmdc_sizer.app.datasheet.options import SheetOptions
from pmdc_sizer.app.figures import COMPARE_KEYS, figure, text_of, title_of, unit_for
from pmdc_sizer.app.formatting import (
    check_message,
    check_sentence,
    in_view_units,
    quoted_in,
    significant,
    significant_figures,
)
from pmdc_sizer.core import difference, evaluate, project, refit
from pmdc_sizer.core.results import Check, QuotedValue
from pmdc_sizer.core.units import US_CUSTOMARY, from_si
from tests.conftest import DEMO_FILES


def us(unit: str) -> str:
    return US_CUSTOMARY.get(unit, unit) if unit != "W" else unit


def si(unit: str) -> str:
    return unit


@pytest.fixture(scope="module", params=DEMO_FILES, ids=[p.stem for p in DEMO_FILES])
def demo(request):
    design = project.load(request.param)
    return design, evaluate(design)


def _numbers(text: str) -> list[str]:
    return re.findall(r"-?\d+(?:\.\d+)?", text)


def test_every_check_reads_in_si_exactly_as_its_message(demo):
    _, results = demo
    for check in results.checks:
        assert check_message(check, si) == check.message
        assert check_sentence(check, si) == check.sentence


def test_no_check_keeps_an_si_unit_in_us_customary(demo):
    _, results = demo
    for check in results.checks:
        text = check_message(check, us)
        for unit in ("°C", "mN·m", " mm"):
            assert unit not in text, (check.key, text)


def test_quoted_numbers_keep_their_significant_figures_in_us(demo):
    _, results = demo
    quoted = [(check, q) for check in results.checks for q in check.quoted]
    assert len(quoted) >= 6  # the rated torque, the temperatures, the brush and commutator sizes, ...
    for check, q in quoted:
        si_number = quoted_in(q, q.unit).split(" ")[0]
        us_text = quoted_in(q, us(q.unit))
        us_number, _, unit = us_text.partition(" ")
        if q.unit == "°C":
            assert unit == "°F" or q.bare
            # whole degrees stay whole degrees; the value is the converted one
            assert len(us_number.partition(".")[2]) == len(si_number.partition(".")[2]), (check.key, us_text)
            assert float(us_number) == pytest.approx(from_si(q.value, "°F"), abs=0.51)
        else:
            expected = significant_figures(si_number) if q.spec else q.digits
            assert significant_figures(us_number) == expected, (check.key, si_number, us_text)
            assert float(us_number) == pytest.approx(from_si(q.value, us(q.unit)), rel=0.06)


def test_a_check_can_be_rendered_in_other_units_without_the_core_knowing():
    check = Check("load", "Rated load", "pass", "35.0 mN·m at 3000 rpm.", template="⟦0⟧ at 3000 rpm.",
                  quoted=(QuotedValue(0.035, "mN·m"),))
    assert check_message(check, us) == "4.96 oz·in at 3000 rpm."
    assert check_message(check, si) == "35.0 mN·m at 3000 rpm."
    plain = Check("x", "X", "pass", "no numbers")
    assert check_message(plain, us) == "no numbers"


def test_comparison_rows_show_the_key_figures_numbers(demo):
    """A and B read as the key figures do: 3030 rpm both, not 3029 on one page and 3030 on the other."""
    design, results = demo
    rows = figure_rows(difference.compare(design, design, results, results))
    assert len(rows) == len(COMPARE_KEYS)
    for key, row in zip(COMPARE_KEYS, rows, strict=True):
        if figure(key).unit == "currency":
            continue
        shown = text_of(results, key, unit_for(key, results))
        assert shown.startswith(row.a + " ") or shown == row.a, (key, shown, row.a)
        assert row.b == row.a and row.difference == "0"


def test_comparison_rows_follow_the_display_units_with_the_same_figures(demo):
    design, results = demo
    comparison = difference.compare(design, design, results, results)
    rows_si, rows_us = figure_rows(comparison), figure_rows(comparison, us)
    converted = 0
    for key, row_si, row_us in zip(COMPARE_KEYS, rows_si, rows_us, strict=True):
        unit = unit_for(key, results)
        if us(unit) == unit or figure(key).unit == "currency":
            assert row_si == row_us
            continue
        converted += 1
        assert row_us.title == f"{title_of(key)} [{us(unit)}]" or us(unit) in row_us.title
        if unit == "°C":
            assert "." not in row_us.a  # whole degrees
        else:
            # "1400" shows three figures, not four: a whole number's trailing zeros are not figures
            digits = figure(key).digits
            assert min(significant_figures(row_us.a), digits) == min(significant_figures(row_si.a), digits), \
                (key, row_si.a, row_us.a)
    assert converted >= 5  # thickness, torques, diameters, lengths, masses, a temperature


def test_the_refit_report_follows_the_display_units(ferrite):
    design, results = ferrite
    fit = refit.refit("ke", results, difference.with_grade(design, "N42SH"))
    lines_us = "\n".join(refit_lines(fit, us))
    assert " mm" not in lines_us and " in" in lines_us
    lines_terminal = "\n".join(refit_lines(fit))
    assert "magnets.thickness_mm" in lines_terminal  # the terminal names the file's key and unit


def test_datasheet_checks_follow_its_units(ferrite):
    design, results = ferrite
    sheet = content.build(design, results, options=SheetOptions(units="US customary", edition="internal"))
    texts = [row.cells[2] for row in sheet.section("checks").blocks[0].rows]
    assert texts and not any("°C" in t or "mN·m" in t for t in texts)
    assert any("°F" in t for t in texts) and any("oz·in" in t for t in texts)


@pytest.fixture(scope="module")
def ferrite():
    design = project.load(DEMO_FILES[0])
    return design, evaluate(design)


def test_ke_is_shown_in_one_unit_everywhere(ferrite):
    """V/krpm on screen, paper, terminal and comparison: no view adds V·s/rad beside it."""
    from pmdc_sizer.app.figures import FIGURES
    from pmdc_sizer.app.summary import summary_text

    design, results = ferrite
    ke = {key: item for key, item in FIGURES.items() if item.title.startswith("Back-EMF constant Ke")}
    assert ke and all(item.unit == "V/krpm" and not item.also for item in ke.values())
    from pmdc_sizer.app import datasheet

    texts = datasheet.html_text(design, results, options=SheetOptions(edition="internal"))
    assert "V/krpm" in texts and "V·s/rad" not in texts
    assert "V·s/rad" not in summary_text(results)


@pytest.fixture(scope="module")
def drill():
    design = project.load(next(p for p in DEMO_FILES if "power_tool" in p.stem))
    return design, evaluate(design)


@pytest.mark.parametrize("system, torque", [("SI", "N·m"), ("US customary", "lbf·in")])
def test_check_texts_quote_torque_in_the_sheets_torque_unit(drill, system, torque):
    # The drill's torques read in N·m on its sheet (stall beyond 10 N·m): its rated-load verdict must not say
    # "300 mN·m" (or "42.5 oz·in") beside a rated torque of "0.300 N·m" (or "2.66 lbf·in").
    design, results = drill
    assert unit_for("case.stall_torque_N_m", results) == "N·m"
    sheet = content.build(design, results, options=SheetOptions(units=system, edition="internal"))
    texts = [row.cells[2] for row in sheet.section("checks").blocks[0].rows]
    quoting_torque = [t for t in texts if re.search(r"\d (mN·m|N·m|oz·in|lbf·in)\b", t)]
    assert quoting_torque
    for text in quoting_torque:
        assert re.search(rf"\d {re.escape(torque)}\b", text), text
        assert not re.search(r"\d (mN·m|oz·in)\b", text), text


def test_operating_point_table_prints_in_the_sheets_units(ferrite):
    design, results = ferrite
    sheet = content.build(design, results, options=SheetOptions(units="US customary"))
    tables = [b for s in sheet.sections for b in _blocks(s) if getattr(b, "key", "") == "operating_point"]
    assert len(tables) == 1
    titles = [row.cells[0] for row in tables[0].rows]
    assert any("[°F]" in t for t in titles) and not any("°C" in t for t in titles), titles
    temperatures = next(row.cells[1:] for row in tables[0].rows if "[°F]" in row.cells[0])
    cold = results.magnet_chart[0].curves.temperature_C
    assert temperatures[0] == significant(cold * 9 / 5 + 32, figure("magnet_chart_case.curves.temperature_C").digits) \
        or float(temperatures[0]) == pytest.approx(cold * 9 / 5 + 32, abs=0.5)


def _blocks(section):
    for block in section.blocks:
        yield block
        for side in (getattr(block, "left", ()), getattr(block, "right", ())):
            yield from side


def test_free_text_quotes_its_figures_in_the_view_units():
    # A sizing explanation is composed prose, not a check's template: its "number unit" pairs are converted.
    text = ("at a rated torque of 43.8 mN·m (instead of 350 mN·m) at 2800 rpm; up to 55 °C ambient; "
            "magnet thickness = 9.6 mm at the high end of its range (8 mm); 12 V; 0.300 N·m")
    shown = in_view_units(text, us)
    assert shown == ("at a rated torque of 6.20 oz·in (instead of 49.6 oz·in) at 2800 rpm; up to 131 °F ambient; "
                     "magnet thickness = 0.378 in at the high end of its range (0.315 in); 12 V; 2.66 lbf·in")
    assert in_view_units(text, si) == text  # SI: as written, to the character
    assert in_view_units("magnets.thickness_mm at 8 mm", us) == "magnets.thickness_mm at 0.315 in"  # not the key
