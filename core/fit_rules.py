"""Cross-field rules of a project: the parts must fit and the numbers must agree with each other.

The dimensions are checked on the design's SI cross-section (:func:`design.geometry_of`), the same
derivation the computation uses, and reported in the file's millimetres. Each failure names the key
to change and its limit.
"""

from __future__ import annotations

import math

import numpy as np
from pydantic import ValidationError

from .conductors import parse_wire_size
from .design import geometry_of
from .errors import ProjectError
from .keys import format_validation_error, key_specs
from .migrations import migrate
from .schema import FORMAT_VERSION, Project
from .units import from_si

MIN_CORE_DEPTH = 1.0e-3  #: back iron between slot bottoms and shaft, at least [m] (our rule)
MAX_TOOTH_SHARE_AT_ROOT = 0.9  #: a tooth may take at most this share of the slot pitch at the slot bottom (our rule)
MIN_TOOTH_TIP = 0.2e-3  #: the slot opening leaves at least this much tooth tip at the surface [m] (our rule)
MAX_EMBRACE = 0.98  #: adjacent magnets would touch beyond this share of the pole pitch (our rule)


def _mm(length: float | np.ndarray) -> float:
    return float(from_si(length, "mm"))


def check_fit(project: Project) -> None:
    """Raise :class:`ProjectError` naming the key and the limit when the parts do not fit.

    Parameters
    ----------
    project : Project
        A project whose sections passed the schema.

    Raises
    ------
    ProjectError
        On the first rule broken.

    References
    ----------
    .. [1] wave winding: the commutator pitch (C ± m)/(p/2) must be a whole number (textbook relation,
       from memory).
    .. [2] the clearances (MIN_CORE_DEPTH, MAX_TOOTH_SHARE_AT_ROOT, MIN_TOOTH_TIP, MAX_EMBRACE): our
       rules, no source.
    """
    p = project

    def fail(key: str, message: str):
        raise ProjectError(f"{key}: {message}", key=key)

    s = p.supply
    if s.voltage_V <= s.brush_drop_V:
        fail("supply.voltage_V",
             f"{s.voltage_V:g} V is not above supply.brush_drop_V ({s.brush_drop_V:g} V): nothing would be left to "
             "drive the armature; raise the voltage or lower the brush drop")
    t = p.temperatures
    if not t.ambient_min_C <= t.ambient_nominal_C <= t.ambient_max_C:
        fail("temperatures.ambient_nominal_C",
             f"{t.ambient_nominal_C:g} °C must lie between ambient_min_C ({t.ambient_min_C:g} °C) "
             f"and ambient_max_C ({t.ambient_max_C:g} °C)")
    m, a, h, w = p.magnets, p.armature, p.housing, p.winding
    if (m.grade is None) == (m.custom_grade is None):
        fail("magnets.grade", "give either a library grade or a [magnets.custom_grade] table, not both or neither")
    pole_pitch_deg = 360.0 / p.motor.poles
    if m.arc_deg > MAX_EMBRACE * pole_pitch_deg:
        fail("magnets.arc_deg",
             f"{m.arc_deg:g}° is more than 98 % of the pole pitch ({pole_pitch_deg:g}° for {p.motor.poles} poles, "
             f"so at most {MAX_EMBRACE * pole_pitch_deg:.4g}°); adjacent magnets would touch")
    if m.length_mm < a.stack_length_mm:
        fail("magnets.length_mm",
             f"{m.length_mm:g} mm is shorter than the armature stack ({a.stack_length_mm:g} mm); the overhang would "
             "be negative")
    if h.length_mm < m.length_mm:
        fail("housing.length_mm", f"{h.length_mm:g} mm is shorter than the magnets ({m.length_mm:g} mm)")
    if m.custom_grade is not None:
        c = m.custom_grade
        if c.coercivity_HcB_kA_per_m > c.coercivity_HcJ_kA_per_m:
            fail("magnets.custom_grade.coercivity_HcB_kA_per_m",
                 f"{c.coercivity_HcB_kA_per_m:g} kA/m exceeds HcJ ({c.coercivity_HcJ_kA_per_m:g} kA/m); "
                 "HcB ≤ HcJ always")
    g = geometry_of(p)
    core_depth = float(g.core_depth)
    if core_depth < MIN_CORE_DEPTH:
        fail("armature.slot_depth_mm",
             f"{a.slot_depth_mm:g} mm leaves {_mm(core_depth):.3g} mm of core between the slot bottoms and "
             f"the shaft; at most {max(_mm(g.armature_radius - g.shaft_radius - MIN_CORE_DEPTH), 0):.4g} mm for "
             "this diameter and shaft (1 mm of core at least)")
    root_pitch = 2.0 * math.pi * float(g.slot_bottom_radius) / a.slots
    if g.tooth_width >= MAX_TOOTH_SHARE_AT_ROOT * root_pitch:
        fail("armature.tooth_width_mm",
             f"{a.tooth_width_mm:g} mm leaves no room for the slots at the slot bottom (slot pitch there "
             f"{_mm(root_pitch):.3g} mm; the tooth may be at most {_mm(MAX_TOOTH_SHARE_AT_ROOT * root_pitch):.3g} mm)")
    surface_pitch = float(g.slot_pitch)
    if g.slot_opening >= surface_pitch - MIN_TOOTH_TIP:
        fail("armature.slot_opening_mm",
             f"{a.slot_opening_mm:g} mm is wider than the slot pitch at the surface allows "
             f"(at most {_mm(surface_pitch - MIN_TOOTH_TIP):.3g} mm)")
    slot_width_at_top = surface_pitch - float(g.tooth_width)
    if g.slot_opening > slot_width_at_top + 1e-12:
        fail("armature.slot_opening_mm",
             f"{a.slot_opening_mm:g} mm is wider than the slot itself at the surface ({_mm(slot_width_at_top):.3g} mm)")
    if w.commutator_segments % a.slots != 0:
        fail("winding.commutator_segments",
             f"{w.commutator_segments} is not a whole multiple of the {a.slots} slots "
             "(one, two or more coils per slot)")
    pole_pairs = p.motor.poles // 2
    if w.type == "wave" and pole_pairs > 1 and (
        (w.commutator_segments + w.multiplicity) % pole_pairs and (w.commutator_segments - w.multiplicity) % pole_pairs
    ):
        fail("winding.commutator_segments",
             f"{w.commutator_segments} segments cannot carry a wave winding on {p.motor.poles} poles: "
             f"segments ± multiplicity must divide by the {pole_pairs} pole pairs")
    if a.slots < p.motor.poles:
        fail("armature.slots", f"{a.slots} slots is fewer than the {p.motor.poles} poles")
    if h.max_outer_diameter_mm is not None:
        outer = _mm(2.0 * g.housing_outer_radius)
        if outer > h.max_outer_diameter_mm + 1e-9:
            fail("housing.max_outer_diameter_mm",
                 f"the housing comes out at {outer:.4g} mm across (armature + 2 × (gap + magnet + wall)), over the "
                 f"envelope of {h.max_outer_diameter_mm:g} mm")
    if h.max_length_mm is not None:
        length = _mm(g.overall_length)
        if length > h.max_length_mm + 1e-9:
            fail("housing.max_length_mm",
                 f"the motor body comes out at {length:.4g} mm long (the housing tube, end caps inside), over the "
                 f"envelope of {h.max_length_mm:g} mm")


