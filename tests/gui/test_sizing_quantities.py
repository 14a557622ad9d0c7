"""What the sizing page offers of a search's result: objectives, kept figures and the free keys as numbers."""

from __future__ import annotations

from pathlib import Path

import numpy as np

from pmdc_sizer.app.gui.display_units import DisplayUnits
from pmdc_sizer.app.gui.sizing_quantities import VALUE, quantities
from pmdc_sizer.core import project
from pmdc_sizer.core.sizing import SizingSpec, size
from pmdc_sizer.core.sizing_space import parse_free

FERRITE = Path(__file__).resolve().parents[2] / "demo_projects" / "appliance_ferrite_12v.toml"


def test_a_freed_pole_count_is_a_number_on_the_page():
    # poles are chosen from a list ("2,4") like a grade, but they are a count: the table and the axes show
    # them (they were left out with the grades and steels, so a search over poles hid which it chose)
    ferrite = project.load(FERRITE)
    ranges = ("motor.poles=2:4", "magnets.thickness_mm=6.5:9", "winding.turns_per_coil=12:20")
    spec = SizingSpec(free=tuple(parse_free(f, ferrite) for f in ranges), candidates=128, generations=0, seed=2)
    result = size(ferrite, spec)
    assert result.designs and result.feasible_count
    units = {"motor.poles": "", "magnets.thickness_mm": "mm", "winding.turns_per_coil": ""}
    shown = {q.name: q for q in quantities(result, units, DisplayUnits())}
    poles = shown["motor.poles"]
    assert poles.kind == VALUE and poles.integer and poles.label() == "Poles"
    assert set(np.unique(poles.feasible(result, DisplayUnits()))) <= {2.0, 4.0}
    for design in result.designs:
        assert poles.of_design(design, DisplayUnits()) == float(design.values["motor.poles"])
        assert poles.number(poles.of_design(design, DisplayUnits())) in ("2", "4")
