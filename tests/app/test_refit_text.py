"""A re-fit in words: the sentences the terminal and the comparison page show, with the titles and
units of the one figures table."""

from __future__ import annotations

from pathlib import Path

import pytest

from pmdc_sizer.app.figures import figure
from pmdc_sizer.app.refit_text import parameter_title, refit_message, refit_notes, target_title
from pmdc_sizer.core import difference, project, refit
from pmdc_sizer.core.evaluate import evaluate

FERRITE = Path(__file__).resolve().parents[2] / "demo_projects" / "appliance_ferrite_12v.toml"


@pytest.fixture(scope="module")
def ferrite():
    design = project.load(FERRITE)
    return design, evaluate(design)


def test_a_reached_thickness_refit_says_what_changed_and_how_close(ferrite):
    design, _ = ferrite
    design_a = project.with_values(design, {"magnets.thickness_mm": 10.0})
    fit = refit.refit("ke", evaluate(design_a), difference.with_grade(design_a, "N42"))
    message = refit_message(fit)
    assert message.startswith("B's magnet thickness goes from 10 mm to ")
    goal = figure("constants.ke_V_s_per_rad").text(fit.target_value, digits=4)
    assert f"A's {target_title('ke')} of {goal}" in message
    assert message.endswith("(within 0.01 %).") or "(off by" in message


def test_out_of_reach_names_what_b_would_need_and_the_limit(ferrite):
    design, results_a = ferrite
    fit = refit.refit("ke", results_a, difference.with_grade(design, "N42"))
    message = refit_message(fit)
    assert message.startswith("B needs a magnet thinner than 0.5 mm (the lower limit of magnets.thickness_mm")
    assert figure("constants.ke_V_s_per_rad").text(fit.figure_after, digits=4) in message


def test_whole_turns_say_which_neighbour_was_closer(ferrite):
    design, results_a = ferrite
    fit = refit.refit("no-load-speed", results_a, difference.with_grade(design, "N42"))
    assert refit_message(fit).startswith("B's turns per coil go from 20 to ")
    (note,) = [n for n in refit_notes(fit) if "whole numbers" in n]
    assert f"{int(fit.alternative_value)} turns would give" in note and f"so {fit.value_after} is the closer" in note


def test_the_stack_refit_and_mixed_currencies_are_noted(ferrite):
    design, results_a = ferrite
    dollars = project.with_values(difference.with_grade(design, "Y25"),
                                  {"prices.currency": "USD", "prices.magnet_per_kg": 4.0})  # the grade is priced in EUR
    notes = refit_notes(refit.refit("stall-torque", results_a, dollars))
    assert any("mix currencies" in n for n in notes)
    assert any("overhang of 3 mm" in n and "12 mm beyond the magnets" in n for n in notes)


def test_every_target_has_its_words():
    assert {parameter_title(name) for name in refit.TARGETS} == {"magnet thickness", "turns per coil", "stack length"}
