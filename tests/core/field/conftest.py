"""Designs shared by the field-solution tests: the demos, and idealised cross-sections with closed forms."""

from __future__ import annotations

import dataclasses
import math

import pytest

from pmdc_sizer.core.design import design_from_project
from pmdc_sizer.core.geometry import Geometry
from pmdc_sizer.core.magnets import MagnetGrade
from pmdc_sizer.core.project import load
from pmdc_sizer.core.steel import Steel
from pmdc_sizer.core.units import MU_0

from ...conftest import DEMO_FOLDER

FERRITE = DEMO_FOLDER / "appliance_ferrite_12v.toml"
NDFEB = DEMO_FOLDER / "mobility_ndfeb_24v.toml"
DRILL = DEMO_FOLDER / "power_tool_4pole_48v.toml"

#: Linear iron of relative permeability 1e5 up to 250 T: "ideal" for the closed forms (its own MMF drop
#: is below 1e-4 of the gap's in the cross-sections below).
IDEAL_IRON = Steel(name="ideal iron", kind="housing", field_strength=(0.0, 1.0e3, 2.0e3),
                   flux_density=(0.0, MU_0 * 1e5 * 1.0e3, MU_0 * 1e5 * 2.0e3), density=7850.0)

#: A grade whose knee is far away: on its recoil line everywhere the tests drive it.
LINEAR_GRADE = MagnetGrade(
    name="linear test grade", family="SmCo 2:17", remanence=1.0, coercivity_hcb=790e3, coercivity_hcj=1.5e6,
    energy_product=200e3, recoil_permeability=1.05, squareness=0.98, remanence_temp_coeff=0.0,
    coercivity_temp_coeff=0.0, max_working_temperature_C=300.0, density=8300.0,
)


def demo(path):
    return design_from_project(load(path))


@pytest.fixture(scope="session")
def ferrite():
    return demo(FERRITE)


@pytest.fixture(scope="session")
def ndfeb():
    return demo(NDFEB)


def slotless_ideal(poles=2, armature_radius=20e-3, gap=0.5e-3, thickness=3e-3, embrace=0.9, slots=24):
    """A design whose armature is smooth (slot openings of 1 µm) and whose iron is ideal, radially
    magnetized linear magnets: the cross-section of the closed forms."""
    base = demo(FERRITE)
    geometry = Geometry(
        poles=poles, magnet_thickness=thickness, magnet_arc=embrace * 2.0 * math.pi / poles, magnet_length=0.05,
        airgap=gap, housing_wall=6e-3, housing_length=0.05, armature_radius=armature_radius, stack_length=0.05,
        stacking_factor=1.0, slots=slots, slot_opening=1e-6, tooth_width=2.5e-3, slot_depth=4e-3, shaft_radius=4e-3,
    )
    return dataclasses.replace(base, geometry=geometry, magnet=LINEAR_GRADE, housing_steel=IDEAL_IRON,
                               lamination_steel=dataclasses.replace(IDEAL_IRON, kind="lamination"),
                               magnetization="radial", shaft_magnetic=True)


def with_wall(design, wall):
    return dataclasses.replace(design, geometry=dataclasses.replace(design.geometry, housing_wall=wall))
