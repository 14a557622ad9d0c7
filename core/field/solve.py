"""Newton's method on the 2-D nonlinear magnetostatic field of the cross-section, on scikit-fem.

Formulation. Vector potential A (the z-component, per metre of stack), B = curl A = (∂A/∂y, -∂A/∂x), on
linear triangles (B constant in each element). Ampère's law in weak form, with H = ν(B²)·B in iron and
air and H = ν_m·(B - Br·m) in the magnet on its recoil line (ν_m = 1/(μ0·μrec)):

    r(A)·v = ∫ ν(|∇A|²)·∇A·∇v  +  ∮ ν0·(n/R)·A·v  -  ∫ J·v  -  ∫ ν_m·Br·(m_x·∂v/∂y - m_y·∂v/∂x)  = 0.

The boundary term at the outer air's edge (radius R) carries the field's fundamental, A ∝ r^-n·cos(n·θ)
with n = p/2 pole pairs, out to infinity exactly (the exterior solution of Laplace's equation); the
faster-decaying harmonics are damped a little more than free space would. Newton's step solves

    [∫ ν·∇u·∇v + 2·(dν/dB²)·(∇A·∇u)(∇A·∇v)] δ = -r(A),

the consistent Jacobian (the derivative of ν(B²) is exact for the table of core.field.materials), and a
backtracking line search halves the step until the residual's norm falls (Armijo's rule, factor 1e-4).
It stops when ‖r‖ ≤ tolerance·‖f‖, f the load of magnets and currents; otherwise it raises
:class:`~.errors.FieldConvergenceError` and returns nothing.

References: P. P. Silvester and R. L. Ferrari, "Finite Elements for Electrical Engineers", 3rd ed.,
Cambridge University Press, 1996, ch. 5 (Newton on the reluctivity); S. J. Salon, "Finite Element
Analysis of Electrical Machines", Kluwer, 1995, ch. 3 and 5 (both from memory); J. Nocedal and
S. J. Wright, "Numerical Optimization", 2nd ed., Springer, 2006, §3.1 (Armijo backtracking).
"""

from __future__ import annotations

import math
from collections.abc import Callable
from dataclasses import dataclass

import numpy as np
import scipy.sparse as sp
import scipy.sparse.linalg as spla
import skfem
from skfem.helpers import grad

from .cases import ARMATURE_CURRENT, ROTOR_REMOVED, FieldCase
from .errors import FieldCancelled, FieldConvergenceError
from .excitation import magnetization_direction, slot_current_density, slot_currents
from .materials import AIR_RELUCTIVITY, MagnetAtTemperature, Reluctivity, magnet_at, steel_reluctivity
from .mesh import LAMINATION_REGIONS, ROTOR_REGIONS, Region, SectionMesh
from .options import FieldOptions

#: A step is accepted when it lowers the residual's norm by at least this fraction of the step length.
ARMIJO_FACTOR = 1e-4
LINE_SEARCH_HALVINGS = 12


@dataclass(frozen=True)
class Problem:
    """A meshed cross-section with its materials and sources, ready for Newton's method (SI)."""

    section: SectionMesh
    basis: skfem.CellBasis  #: linear triangles, one quadrature point (B is constant per element)
    areas: np.ndarray  #: per element [m²]
    linear_reluctivity: np.ndarray  #: per element [m/H]; NaN where the material is nonlinear
    nonlinear: tuple[tuple[np.ndarray, Reluctivity], ...]  #: (elements, table) per steel
    remanence: np.ndarray  #: Br·m per element (2, elements) [T]
    current_density: np.ndarray  #: J per element [A/m²]
    slot_currents: np.ndarray  #: per slot of the sector [A]
    magnet: MagnetAtTemperature
    load: np.ndarray  #: f per node: magnets and currents
    boundary: sp.csr_matrix  #: the outer edge's term, nodes × nodes


@dataclass(frozen=True)
class NewtonResult:
    """The converged potential and how Newton got there."""

    potential: np.ndarray  #: A per node [Wb/m]
    flux_density: np.ndarray  #: B per element (2, elements) [T]
    reluctivity: np.ndarray  #: ν per element at the solution [m/H]
    iterations: int  #: Newton steps taken [1]
    residual_history: tuple[float, ...]  #: ‖r‖/‖f‖ before each step and at the end [1]


@skfem.LinearForm
def _sources(v, w):
    return w["j"] * v + w["nu_m"] * (w["bx"] * grad(v)[1] - w["by"] * grad(v)[0])


@skfem.BilinearForm
def _exterior(u, v, w):
    return w["coefficient"] * u * v


def _per_element(values: np.ndarray) -> np.ndarray:
    return np.asarray(values, dtype=float)[:, None]