#: Each dimensional tolerance of ``[tolerances]`` → the key it spreads and whether its ± is a share (%) of it.
SPREAD_KEYS = {
    "magnet_thickness_mm": ("magnets.thickness_mm", False),
    "airgap_mm": ("airgap.length_mm", False),
    "brush_drop_V": ("supply.brush_drop_V", False),
    "supply_voltage_pct": ("supply.voltage_V", True),
    "friction_torque_pct": ("losses.friction_torque_mNm", True),
}
_SUPPLY_PAIR = ("supply_voltage_pct", "brush_drop_V")
_BISECTION_STEPS = 40


def _spread_corner(data: dict, changes: dict[str, float]) -> None:
    """Raise ProjectError (or ValidationError) when the design with these keys moved breaks a rule."""
    corner = {section: dict(values) if isinstance(values, dict) else values for section, values in data.items()}
    for path, value in changes.items():
        section, name = path.split(".")
        corner[section][name] = value
    # the envelope is a requirement a spread may miss (the study counts it against the yield), not a part
    # that cannot be made
    corner["housing"].pop("max_outer_diameter_mm", None)
    corner["housing"].pop("max_length_mm", None)
    check_fit(Project.model_validate(corner))


def _spread_fits(project: Project, data: dict, key: str, tolerance: float) -> str:
    """Why the design at the ends of one tolerance cannot be made, or "" when both ends can.

    The supply voltage and the brush drop move together (the supply must stay above the brush drop):
    each is tried against both ends of the other's spread as the project states it.
    """
    moving = {key: tolerance}
    if key in _SUPPLY_PAIR:
        other = next(k for k in _SUPPLY_PAIR if k != key)
        moving[other] = getattr(project.tolerances, other)
    corners: list[dict[str, float]] = [{}]
    for name, plus_minus in moving.items():
        path, relative = SPREAD_KEYS[name]
        section, field = path.split(".")
        nominal = data[section][field]
        step = nominal * plus_minus / 100.0 if relative else plus_minus
        corners = [{**corner, path: round(value, 12)} for corner in corners
                   for value in (nominal - step, nominal + step)]
    for changes in corners:
        try:
            _spread_corner(data, changes)
        except ValidationError as error:
            return str(format_validation_error(error))
        except ProjectError as error:
            return str(error)
    return ""


