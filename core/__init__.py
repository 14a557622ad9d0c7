"""pmdc-sizer's computation: brushed permanent-magnet DC motors from a project file to every figure.

Pure functions and frozen dataclasses in SI units (temperatures in °C), one physical topic per module.
The public API::

    from pmdc_sizer.core import load, with_values, evaluate
    project = load("demo_projects/appliance_ferrite_12v.toml")
    results = evaluate(with_values(project, {"magnets.thickness_mm": 4.0}))
    results.nominal.no_load_speed_rad_per_s

    magnet_grades()                      # the grade library, built in and the user's own
    magnetics_sweep(project, "housing.wall_mm", [2, 3, 4])   # one vectorised solve over a sweep

Errors that a caller should expect are :class:`ProjectError` (a file, key or value that cannot be used;
the message names the key and the limit) and :class:`MagneticCircuitError` (a design without solution).
Re-fits are in :mod:`pmdc_sizer.core.refit`. ``pmdc_sizer.core.evaluate`` is the function; its module is
reached as ``from pmdc_sizer.core.evaluate import ...``.
"""

from __future__ import annotations

from .design import Design, design_from_project
from .difference import Comparison, compare, with_grade
from .edits import get_value, with_values
from .errors import MagneticCircuitError, ProjectError
from .evaluate import evaluate
from .keys import key_spec, key_specs
from .library import magnet_grade, magnet_grades, steels
from .project import dumps, load, parse, save
from .results import Results
from .schema import Project
from .sweep import magnetics_sweep

__all__ = [
    "Comparison", "Design", "MagneticCircuitError", "Project", "ProjectError", "Results",
    "compare", "design_from_project", "dumps", "evaluate", "get_value", "key_spec", "key_specs", "load",
    "magnet_grade", "magnet_grades", "magnetics_sweep", "parse", "save", "steels", "with_grade",
    "with_values",
]