def build_problem(design, case: FieldCase, section: SectionMesh) -> Problem:
    """Materials and sources of ``case`` on the meshed cross-section of ``design``.

    Parameters
    ----------
    design : Design
        The design (steels, magnet grade, winding, magnetization, shaft).
    case : FieldCase
        Temperature, current and kind.
    section : SectionMesh
        The mesh of the design's cross-section.

    Returns
    -------
    Problem
        Ready for :func:`newton`.
    """
    g = design.geometry
    basis = skfem.CellBasis(section.mesh, skfem.ElementTriP1(), intorder=1)
    areas = np.asarray(basis.dx).sum(axis=1)
    region = section.region
    nu = np.full(region.size, AIR_RELUCTIVITY)
    magnet = magnet_at(design.magnet, case.magnet_temperature_C)
    nu[region == Region.MAGNET] = magnet.reluctivity
    removed = case.kind == ROTOR_REMOVED
    groups = [(np.isin(region, LAMINATION_REGIONS), design.lamination_steel, float(g.stacking_factor)),
              (region == Region.HOUSING, design.housing_steel, 1.0)]
    if design.shaft_magnetic:
        groups.append((region == Region.SHAFT, design.housing_steel, 1.0))
    nonlinear = []
    for mask, steel, stacking in groups:
        if removed:
            mask = mask & ~np.isin(region, ROTOR_REGIONS)
        if mask.any():
            nu[mask] = np.nan
            nonlinear.append((np.nonzero(mask)[0], steel_reluctivity(steel, stacking)))
    remanence = magnet.remanence * magnetization_direction(section, int(g.poles), design.magnetization)
    w = design.winding
    currents = np.zeros(section.sector.slots)
    if case.kind == ARMATURE_CURRENT:
        currents = slot_currents(section, case.current_A, w.kind, w.multiplicity, int(g.poles), int(g.slots),
                                 w.commutator_segments, w.turns_per_coil)
    density = slot_current_density(section, currents, areas)
    load = skfem.asm(_sources, basis, j=_per_element(density), nu_m=magnet.reluctivity,
                     bx=_per_element(remanence[0]), by=_per_element(remanence[1]))
    edge = skfem.FacetBasis(section.mesh, basis.elem, facets=section.outer_facets, intorder=2)
    pole_pairs = int(g.poles) // 2
    boundary = skfem.asm(_exterior, edge, coefficient=AIR_RELUCTIVITY * pole_pairs / section.radii.outer)
    return Problem(section=section, basis=basis, areas=areas, linear_reluctivity=nu, nonlinear=tuple(nonlinear),
                   remanence=remanence, current_density=density, slot_currents=currents, magnet=magnet,
                   load=np.asarray(load), boundary=boundary.tocsr())


