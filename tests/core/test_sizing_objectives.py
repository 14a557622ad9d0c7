"""The objectives and the non-dominated set, against a brute-force definition of dominance."""

from __future__ import annotations

import numpy as np

from pmdc_sizer.core.batch import screening_figures
from pmdc_sizer.core.sizing_objectives import OBJECTIVES, derived_figures, non_dominated, objective_matrix


def _brute_force(values: np.ndarray) -> np.ndarray:
    """Source: the definition of dominance (Deb 2001, ch. 2): no other row is <= everywhere and < once."""
    n = values.shape[0]
    return np.array([not any(np.all(values[j] <= values[i]) and np.any(values[j] < values[i])
                             for j in range(n) if j != i) for i in range(n)])


def test_non_dominated_matches_the_definition():
    rng = np.random.default_rng(3)
    for k in (1, 2, 3):
        values = rng.integers(0, 8, size=(120, k)).astype(float)  # ties and duplicates on purpose
        assert np.array_equal(non_dominated(values), _brute_force(values))
    assert non_dominated(np.zeros((0, 2))).shape == (0,)


def test_objectives_read_figures_the_chain_gives(ferrite):
    _, results = ferrite
    figures = {k: np.array([v]) for k, v in screening_figures(results).items()}
    derived = derived_figures(figures, np.array([results.geometry.housing_outer_diameter_m]), np.array([0.04]))
    every = {**figures, **derived}
    for objective in OBJECTIVES.values():
        assert objective.figure in every, objective.name
    efficiency = min(c.rated.efficiency for c in results.cases)
    assert derived["worst.rated_efficiency"][0] == efficiency
    hot = results.cases[2]
    assert derived["hot.rated_copper_loss_W"][0] == hot.rated.current_A**2 * hot.terminal_resistance_ohm
    matrix = objective_matrix(("mass", "efficiency"), every)
    assert matrix[0, 0] == figures["mass.active_kg"][0] and matrix[0, 1] == -efficiency
