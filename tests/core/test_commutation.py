"""Brushes and commutator (core/commutation.py) and their three checks (core/checks.py).

Each formula is checked against a hand calculation written out in the test, from the definition its
source gives, with numbers of a small power-tool motor; each check's pass, warning and fail, with its
words, on both sides of every threshold.
"""

from __future__ import annotations

import math
from dataclasses import replace
from types import SimpleNamespace

import pytest

from pmdc_sizer.core import checks, commutation
from pmdc_sizer.core.commutation import (
    BRUSH_GRADES,
    SPECIFIC_PERMEANCE,
    brush_current_density,
    brush_set,
    commutation_result,
    reactance_voltage,
    surface_speed,
)
from pmdc_sizer.core.design import BrushData
from pmdc_sizer.core.results import CommutationResult

MU_0 = 4e-7 * math.pi  # the magnetic constant to the precision that matters here (SI 2019: 1.000 000 000 55 of it)


# ----------------------------------------------------------------------------------------------
# Formulas against hand calculations


def test_brush_current_density_is_the_current_over_one_polarity_s_contact_area():
    # Source: Say and Taylor 1986, ch. on brushes (from memory): each polarity carries the whole armature
    # current, shared by its brushes. Two 6 mm x 8 mm brushes, 20 A: one brush of 48 mm² per polarity.
    area_per_polarity = 1 * 6e-3 * 8e-3  # [m²]
    assert brush_current_density(20.0, 2, 6e-3, 8e-3) == pytest.approx(20.0 / area_per_polarity, rel=1e-12)
    assert brush_current_density(20.0, 2, 6e-3, 8e-3) / 1e4 == pytest.approx(41.67, abs=0.01)  # [A/cm²]
    # Four brushes (a 4-pole lap winding): two per polarity, half the density; the sign of I does not matter.
    assert brush_current_density(20.0, 4, 6e-3, 8e-3) == pytest.approx(20.0 / (2 * area_per_polarity), rel=1e-12)
    assert brush_current_density(-20.0, 2, 6e-3, 8e-3) == brush_current_density(20.0, 2, 6e-3, 8e-3)


def test_commutator_surface_speed_is_pi_d_n():
    # Source: peripheral speed v = π·D·n (n in rev/s). 24 mm at 20 000 rpm: π·0.024·20000/60 = 25.13 m/s.
    omega = 20000.0 * 2.0 * math.pi / 60.0
    assert surface_speed(omega, 0.024) == pytest.approx(math.pi * 0.024 * 20000.0 / 60.0, rel=1e-12)
    assert surface_speed(omega, 0.024) == pytest.approx(25.13, abs=0.005)
    assert surface_speed(-omega, 0.024) == surface_speed(omega, 0.024)  # either direction of rotation


def test_reactance_voltage_is_the_average_estimate_for_linear_commutation():
    # Source: Say and Taylor 1986, commutation (from memory): the coil's current reverses from +I/a to -I/a
    # while the brush covers it, T_c = w_b/v_c, so e_r = L_c·2(I/a)/T_c, with L_c = 2·μ0·N_c²·L·λ
    # (Pichelmayer's specific permeance λ, about 4 to 8 in units of μ0; the module takes 5).
    # Hand calculation: N_c = 2 turns, L = 35 mm, λ = 5, I = 17 A, a = 2, 24 mm commutator at 20 000 rpm,
    # brush 5.4 mm wide.
    coil_inductance = 2.0 * MU_0 * 2**2 * 0.035 * 5.0  # = 1.759 µH
    assert coil_inductance == pytest.approx(1.759e-6, rel=1e-3)
    v_c = math.pi * 0.024 * 20000.0 / 60.0  # 25.13 m/s
    commutation_time = 5.4e-3 / v_c  # 0.2149 ms
    hand = coil_inductance * 2.0 * (17.0 / 2) / commutation_time  # = 0.139 V
    assert hand == pytest.approx(0.1392, abs=5e-4)
    omega = 20000.0 * 2.0 * math.pi / 60.0
    assert reactance_voltage(17.0, 2, 2, 0.035, omega, 0.024, 5.4e-3) == pytest.approx(hand, rel=1e-9)
    assert SPECIFIC_PERMEANCE == 5.0


def test_reactance_voltage_scales_as_the_estimate_says():
    omega = 2000.0
    base = reactance_voltage(10.0, 2, 3, 0.03, omega, 0.02, 4e-3)
    assert reactance_voltage(20.0, 2, 3, 0.03, omega, 0.02, 4e-3) == pytest.approx(2 * base)  # ∝ I
    assert reactance_voltage(10.0, 4, 3, 0.03, omega, 0.02, 4e-3) == pytest.approx(base / 2)  # ∝ 1/a
    assert reactance_voltage(10.0, 2, 6, 0.03, omega, 0.02, 4e-3) == pytest.approx(4 * base)  # ∝ N_c²
    assert reactance_voltage(10.0, 2, 3, 0.03, 2 * omega, 0.02, 4e-3) == pytest.approx(2 * base)  # ∝ speed
    assert reactance_voltage(10.0, 2, 3, 0.03, omega, 0.02, 8e-3) == pytest.approx(base / 2)  # ∝ 1/w_b
    assert reactance_voltage(10.0, 2, 3, 0.03, omega, 0.02, 4e-3, specific_permeance=8.0) == pytest.approx(
        base * 8.0 / 5.0)  # ∝ λ
    # at rest nothing commutates (the module floors the surface speed at 1e-12 m/s against a division by zero)
    assert reactance_voltage(10.0, 2, 3, 0.03, 0.0, 0.02, 4e-3) == pytest.approx(0.0, abs=1e-12)