def _reluctivity(problem: Problem, flux_density_squared: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    nu = problem.linear_reluctivity.copy()
    slope = np.zeros_like(nu)
    for elements, table in problem.nonlinear:
        nu[elements], slope[elements] = table.at(flux_density_squared[elements])
    return nu, slope


class _Assembly:
    """The Jacobian and residual of the reduced system, assembled element by element with numpy.

    scikit-fem gives the linear triangles' gradients and areas once; each Newton step then only scales
    the 3×3 element matrices and adds them into a sparsity pattern fixed in advance (five times faster
    than assembling the forms anew on these meshes, measured).
    """

    def __init__(self, problem: Problem):
        section = problem.section
        ties = section.node_to_dof.tocoo()
        free = np.ones(ties.shape[1], dtype=bool)
        free[section.fixed_dofs] = False
        number = np.cumsum(free) - 1
        node_dof = np.full(ties.shape[0], -1)
        node_sign = np.zeros(ties.shape[0])
        keep = free[ties.col]
        node_dof[ties.row[keep]] = number[ties.col[keep]]
        node_sign[ties.row[keep]] = ties.data[keep]
        self.unknowns = int(free.sum())
        self.reduce = sp.csr_matrix((node_sign[node_dof >= 0], (np.nonzero(node_dof >= 0)[0], node_dof[node_dof >= 0])),
                                    shape=(ties.shape[0], self.unknowns))
        basis = problem.basis
        # gradients of the three shape functions in each element, (elements, 3, 2)
        self.gradients = np.stack([np.asarray(basis.basis[i][0].grad)[:, :, 0].T for i in range(3)], axis=1)
        self.areas = problem.areas
        self.triangles = section.mesh.t
        rows = node_dof[self.triangles][:, None, :].repeat(3, axis=1)  # (3 j, 3 i, elements)
        cols = node_dof[self.triangles][None, :, :].repeat(3, axis=0)
        signs = node_sign[self.triangles][:, None, :] * node_sign[self.triangles][None, :, :]
        valid = (rows >= 0) & (cols >= 0)
        self.valid = valid
        keys = rows[valid] * self.unknowns + cols[valid]
        unique, self.position = np.unique(keys, return_inverse=True)
        self.signs = signs[valid]
        self.pattern = (unique // self.unknowns, unique % self.unknowns)
        self.boundary = (self.reduce.T @ problem.boundary @ self.reduce).tocsr()
        self.full_boundary = problem.boundary
        self.load = self.reduce.T @ problem.load

    def potential(self, unknowns: np.ndarray) -> np.ndarray:
        return np.asarray(self.reduce @ unknowns)

    def element_gradient(self, potential: np.ndarray) -> np.ndarray:
        """∇A in each element (elements, 2)."""
        return np.asarray(np.einsum("eic,ie->ec", self.gradients, potential[self.triangles]))

    def residual(self, potential: np.ndarray, gradient: np.ndarray, nu: np.ndarray) -> np.ndarray:
        per_element = (self.areas * nu)[:, None] * np.einsum("eic,ec->ei", self.gradients, gradient)
        nodal = np.bincount(self.triangles.T.ravel(), weights=per_element.ravel(), minlength=potential.size)
        return np.asarray(self.reduce.T @ (nodal + self.full_boundary @ potential) - self.load)

    def jacobian(self, gradient: np.ndarray, nu: np.ndarray, slope: np.ndarray) -> sp.csc_matrix:
        projected = np.einsum("eic,ec->ei", self.gradients, gradient)  # ∇φ_i·∇A
        element = ((self.areas * nu)[:, None, None] * np.einsum("eic,ejc->eij", self.gradients, self.gradients)
                   + (2.0 * self.areas * slope)[:, None, None] * projected[:, :, None] * projected[:, None, :])
        values = np.transpose(element, (1, 2, 0))[self.valid] * self.signs
        data = np.bincount(self.position, weights=values, minlength=self.pattern[0].size)
        matrix = sp.csr_matrix((data, self.pattern), shape=(self.unknowns, self.unknowns))
        return (matrix + self.boundary).tocsc()


def newton(problem: Problem, options: FieldOptions, progress: Callable[[float, str], None] | None = None,
           should_stop: Callable[[], bool] | None = None) -> NewtonResult:
    """Solve the nonlinear field of ``problem`` by Newton's method with a line search.

    Parameters
    ----------
    problem : Problem
        Mesh, materials and sources.
    options : FieldOptions
        Tolerance and iteration limit.
    progress : callable, optional
        Called as ``progress(fraction, message)`` after each iteration; the fraction (0 to 1) is how far
        the residual has fallen towards the tolerance on a logarithmic scale.
    should_stop : callable, optional
        Checked before each iteration; when it returns True the solve raises :class:`FieldCancelled`.

    Returns
    -------
    NewtonResult
        The potential at every node and the flux density in every element.

    Raises
    ------
    FieldConvergenceError
        When the residual does not reach the tolerance within ``options.max_iterations`` or a step
        cannot lower it.
    FieldCancelled
        When ``should_stop()`` returns True.
    """
    section = problem.section
    assembly = _Assembly(problem)
    load_norm = float(np.linalg.norm(assembly.load))
    unknowns = np.zeros(assembly.unknowns)
    if load_norm == 0.0:
        zero = np.zeros(section.mesh.p.shape[1])
        return NewtonResult(zero, np.zeros((2, section.elements)), problem.linear_reluctivity, 0, (0.0,))

    def residual(values: np.ndarray):
        potential = assembly.potential(values)
        gradient = assembly.element_gradient(potential)
        nu, slope = _reluctivity(problem, (gradient**2).sum(axis=1))
        return assembly.residual(potential, gradient, nu), gradient, nu, slope

    r, gradient, nu, slope = residual(unknowns)
    history = [float(np.linalg.norm(r)) / load_norm]
    tolerance = options.tolerance
    for iteration in range(options.max_iterations):
        if history[-1] <= tolerance:
            break
        if should_stop is not None and should_stop():
            raise FieldCancelled("the field solution was cancelled; nothing was kept")
        jacobian = assembly.jacobian(gradient, nu, slope)
        step = spla.splu(jacobian, permc_spec="MMD_AT_PLUS_A").solve(-r)
        length, norm = 1.0, history[-1] * load_norm
        for _ in range(LINE_SEARCH_HALVINGS):
            trial = residual(unknowns + length * step)
            if np.linalg.norm(trial[0]) <= (1.0 - ARMIJO_FACTOR * length) * norm:
                break
            length *= 0.5
        else:
            raise FieldConvergenceError(
                f"Newton's method could not lower the residual (iteration {iteration + 1}, relative residual "
                f"{history[-1]:.2e}, tolerance {tolerance:.0e}): the steel's B(H) data may be too steep or "
                "irregular; check the curve, or try a finer mesh (FieldOptions.mesh_fineness)")
        unknowns = unknowns + length * step
        r, gradient, nu, slope = trial
        history.append(float(np.linalg.norm(r)) / load_norm)
        if progress is not None:
            done = min(1.0, math.log(1.0 / max(history[-1], tolerance)) / math.log(1.0 / tolerance))
            progress(done, f"Newton iteration {iteration + 1}: relative residual {history[-1]:.1e}")
    if history[-1] > tolerance:
        raise FieldConvergenceError(
            f"Newton's method did not converge in {options.max_iterations} iterations (relative residual "
            f"{history[-1]:.2e}, tolerance {tolerance:.0e}); try more iterations (FieldOptions.max_iterations), "
            "a looser tolerance, or a finer mesh if the iron is driven far into saturation")
    potential = assembly.potential(unknowns)
    flux_density = np.stack([gradient[:, 1], -gradient[:, 0]])
    return NewtonResult(potential, flux_density, nu, len(history) - 1, tuple(history))