def check_tolerance_fit(project: Project, only_changed: bool = False) -> None:
    """Raise :class:`ProjectError` naming a tolerance and its limit when its spread could make an impossible part.

    Each dimensional tolerance is applied to the design, at the low and the high end of its ± (the supply
    voltage and the brush drop together), and the ends must pass the schema and the fit rules of a file
    (the envelope aside: it is a requirement the study counts against the yield). The wire's ± must
    leave copper. The grade's Br and HcJ spreads are checked by the study (:mod:`core.tolerances`).

    Parameters
    ----------
    project : Project
        A project that passed the schema and :func:`check_fit`.
    only_changed : bool, optional
        Check only the tolerances that differ from their defaults (what a file sets); the study checks
        them all, since a default may not suit a design (±0.2 V on a 0 V brush drop).

    Raises
    ------
    ProjectError
        With ``key`` the tolerance, and the largest value the design allows.
    """
    t = project.tolerances
    defaults = type(t)()
    data = project.model_dump(mode="python", exclude_none=True)
    for key, (_, relative) in SPREAD_KEYS.items():
        tolerance = getattr(t, key)
        if tolerance == 0.0 or (only_changed and tolerance == getattr(defaults, key)):
            continue
        problem = _spread_fits(project, data, key, tolerance)
        if not problem:
            continue
        low, high = 0.0, tolerance
        for _ in range(_BISECTION_STEPS):
            middle = 0.5 * (low + high)
            low, high = (low, middle) if _spread_fits(project, data, key, middle) else (middle, high)
        unit = "%" if relative else key.rsplit("_", 1)[1]
        raise ProjectError(
            f"tolerances.{key} = {tolerance:g} {unit}: at an end of its spread {problem}; at most "
            f"{round(low, 9):.4g} {unit} for this design (a part outside it could not be made)",
            key=f"tolerances.{key}")
    if t.wire_diameter_mm is not None and not (only_changed and t.wire_diameter_mm == defaults.wire_diameter_mm):
        try:
            bare_mm = _mm(parse_wire_size(project.winding.wire))
        except ValueError:  # a size that is not one: the design's conversion names winding.wire
            return
        if t.wire_diameter_mm >= bare_mm:
            raise ProjectError(
                f"tolerances.wire_diameter_mm = {t.wire_diameter_mm:g} mm: the thinnest wire of the spread would "
                f"have no copper ({project.winding.wire}, {bare_mm:.4g} mm bare); less than {bare_mm:.4g} mm",
                key="tolerances.wire_diameter_mm")


def validate(data: dict) -> Project:
    """A validated :class:`Project` from parsed TOML data: the schema, the required keys, the fit rules.

    Parameters
    ----------
    data : dict
        Parsed TOML.

    Returns
    -------
    Project
        Validated; never half a design.

    Raises
    ------
    ProjectError
        Naming the key and the limit.
    """
    if not isinstance(data, dict):
        raise ProjectError("the project is not a table of keys")
    data = migrate(data)
    version = data.get("format_version", FORMAT_VERSION)
    if isinstance(version, int) and not isinstance(version, bool) and version > FORMAT_VERSION:
        raise ProjectError(
            f"format_version = {version}: this file was written by a newer pmdc-sizer (this one reads format "
            f"version {FORMAT_VERSION}); update pmdc-sizer to open it",
            key="format_version",
        )
    try:
        project = Project.model_validate(data)
    except ValidationError as error:
        raise format_validation_error(error) from None
    for spec in key_specs():
        if spec.required_in_file and ".custom_grade." not in spec.path and spec.path != "format_version":
            section, name = spec.path.split(".")
            if name not in data.get(section, {}):
                raise ProjectError(f"{spec.path}: required key is missing ({spec.description.rstrip('.')})",
                                   key=spec.path)
    if "format_version" not in data:
        raise ProjectError("format_version: required key is missing (write format_version = "
                           f"{FORMAT_VERSION} at the top of the file)", key="format_version")
    check_fit(project)
    check_tolerance_fit(project, only_changed=True)
    return project
