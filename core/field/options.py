"""Settings of a field solution: mesh fineness, Newton tolerance and iteration limit, symmetry."""

from __future__ import annotations

from dataclasses import dataclass


@dataclass(frozen=True)
class FieldOptions:
    """How finely and how tightly a cross-section is solved.

    The default solves a demo in about a second on a two-core machine and gives the flux per pole to
    well under 0.5 % of a mesh twice as fine (tests/core/field/test_solve.py); :data:`COARSE` is for
    tests, :data:`FINE` for checks of mesh independence.

    Parameters
    ----------
    mesh_fineness : float
        Scales the number of elements along every edge [1]; 1 is the default, 2 halves the element size.
    tolerance : float
        Newton stops when the residual's norm has fallen below this fraction of the source's norm (the
        magnets' and currents' load vector) [1].
    max_iterations : int
        Newton iterations allowed before :class:`~.errors.FieldConvergenceError` is raised [1].
    full_machine : bool
        Mesh the whole circumference instead of the smallest symmetric sector (for checks; slower).
    """

    mesh_fineness: float = 1.0
    tolerance: float = 1e-8
    max_iterations: int = 40
    full_machine: bool = False

    def __post_init__(self):
        if not self.mesh_fineness > 0.0:
            raise ValueError(f"mesh_fineness must be positive, not {self.mesh_fineness!r}")
        if not 0.0 < self.tolerance < 1e-2:
            raise ValueError(f"tolerance must lie between 0 and 1e-2, not {self.tolerance!r}")
        if self.max_iterations < 1:
            raise ValueError(f"max_iterations must be at least 1, not {self.max_iterations!r}")


#: For unit tests: about a quarter of the default's elements.
COARSE = FieldOptions(mesh_fineness=0.5)
#: Twice as fine as the default along every edge, for checks of mesh independence.
FINE = FieldOptions(mesh_fineness=2.0)