# ----------------------------------------------------------------------------------------------
# The brush set: the project's values, the tool's estimates where it leaves them out


def _design(kind: str = "wave", poles: int = 4, brushes: BrushData | None = None):
    """The parts of a design that core.commutation reads: 36 mm armature, 21 segments, 35 mm stack."""
    return SimpleNamespace(
        brushes=brushes or BrushData(grade="copper-graphite"),
        geometry=SimpleNamespace(armature_radius=0.018, poles=poles, stack_length=0.035),
        winding=SimpleNamespace(kind=kind, commutator_segments=21, turns_per_coil=2))


def test_estimates_fill_what_the_project_leaves_out():
    # Common practice, no source (module docstring): commutator 0.6 armature diameters, brush 1.5 segment
    # pitches wide and 1.25 widths long, two brushes for a wave winding and one per pole for a lap winding.
    wave = brush_set(_design("wave"))
    assert wave.commutator_diameter == pytest.approx(0.6 * 0.036)
    assert wave.width == pytest.approx(1.5 * math.pi * 0.6 * 0.036 / 21)
    assert wave.length == pytest.approx(1.25 * wave.width)
    assert wave.count == 2
    assert set(wave.estimated) == {"commutator_diameter", "width", "length", "count"}
    assert wave.density_range == BRUSH_GRADES["copper-graphite"] == (12e4, 20e4)
    assert brush_set(_design("lap", poles=6)).count == 6


def test_the_project_s_values_and_limit_win_over_the_estimates():
    given = BrushData(grade="electrographite", current_density_limit=9e4, count=4, width=6e-3, length=8e-3,
                      commutator_diameter=0.024)
    brushes = brush_set(_design("lap", brushes=given))
    assert (brushes.count, brushes.width, brushes.length, brushes.commutator_diameter) == (4, 6e-3, 8e-3, 0.024)
    assert brushes.estimated == ()
    assert brushes.density_range == (0.0, 9e4)  # the project's own limit replaces the grade's range


def test_commutation_result_puts_the_formulas_together():
    given = BrushData(grade="copper-graphite", count=2, width=5.4e-3, length=7e-3, commutator_diameter=0.024)
    omega = 20000.0 * 2.0 * math.pi / 60.0
    result = commutation_result(_design(brushes=given), paths=2, rated_current=17.0, rated_speed=omega,
                                top_speed=1.1 * omega)
    assert result.brush_current_density_A_per_m2 == pytest.approx(17.0 / (5.4e-3 * 7e-3))
    assert result.surface_speed_m_per_s == pytest.approx(math.pi * 0.024 * 1.1 * 20000.0 / 60.0)  # top speed
    assert result.reactance_voltage_V == pytest.approx(0.1392, abs=5e-4)  # the hand calculation above, rated speed
    assert (result.brush_density_low_A_per_m2, result.brush_density_high_A_per_m2) == (12e4, 20e4)
    assert not result.limit_from_project and result.estimated_inputs == ()


# ----------------------------------------------------------------------------------------------
# The three checks: pass, warning and fail in words, on both sides of each threshold

BASE = CommutationResult(
    brush_grade="copper-graphite", brush_count=2, brush_width_m=5.4e-3, brush_length_m=7e-3,
    commutator_diameter_m=0.024, estimated_inputs=(), brush_current_density_A_per_m2=15e4,
    brush_density_low_A_per_m2=12e4, brush_density_high_A_per_m2=20e4, limit_from_project=False,
    surface_speed_m_per_s=20.0, reactance_voltage_V=1.0)


def _check(result: CommutationResult, key: str):
    found = {c.key: c for c in checks._commutation_checks(result)}
    assert set(found) == {"brush_current_density", "commutator_speed", "reactance_voltage"}
    return found[key]


@pytest.mark.parametrize(("density_A_per_cm2", "status"), [
    (15.0, "pass"), (20.0, "pass"),  # at the grade's continuous limit: still inside it
    (20.01, "warning"), (30.0, "warning"),  # up to 1.5 times the limit: warned
    (30.01, "fail"), (60.0, "fail"),
])
def test_brush_current_density_against_the_grade_s_range(density_A_per_cm2, status):
    check = _check(replace(BASE, brush_current_density_A_per_m2=density_A_per_cm2 * 1e4), "brush_current_density")
    assert check.status == status
    assert check.title == "Brush current density"
    assert f"{checks._figures(density_A_per_cm2)} A/cm²" in check.message
    assert "5.4 × 7.0 mm brushes at the hot rated point" in check.message
    assert "the 20.0 A/cm² copper-graphite carries in continuous service" in check.message
    words = {"pass": "(within ", "warning": ", above ", "fail": ", far above "}[status]
    assert words in check.message
    advice = {"pass": "", "warning": "use larger brushes or a grade rated for more current",
              "fail": "use larger or more brushes, or a metal-graphite grade"}[status]
    assert check.advice == advice


