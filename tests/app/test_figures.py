"""The one table of shown figures (app.figures): complete, true to the results, and read by every view.

The views are run on every demo with the table's lookup recorded, so "every key a view shows is in the
table" and "every entry of the table is shown somewhere" are checked on what the views do, not on their
source text. The screen's half (results panel and charts) is in tests/gui/test_figures_on_screen.py.
"""

from __future__ import annotations

import math

import numpy as np
import pytest

from pmdc_sizer.app import figures
from pmdc_sizer.app.compare_text import figure_rows
from pmdc_sizer.app.figures import (
    CASE_POINTS,
    CASES,
    COMPARE_KEYS,
    FIGURES,
    LABELS,
    LINES,
    MARKERS,
    POINTS,
    STATUSES,
    Figure,
    figure,
    quantity_text,
    title_of,
    value_of,
)
from pmdc_sizer.app.formatting import percent, quantity, ratio
from pmdc_sizer.core import difference
from pmdc_sizer.core import project as project_file
from pmdc_sizer.core.evaluate import evaluate
from pmdc_sizer.core.units import known_units


class RecordingTable(dict):
    """FIGURES, noting every key a view asks for."""

    def __init__(self, table):
        super().__init__(table)
        self.asked: set[str] = set()

    def __getitem__(self, key):
        self.asked.add(key)
        return super().__getitem__(key)


@pytest.fixture
def recording(monkeypatch):
    table = RecordingTable(FIGURES)
    monkeypatch.setattr(figures, "FIGURES", table)
    return table


def _source(results, key: str):
    """The object a key's path starts from: the results, one temperature case, one case of a list."""
    head = key.split(".")[0]
    return {"case": results.nominal, "curve": results.nominal,
            "demagnetization_case": results.demagnetization.cases[0],
            "magnet_chart_case": results.magnet_chart[0]}.get(head, results)


def test_every_entry_is_complete():
    units = set(known_units()) | {"1", "°", "currency"}
    for key, item in FIGURES.items():
        assert isinstance(item, Figure) and item.title.strip(), key
        numerator, _, denominator = item.unit.partition("/")
        assert item.unit in units or {numerator, denominator} <= units, f"{key}: unit {item.unit!r}"
        assert item.digits in (2, 3, 4), f"{key}: {item.digits} significant figures"
        assert all(unit in units for unit in item.also), key
    assert all(title.strip() for title in LABELS.values())


def test_every_key_names_a_figure_of_the_results(demo_path):
    # A key is a path into core's results: a renamed field there must show here, not as a blank on a page.
    results = evaluate(project_file.load(demo_path))
    without_a_drive_limit = ("current_limit_A", "case.current_limit_torque_N_m")  # None for a plain supply
    # None where the winding never reaches its class limit (at stall, or under the rated load)
    never = ("thermal.time_to_limit_s", "ratings.stall_time_cold_s", "ratings.stall_time_hot_s")
    for key in FIGURES:
        value = value_of(_source(results, key), key)
        if value is None and key in without_a_drive_limit + never:
            continue
        assert np.all(np.isfinite(np.asarray(value, dtype=float))), key
    for key in LABELS:
        if key != "reversing":
            value_of(_source(results, key), key)


def test_views_read_every_figure_they_show_from_the_table(recording, demo_path):
    from pmdc_sizer.app.datasheet import charts, content
    from pmdc_sizer.app.summary import summary_text

    design = project_file.load(demo_path)
    results = evaluate(design)
    summary_text(results)
    content.build(design, results)
    charts.performance_panels(results)
    charts.magnet_panel(results)
    charts.performance_legend(results)
    comparison = difference.compare(design, design, results, results)
    assert len(figure_rows(comparison)) == len(COMPARE_KEYS)
    assert recording.asked <= set(FIGURES)
    # The paper and terminal views between them use most of the table; the rest is the screen's.
    assert len(recording.asked) > 0.8 * len(FIGURES)


def test_a_key_outside_the_table_is_refused_with_its_name():
    with pytest.raises(KeyError, match=r"constants\.no_such_figure"):
        figure("constants.no_such_figure")


def test_case_keys_and_compare_titles():
    assert figure("hot.rated.speed_rad_per_s") is FIGURES["case.rated.speed_rad_per_s"]
    assert title_of("hot.rated.speed_rad_per_s") == "Speed at rated torque, hot"
    assert title_of("nominal.rated.speed_rad_per_s") == "Speed at rated torque"
    assert all(figure(key) for key in COMPARE_KEYS)


@pytest.mark.parametrize("value, unit, expected", [
    (0.0123, "mN·m", quantity(0.0123, "mN·m")),
    (0.853, "%", percent(0.853)),
    (1.5, "ohm", "1.50 Ω"),
    (25.4, "°C", "25 °C"),
    (2.6214, "1", "2.62"),
    (4.5, "EUR", "4.50 EUR"),
    (30.0, "rpm/mN·m", ratio(30.0, "rpm", "mN·m")),
    (math.pi / 2, "°", "90.0°"),
    (math.nan, "A", "– A"),
])
def test_figures_are_shown_as_the_formatting_rules_say(value, unit, expected):
    assert quantity_text(value, unit) == expected


def test_named_points_lines_and_statuses_are_complete():
    for key, style in POINTS.items():
        assert style.marker in MARKERS and style.title and style.size > 0, key
        assert style.colour is None or style.colour.startswith("#"), key
    assert set(CASE_POINTS) <= set(POINTS)
    assert set(CASES) == {"cold", "nominal", "hot"}
    assert len({style.colour for style in CASES.values()}) == 3, "the cases differ by colour"
    assert len({style.dash for style in CASES.values()}) == 3, "and by dash, for grey print"
    assert all(line.dash in ("solid", "dash", "dot", "dash_dot") for line in (*LINES.values(), *CASES.values()))
    assert set(STATUSES) == {"pass", "warning", "fail"}
    # Each named point of one chart has a shape of its own (colour is the case's), so it reads in grey.
    assert len({(POINTS[p].marker, POINTS[p].filled) for p in CASE_POINTS}) == len(CASE_POINTS)
    magnet_points = ("operating_point", "knee", "demagnetization_safe", "demagnetization_fails")
    assert len({(POINTS[p].marker, POINTS[p].filled) for p in magnet_points}) == len(magnet_points)
