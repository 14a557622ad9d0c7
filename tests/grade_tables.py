"""Magnet-grade tables the tests write into project files and user libraries, all invented (or, for
AlNiCo 5, a copy of a retired entry), and the helper that puts one inline into a demo project."""

from __future__ import annotations

import tomllib
from pathlib import Path

import tomli_w

#: an invented anisotropic ferrite, as a supplier's certificate would give it (a project's custom grade)
SUPPLIER_FERRITE = {
    "name": "supplier ABC-30", "family": "hard ferrite, anisotropic", "remanence_T": 0.39,
    "coercivity_HcB_kA_per_m": 235.0, "coercivity_HcJ_kA_per_m": 245.0, "energy_product_kJ_per_m3": 29.0,
    "recoil_permeability": 1.07, "squareness": 0.9, "remanence_temp_coeff_pct_per_K": -0.19,
    "coercivity_temp_coeff_pct_per_K": 0.27, "max_working_temperature_C": 250.0, "density_kg_per_m3": 4900.0,
    "source": "certificate 123 (invented for this test)",
}

#: the same kind of ferrite as one certified lot, for a user-library file (invented)
CERTIFIED_LOT = {
    **SUPPLIER_FERRITE, "name": "certified Y30 lot 7", "remanence_T": 0.392, "coercivity_HcB_kA_per_m": 192.0,
    "coercivity_HcJ_kA_per_m": 205.0, "coercivity_temp_coeff_pct_per_K": 0.3,
    "source": "lot certificate (invented for this test)",
}

#: the AlNiCo 5 entry the library carried before (typical, from memory: cast AlNiCo 5, MMPA 0100-00
#: class): its straight-from-Br curve plotted points at B = -1.6 T; AlNiCo is now refused
ALNICO_5 = {
    "name": "AlNiCo 5", "family": "AlNiCo", "remanence_T": 1.25, "coercivity_HcB_kA_per_m": 50.0,
    "coercivity_HcJ_kA_per_m": 52.0, "energy_product_kJ_per_m3": 40.0, "recoil_permeability": 3.0,
    "squareness": 0.55, "remanence_temp_coeff_pct_per_K": -0.02, "coercivity_temp_coeff_pct_per_K": 0.01,
    "max_working_temperature_C": 525.0, "density_kg_per_m3": 7300.0, "source": "test copy of the old entry",
}

#: Y40 as once stored: squareness 0.90 with HcB 330 kA/m (J = 0.93·Br there) cannot lie on one curve
Y40_AS_ONCE_STORED = {
    **SUPPLIER_FERRITE, "name": "Y40 lot", "remanence_T": 0.445, "coercivity_HcB_kA_per_m": 330.0,
    "coercivity_HcJ_kA_per_m": 345.0, "energy_product_kJ_per_m3": 37.5, "recoil_permeability": 1.05,
    "squareness": 0.90, "coercivity_temp_coeff_pct_per_K": 0.15, "source": "the stored Y40 data before correction",
}


def with_inline_grade(demo: Path, folder: Path, grade_table: dict) -> Path:
    """A copy of ``demo`` in ``folder`` whose magnets use ``grade_table`` inline instead of a library grade."""
    data = tomllib.loads(demo.read_text(encoding="utf-8"))
    del data["magnets"]["grade"]
    data["magnets"]["custom_grade"] = grade_table
    path = folder / "inline.toml"
    path.write_text(tomli_w.dumps(data), encoding="utf-8")
    return path