def test_brush_check_names_the_project_s_limit_and_the_estimated_inputs():
    result = replace(BASE, brush_density_low_A_per_m2=0.0, brush_density_high_A_per_m2=10e4,
                     limit_from_project=True, estimated_inputs=("width", "commutator_diameter"))
    check = _check(result, "brush_current_density")
    assert check.status == "warning"  # 15 A/cm² against the project's 10: above, within 1.5 times
    assert "above the project's limit of 10.0 A/cm²" in check.message
    assert "(brush width, commutator diameter estimated: give them under [brushes])" in check.message


#: The two commutator checks read alike: (result field, check, what the message says of the figure, advice
#: when it does not pass).
_COMMUTATOR_CHECKS = {
    "speed": ("surface_speed_m_per_s", "commutator_speed",
              lambda v: [f"{checks._figures(v)} m/s at the highest no-load speed on a 24.0 mm commutator"],
              "use a smaller commutator or a lower no-load speed"),
    "reactance": ("reactance_voltage_V", "reactance_voltage",
                  lambda v: [f"about {checks._figures(v, 2)} V in the coil under commutation",
                             "estimate, Pichelmayer's permeance"],
                  "use fewer turns per coil with more segments, or wider brushes"),
}


@pytest.mark.parametrize(("kind", "value", "status", "words"), [
    ("speed", 10.0, "pass", "within the 25 m/s that plain commutators run at"),
    ("speed", 25.0, "pass", "within the 25 m/s"),  # at the threshold: still plain
    ("speed", 25.01, "warning", "above the 25 m/s of plain commutators: brush bounce and wear"),
    ("speed", 40.0, "warning", "above the 25 m/s"),
    ("speed", 40.01, "fail", "beyond the 40 m/s a small commutator holds together at"),
    ("reactance", 0.5, "pass", "commutation without visible sparking is likely"),
    ("reactance", 2.0, "pass", "without visible sparking"),  # at the threshold, about one brush contact drop
    ("reactance", 2.01, "warning", "expect sparking at the trailing brush edge"),
    ("reactance", 4.0, "warning", "expect sparking"),
    ("reactance", 4.01, "fail", "heavy sparking and brush wear"),
])
def test_commutator_surface_speed_and_reactance_voltage_in_words(kind, value, status, words):
    field, name, figure_words, advice = _COMMUTATOR_CHECKS[kind]
    check = _check(replace(BASE, **{field: value}), name)
    assert check.status == status
    assert words in check.message
    for figure_word in figure_words(value):
        assert figure_word in check.message
    assert check.advice == ("" if status == "pass" else advice)


def test_the_thresholds_are_the_ones_documented():
    # common practice, no source (marked so in core/checks.py): the tests above sit on these.
    assert checks.BRUSH_DENSITY_FAIL == 1.5
    assert (checks.SURFACE_SPEED_WARNING, checks.SURFACE_SPEED_FAIL) == (25.0, 40.0)
    assert (checks.REACTANCE_WARNING, checks.REACTANCE_FAIL) == (2.0, 4.0)


def test_the_drill_demo_s_checks_read_its_commutation_figures(drill):
    results = drill[1]
    cm = results.commutation
    assert cm is not None and cm.brush_grade == "copper-graphite"
    found = {c.key: c for c in results.checks}
    density = found["brush_current_density"]
    assert f"{checks._figures(cm.brush_current_density_A_per_m2 / 1e4)} A/cm²" in density.message
    assert f"{checks._figures(cm.surface_speed_m_per_s)} m/s" in found["commutator_speed"].message
    assert f"about {checks._figures(cm.reactance_voltage_V, 2)} V" in found["reactance_voltage"].message
    # and the figures are the module's formulas at the hot rated point
    hot = results.hot.rated
    assert cm.brush_current_density_A_per_m2 == pytest.approx(
        brush_current_density(hot.current_A, cm.brush_count, cm.brush_width_m, cm.brush_length_m), rel=1e-12)
    top = max(c.no_load_speed_rad_per_s for c in results.cases)
    assert cm.surface_speed_m_per_s == pytest.approx(surface_speed(top, cm.commutator_diameter_m), rel=1e-12)
    assert commutation.BRUSH_GRADES[cm.brush_grade][1] == cm.brush_density_high_A_per_m2


@pytest.fixture(scope="module")
def drill():
    from pmdc_sizer.core import evaluate, project
    from tests.conftest import DEMO_FOLDER

    design = project.load(DEMO_FOLDER / "power_tool_4pole_48v.toml")
    return design, evaluate(design)
