"""Armature reaction at the magnet tip and the rotor-removed circuit."""

from __future__ import annotations

import math

import numpy as np
import pytest
from numpy.testing import assert_allclose

from pmdc_sizer.core import demagnetization as dm
from pmdc_sizer.core import magnetic_circuit as mc
from pmdc_sizer.core.design import design_from_project
from pmdc_sizer.core.project import load


def test_armature_reaction_by_hand():
    # Triangular armature MMF, F(θ) = A·R·θ with A = Z·(I/a)/(2π·R); at the tip θ = θm/2:
    # F_tip = Z·(I/a)·θm/(4π); along magnet and gap in series ΔH = -F_tip/(lm + μrec·g)
    # (Hanselman 2006, ch. 5, from memory). 528 conductors, 10 A on 2 paths, 140° magnet,
    # 6 mm magnet, μrec 1.07, 0.45 mm gap: F_tip = 528·5·2.44346/(4π) = 513.33 A;
    # ΔH = -513.33/(6.4815e-3 m) = -79 200 A/m (hand arithmetic, 5 digits).
    field = dm.armature_reaction_field(10.0, 528, 2, math.radians(140.0), 6e-3, 1.07, 0.45e-3)
    assert_allclose(field, -79200.0, rtol=1e-4)
    # the sign of the current does not matter: one tip or the other is demagnetized
    assert dm.armature_reaction_field(-10.0, 528, 2, math.radians(140.0), 6e-3, 1.07, 0.45e-3) == field
    # linear in current
    assert_allclose(dm.armature_reaction_field(np.array([5.0, 20.0]), 528, 2, math.radians(140.0), 6e-3, 1.07, 0.45e-3),
                    [field / 2.0, 2.0 * field], rtol=1e-14)


def test_rotor_removed_circuit_drives_the_magnet_further_down(demo_path):
    design = design_from_project(load(demo_path))
    g = design.geometry
    circuit = mc.pole_circuit(g, design.magnet.recoil_permeability)
    open_circuit = dm.rotor_removed_circuit(g, circuit)
    assert_allclose(open_circuit.effective_gap, dm.OPEN_BORE_PATH_FACTOR * math.pi * g.magnet_inner_radius / g.poles,
                    rtol=1e-14)
    assert float(open_circuit.tooth_path) == 0.0 and float(open_circuit.core_path) == 0.0
    # the edge-to-edge leakage across the gap becomes part of the open path; the rest stays
    assert_allclose(open_circuit.leakage_permeance, circuit.leakage_permeance - circuit.edge_leakage_permeance,
                    rtol=1e-14)
    assert 0.0 < float(circuit.edge_leakage_permeance) < float(circuit.leakage_permeance)
    for temperature in (-20.0, 60.0):
        rotor_in = mc.solve(design.magnet, temperature, circuit, design.housing_steel, design.lamination_steel)
        rotor_out = mc.solve(design.magnet, temperature, open_circuit, design.housing_steel, design.lamination_steel)
        assert float(rotor_out.magnet_field) < float(rotor_in.magnet_field) < 0.0
        assert float(rotor_out.permeance_coefficient) < float(rotor_in.permeance_coefficient)


@pytest.mark.parametrize("kind", ["stall", "reversal", "current limit", "rotor removed"])
def test_every_case_kind_has_advice_in_words(kind):
    case = dm.DemagnetizationCase(name=kind, kind=kind, temperature_C=20.0, current_A=1.0, magnet_field_A_per_m=-1.0,
                                  magnet_flux_density_T=0.3, knee_field_A_per_m=-2.0, margin_A_per_m=1.0, ok=True)
    advice = dm.advice_for(case)
    assert len(advice.split()) >= 8
    assert any(word in advice for word in ("HcJ", "keeper", "limit", "thicken", "magnetize"))
