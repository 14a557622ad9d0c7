"""Field labels: the words a person reads for a project key, on screen and in the terminal.

One table for every edge (the GUI editor and its messages, the sizing page, the ``size`` command's
explanation and table): ``label_for("magnets.thickness_mm")`` is "Magnet thickness". Where the key name
alone reads well, the label is made from it, its unit suffix dropped (the widget or the heading shows the
unit). :func:`worded_keys` rewrites the core's key-bearing text ("magnets.thickness_mm = 9.6 mm") with
the labels. No Qt here.
"""

from __future__ import annotations

import re
from functools import cache

from pmdc_sizer.core.keys import key_specs

# Key names carry their unit as a suffix; the label drops it because the spin box shows it.
_UNIT_SUFFIXES = (
    "_kA_per_m", "_kJ_per_m3", "_pct_per_K", "_kg_per_m3", "_K_per_W", "_W_per_m2K", "_mNm_per_krpm",
    "_per_kg", "_mNm", "_rpm", "_mm", "_deg", "_gcm2", "_min", "_V", "_A", "_C", "_T",
)
# Where the key name alone reads poorly on screen.
_LABELS = {
    "tolerances.remanence_pct": "Br ±", "tolerances.coercivity_pct": "HcJ ±",
    "tolerances.magnet_thickness_mm": "Magnet thickness ±", "tolerances.airgap_mm": "Air gap ±",
    "tolerances.wire_diameter_mm": "Wire diameter ±", "tolerances.copper_resistivity_pct": "Copper resistivity ±",
    "tolerances.brush_drop_V": "Brush drop ±", "tolerances.friction_torque_pct": "Friction torque ±",
    "tolerances.supply_voltage_pct": "Supply voltage ±", "tolerances.samples": "Motors in the study",
    "tolerances.seed": "Seed of the study",
    "supply.reversing": "Reversed at speed",
    "supply.current_limit_A": "Drive current limit",
    "load.torque_mNm": "Rated torque",
    "load.speed_rpm": "Speed needed at rated torque",
    "temperatures.ambient_min_C": "Coldest ambient",
    "temperatures.ambient_nominal_C": "Nominal ambient",
    "temperatures.ambient_max_C": "Hottest ambient",
    "motor.poles": "Poles",
    "magnets.grade": "Magnet grade",
    "magnets.arc_deg": "Magnet arc",
    "magnets.thickness_mm": "Magnet thickness",
    "magnets.length_mm": "Magnet length",
    "airgap.length_mm": "Air gap",
    "housing.wall_mm": "Housing wall",
    "housing.length_mm": "Housing length",
    "housing.steel": "Housing steel",
    "housing.max_outer_diameter_mm": "Envelope diameter",
    "housing.max_length_mm": "Envelope length",
    "armature.outer_diameter_mm": "Armature diameter",
    "armature.steel": "Lamination steel",
    "winding.type": "Winding type",
    "winding.wire": "Wire size",
    "losses.viscous_mNm_per_krpm": "Viscous torque per krpm",
    "thermal.duty_minutes": "S2 run length",
    "thermal.cycle_duration_factor_pct": "S3 cycle duration factor",
    "thermal.cycle_minutes": "S3 cycle length",
    "thermal.winding_heat_capacity_J_per_K": "Winding heat capacity",
    "thermal.winding_to_magnet_K_per_W": "Thermal resistance, gap to magnets",
    "magnets.required_margin_pct_of_HcJ": "Required margin to the knee",
    "supply.fault_cases": "Direct-supply faults",
    "brushes.current_density_limit_A_per_cm2": "Brush current density limit",
    "brushes.count": "Number of brushes",
    "brushes.width_mm": "Brush width",
    "brushes.length_mm": "Brush length",
    "brushes.commutator_diameter_mm": "Commutator diameter",
    "brushes.grade": "Brush grade",
    "rotor.extra_inertia_gcm2": "Extra inertia on shaft",
    "prices.magnet_per_kg": "Magnet price",
    "prices.copper_per_kg": "Copper price",
    "prices.housing_steel_per_kg": "Housing steel price",
    "prices.lamination_per_kg": "Lamination price",
    "project.name": "Design name",
    "magnets.custom_grade.name": "Grade name",
    "magnets.custom_grade.remanence_T": "Br",
    "magnets.custom_grade.coercivity_HcB_kA_per_m": "HcB",
    "magnets.custom_grade.coercivity_HcJ_kA_per_m": "HcJ",
    "magnets.custom_grade.energy_product_kJ_per_m3": "(BH)max",
    "magnets.custom_grade.recoil_permeability": "Recoil permeability μrec",
    "magnets.custom_grade.squareness": "Squareness Hk/HcJ",
    "magnets.custom_grade.remanence_temp_coeff_pct_per_K": "Br temperature coefficient",
    "magnets.custom_grade.coercivity_temp_coeff_pct_per_K": "HcJ temperature coefficient",
    "magnets.custom_grade.max_working_temperature_C": "Max. working temperature",
    "magnets.custom_grade.source": "Data source",
}
def label_for(key: str) -> str:
    """The field's label as a heading or at the start of a sentence: "Magnet thickness"."""
    if key in _LABELS:
        return _LABELS[key]
    name = key.rsplit(".", 1)[-1]
    for suffix in _UNIT_SUFFIXES:
        if name.endswith(suffix):
            name = name[: -len(suffix)]
            break
    words = name.replace("_", " ")
    return words[0].upper() + words[1:]


