"""Grade prices in the library, and the project's magnet price overriding them."""

from __future__ import annotations

import pytest

from pmdc_sizer.core import evaluate, library, project
from pmdc_sizer.core.design import design_from_project
from pmdc_sizer.core.magnet_grades import magnet_price_per_kg
from pmdc_sizer.core.project import ProjectError
from tests.conftest import DEMO_FOLDER

FERRITE = DEMO_FOLDER / "appliance_ferrite_12v.toml"


def test_every_built_in_grade_has_a_typical_price_in_eur():
    grades = library.magnet_grades()
    assert all(g.price_per_kg is not None and g.price_per_kg > 0 and g.price_currency == "EUR"
               for g in grades.values())
    # The families in the order the trade prices them (typical, from memory): ferrite < NdFeB < SmCo.
    assert grades["Y40"].price_per_kg < 10 < grades["N42"].price_per_kg < grades["Sm2Co17 26"].price_per_kg
    # More coercivity (more dysprosium) costs more within sintered NdFeB.
    assert grades["N42"].price_per_kg < grades["N42H"].price_per_kg < grades["N42SH"].price_per_kg


def test_project_price_overrides_the_grade_price():
    design = project.load(FERRITE)
    grade = library.magnet_grade(design.magnets.grade)
    assert design.prices.magnet_per_kg == 4.0 != grade.price_per_kg
    assert design_from_project(design).prices.magnet == 4.0
    without = project.with_values(design, {"prices.magnet_per_kg": None})
    assert design_from_project(without).prices.magnet == grade.price_per_kg
    results = evaluate(without)
    assert results.cost.magnet == pytest.approx(results.mass.magnet_kg * grade.price_per_kg, rel=1e-12)


def test_no_price_in_another_currency_is_refused_by_name():
    design = project.with_values(project.load(FERRITE), {"prices.magnet_per_kg": None, "prices.currency": "USD"})
    with pytest.raises(ProjectError, match=r"prices\.magnet_per_kg.*EUR.*USD") as caught:
        design_from_project(design)
    assert caught.value.key == "prices.magnet_per_kg"
    # given in the project's currency, it is used as it is
    priced = project.with_values(design, {"prices.magnet_per_kg": 5.0})
    assert design_from_project(priced).prices.magnet == 5.0


def test_price_resolution_rules():
    grade = library.magnet_grade("N42SH")
    assert magnet_price_per_kg(7.0, "EUR", grade) == 7.0
    assert magnet_price_per_kg(None, "EUR", grade) == grade.price_per_kg
    with pytest.raises(ValueError, match="USD"):
        magnet_price_per_kg(None, "USD", grade)


def test_a_custom_grade_may_carry_its_price_and_round_trips():
    grade = library.magnet_grade("Y30")
    table = library.grade_table(grade)
    assert table["price_per_kg"] == grade.price_per_kg and table["price_currency"] == "EUR"
    from pmdc_sizer.core.schema import CustomGrade

    again = library.grade_from_spec(CustomGrade.model_validate({**table, "name": "Y30 copy", "source": "test"}))
    assert again.price_per_kg == grade.price_per_kg
