"""The comparison's magnet tab: A's and B's grades on the same axes, at the temperature chosen."""

from __future__ import annotations

import numpy as np
import pytest

from pmdc_sizer.app import magnet_marks
from pmdc_sizer.app.figures import SIDES
from pmdc_sizer.core.units import from_si
from tests.gui.test_compare_view import FERRITE, StandInWindow

from .waits import WAIT_MS

pytest.importorskip("pyqtgraph")

from pmdc_sizer.app.gui import magnet_overlay


@pytest.fixture
def ferrite_against_ndfeb(qtbot, open_compare_view):
    view = open_compare_view(StandInWindow(FERRITE))
    with qtbot.waitSignal(view.comparison_updated, timeout=WAIT_MS):
        view.grade_combo.setCurrentText("N42SH")
    view.tabs.setCurrentWidget(view.magnet_overlay)
    return view


def test_both_grades_are_drawn_on_the_same_axes(ferrite_against_ndfeb):
    view = ferrite_against_ndfeb
    overlay = view.magnet_overlay
    results = {"A": view.results_a, "B": view.results_b}
    assert (results["A"].magnet.name, results["B"].magnet.name) == ("Y40", "N42SH")
    # By default the temperature where either design comes closest to its knee: the ferrite's, cold.
    assert overlay.temperature_case() == magnet_overlay.worst_temperature(results["A"], results["B"]) == "cold"
    for name in ("cold", "hot"):
        overlay.temperature_combo.setCurrentText(name)
        for side, side_results in results.items():
            chart = next(c for c in side_results.magnet_chart if c.name == name)
            h, b = overlay.normal_curves[side].getData()
            np.testing.assert_allclose(h, from_si(chart.curves.field_strength, "kA/m"))
            np.testing.assert_allclose(b, chart.curves.flux_density)
            _h, j = overlay.intrinsic_curves[side].getData()
            np.testing.assert_allclose(j, chart.curves.polarization)
            assert overlay.normal_curves[side].opts["pen"].color().name() == SIDES[side].colour
            # Its cases at this temperature, at their worst segments, in the side's colour or their state's.
            drawn = {(s.data()[0], round(s.pos().x(), 6)) for s in overlay.case_items[side].points()}
            marks = magnet_overlay.marks_at(side_results, chart)
            assert marks and all(m.case.temperature_C == pytest.approx(chart.curves.temperature_C) for m in marks)
            assert drawn == {(m.point, round(m.worst_field / 1e3, 6)) for m in marks}
        texts = overlay.label_texts()
        assert any(t.startswith("A") for t in texts) and any(t.startswith("B") for t in texts)
        key = overlay.key.text()
        assert "Y40" in key and "N42SH" in key and "Pc" in key
    # One x axis for both: from the wider of the two grades' curves to H = 0.
    (left, right), _ = overlay.plot.getPlotItem().getViewBox().viewRange()
    widest = min(from_si(r.magnet_chart[-1].curves.field_strength[0], "kA/m") for r in results.values())
    assert right == pytest.approx(0.0) and left == pytest.approx(widest * 1.03)
    assert magnet_marks.PC_NOTE in overlay.key.toolTip()
