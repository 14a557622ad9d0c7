"""Comparing two designs: B − A for every figure they share."""

from __future__ import annotations

import pytest

from pmdc_sizer.core import difference, evaluate, library, project
from pmdc_sizer.core.project import ProjectError

#: The issue asks re-fits to meet their target within 0.5 %.
TARGET_TOLERANCE = 5e-3


def test_a_design_compared_with_itself_differs_in_nothing(demo_path):
    design = project.load(demo_path)
    comparison = difference.compare(design, design)
    assert len(comparison.figures) > 150  # every number of the results, not a chosen few
    for item in comparison.figures:
        assert item.difference == 0, item.key
        assert item.fraction in (0.0, None), item.key
    assert all(item.difference == 0 for item in comparison.figures)


def test_difference_is_b_minus_a_in_every_key(ferrite):
    design, results_a = ferrite
    thicker = project.with_values(design, {"magnets.thickness_mm": 8.0})
    comparison = difference.compare(design, thicker, results_a=results_a)
    results_b = comparison.b
    ke = comparison.figure("constants.ke_V_s_per_rad")
    assert ke.a == results_a.constants.ke_V_s_per_rad and ke.b == results_b.constants.ke_V_s_per_rad
    assert ke.difference == pytest.approx(results_b.constants.ke_V_s_per_rad - results_a.constants.ke_V_s_per_rad)
    assert ke.difference > 0  # a thicker magnet raises the working point and the flux
    assert ke.fraction == pytest.approx(ke.difference / ke.a)
    mass = comparison.figure("mass.magnet_kg")
    # Arcs grow outward from the gap (inner radius 12 + 0.4 mm): the volume goes as Ro² − Ri².
    inner = 12.4
    assert mass.fraction == pytest.approx(((inner + 8.0) ** 2 - inner**2) / ((inner + 6.0) ** 2 - inner**2) - 1.0,
                                          rel=1e-9)
    # Temperatures in °C get no per cent (an offset scale); names of list items carry through.
    assert comparison.figure("thermal.winding_temperature_C").fraction is None
    assert comparison.figure("demagnetization.cases[stall, cold].margin_A_per_m").difference != 0


def test_lists_of_named_items_are_matched_by_name(ferrite):
    design, results_a = ferrite
    reversing = project.with_values(design, {"supply.reversing": True})
    nested = difference.nested_difference(results_a, evaluate(reversing))
    names = [case["name"] for case in nested["demagnetization"]["cases"]]
    # A is never reversed, so B's reversal cases have nothing to be compared with.
    assert names == [case.name for case in results_a.demagnetization.cases]
    assert all(not name.startswith("reversal") for name in names)


def test_nested_difference_of_json_keeps_the_keys_and_holds_numbers_only(ferrite):
    from pmdc_sizer.app.results_json import results_json

    _, results = ferrite
    data = results_json(results)
    nested = difference.nested_difference(data, data)

    values = [value for _, value in difference.flatten(nested)]
    assert values and all(isinstance(v, (int, float)) and v == 0 for v in values)
    assert nested["constants"].keys() <= data["constants"].keys()
    assert "no_load_speed_rpm" in nested["performance"]


def test_with_grade_swaps_a_library_grade_and_refuses_an_unknown_one(ferrite):
    design, _ = ferrite
    assert difference.with_grade(design, "N42").magnets.grade == "N42"
    with pytest.raises(ProjectError, match=r"magnets\.grade"):
        difference.with_grade(design, "N99XX")


def test_with_grade_replaces_an_inline_custom_grade(ferrite):
    design, _ = ferrite
    custom = project.with_values(design, {"magnets.grade": None, "magnets.custom_grade": {
        "name": "supplier ferrite lot 7", "family": "hard ferrite, anisotropic", "remanence_T": 0.40,
        "coercivity_HcB_kA_per_m": 250.0, "coercivity_HcJ_kA_per_m": 260.0, "energy_product_kJ_per_m3": 30.0,
        "recoil_permeability": 1.07, "squareness": 0.9, "remanence_temp_coeff_pct_per_K": -0.2,
        "coercivity_temp_coeff_pct_per_K": 0.3, "max_working_temperature_C": 250.0, "density_kg_per_m3": 4900.0}})
    swapped = difference.with_grade(custom, design.magnets.grade)
    assert swapped.magnets.custom_grade is None and swapped.magnets.grade == design.magnets.grade
    # The project's magnet price went with the custom grade; nothing else moved.
    assert swapped.prices.magnet_per_kg is None
    assert project.with_values(swapped, {"prices.magnet_per_kg": design.prices.magnet_per_kg}) == design


def test_with_grade_prices_b_as_its_own_grade(ferrite):
    """A's project price is for A's ferrite; B with N42SH costs N42SH's library price, not the ferrite's."""
    design, results = ferrite
    b = difference.with_grade(design, "N42SH")
    b_results = evaluate(b)
    n42sh = library.magnet_grade("N42SH")
    assert b.prices.magnet_per_kg is None and n42sh.price_per_kg > 10 * design.prices.magnet_per_kg
    assert b_results.cost.magnet == pytest.approx(b_results.mass.magnet_kg * n42sh.price_per_kg, rel=1e-12)
    assert results.cost.magnet == pytest.approx(results.mass.magnet_kg * design.prices.magnet_per_kg, rel=1e-12)
    # The same grade again keeps the project's own price.
    assert difference.with_grade(design, design.magnets.grade).prices.magnet_per_kg == design.prices.magnet_per_kg
