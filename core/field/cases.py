"""The named cases a design's field is solved for, each with its magnet temperature and current.

The no-load case is at the fast model's magnet temperature (the nominal ambient). The loaded and the
rotor-removed cases mirror the fast model's demagnetization cases one for one (core.demagnetization):
stall, reversal (plugging) and the drive's current limit at the coldest and hottest magnet
temperatures, and the armature pulled out; only the cases the fast model computes for the design exist.
"""

from __future__ import annotations

from dataclasses import dataclass

NO_LOAD, ARMATURE_CURRENT, ROTOR_REMOVED = "no load", "armature current", "rotor removed"

#: Case names in the order a table lists them; the fast model's case kind gives the first part.
CASE_NAMES = ("no-load", "stall-cold", "stall-hot", "reversal-cold", "reversal-hot", "drive-limit-cold",
              "drive-limit-hot", "rotor-removed-cold", "rotor-removed-hot")
_PREFIX = {"stall": "stall", "reversal": "reversal", "current limit": "drive-limit", "rotor removed": "rotor-removed"}


@dataclass(frozen=True)
class FieldCase:
    """One field solution to make: what drives the field, at what temperature, with the rotor where."""

    name: str  #: e.g. "stall-cold" (see :data:`CASE_NAMES`)
    kind: str  #: :data:`NO_LOAD`, :data:`ARMATURE_CURRENT` or :data:`ROTOR_REMOVED`
    magnet_temperature_C: float  #: [°C]
    current_A: float = 0.0  #: armature current, brushes on the neutral axis [A]
    rotor_position_rad: float = 0.0  #: mechanical; at 0 a slot centre faces the centre of magnet 0 [rad]
    demagnetization_case: str | None = None  #: name of the fast model's case this one mirrors

    def __post_init__(self):
        if self.kind not in (NO_LOAD, ARMATURE_CURRENT, ROTOR_REMOVED):
            raise ValueError(f"field case kind {self.kind!r} is not one of {NO_LOAD!r}, {ARMATURE_CURRENT!r}, "
                             f"{ROTOR_REMOVED!r}")
        if self.kind != ARMATURE_CURRENT and self.current_A != 0.0:
            raise ValueError(f"field case {self.name!r}: a {self.kind} case carries no armature current")


def no_load_case(magnet_temperature_C: float, rotor_position_rad: float = 0.0) -> FieldCase:
    """The magnets alone, armature in place.

    Parameters
    ----------
    magnet_temperature_C : float
        [°C].
    rotor_position_rad : float
        [rad].

    Returns
    -------
    FieldCase
        Named ``"no-load"``.
    """
    return FieldCase("no-load", NO_LOAD, float(magnet_temperature_C), rotor_position_rad=rotor_position_rad)


def field_cases(design, results) -> tuple[FieldCase, ...]:
    """The named cases of a design, from its fast-model results.

    Parameters
    ----------
    design : Design
        The design (kept for the signature the edges use; the cases read the results).
    results : Results
        What :func:`pmdc_sizer.core.evaluate.evaluate` returned for ``design``: its no-load magnet
        temperature (``magnetics.temperature_C``) and its demagnetization cases (kind, temperature,
        current).

    Returns
    -------
    tuple of FieldCase
        ``no-load`` first, then the cases of :data:`CASE_NAMES` that exist for the design, in that order. A
        case colder than the no-load temperature is "cold", the others "hot".
    """
    del design  # the results carry everything the cases need
    nominal = float(results.magnetics.temperature_C)
    found = {"no-load": no_load_case(nominal)}
    for fast in results.demagnetization.cases:
        prefix = _PREFIX.get(fast.kind)
        if prefix is None:
            continue
        name = f"{prefix}-{'cold' if fast.temperature_C < nominal else 'hot'}"
        if name in found:
            continue
        if fast.kind == "rotor removed":
            found[name] = FieldCase(name, ROTOR_REMOVED, float(fast.temperature_C), demagnetization_case=fast.name)
        else:
            found[name] = FieldCase(name, ARMATURE_CURRENT, float(fast.temperature_C), float(fast.current_A),
                                    demagnetization_case=fast.name)
    return tuple(found[name] for name in CASE_NAMES if name in found)