def label_in_sentence(key: str) -> str:
    """The field's label inside a sentence: "magnet thickness", but "HcJ", "Br temperature coefficient" and
    "S2 run length" (a symbol keeps its case: a first word of two letters, or with a capital or a digit inside)."""
    label = label_for(key)
    first = label.split(" ", 1)[0]
    symbol = len(first) <= 2 or not first.strip(".").replace("-", "").isalpha() or first[1:] != first[1:].lower()
    return label if symbol else label[0].lower() + label[1:]


def field_message(key: str, message: str) -> str:
    """A core message about ``key`` worded with the field's label ("Magnet thickness = 50: ...")."""
    return message.replace(key, label_for(key))


# A dotted key as the core writes it in a message, with the " = " of a value that may follow it.
_KEY_IN_TEXT = re.compile(r"(?<![\w.])([a-z][a-z_]*(?:\.[a-z_][A-Za-z0-9_]*)+)(?!\w)( = )?")


@cache
def _known_keys() -> frozenset[str]:
    return frozenset(spec.path for spec in key_specs())


def worded_keys(text: str, show_keys: bool = False) -> str:
    """The core's key-bearing text with each key worded by its label.

    ``"with magnets.thickness_mm = 9.6 mm (beyond the range's 9)"`` becomes ``"with magnet thickness 9.6 mm
    (beyond the range's 9)"``; with ``show_keys`` (the command line, where the user typed the keys) the
    first mention of each key keeps it in parentheses: ``"magnet thickness (magnets.thickness_mm) 9.6 mm"``.
    A label that starts a sentence is capitalised; a dotted word that is not a schema key is left alone.
    """
    mentioned: set[str] = set()

    def word(match: re.Match[str]) -> str:
        key, assigned = match.group(1), match.group(2)
        if key not in _known_keys():
            return match.group(0)
        before = text[:match.start()].rstrip()
        label = label_for(key) if not before or before.endswith((".", "!", "?")) else label_in_sentence(key)
        if show_keys and key not in mentioned:
            label += f" ({key})"
        mentioned.add(key)
        return label + (" " if assigned else "")

    return _KEY_IN_TEXT.sub(word, text)


__all__ = ["field_message", "label_for", "label_in_sentence", "worded_keys"]
