"""A vectorised bracketed root finder.

Every nonlinear equation in the chain (the magnetic circuit, the no-load and rated speeds) has a known
bracket and a residual that changes sign exactly once inside it, so a bracketed method is the honest
choice: it cannot wander off, and when the bracket does not hold it says so instead of returning noise.

The method is Chandrupatla's (inverse quadratic interpolation guarded by bisection), written on numpy
arrays so that one call solves a whole sweep of designs with no Python loop. SciPy's own elementwise
``find_root`` uses the same method; ours is a few times lighter per call, which matters because a full
evaluation solves a few dozen of these, and it is checked against ``scipy.optimize.brentq`` in the tests.

References
----------
.. [1] T. R. Chandrupatla, "A new hybrid quadratic/bisection algorithm for finding the zero of a
   nonlinear function without using derivatives", Advances in Engineering Software 28 (1997) 145-149.
"""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import dataclass

import numpy as np

_EPS = np.finfo(float).eps


@dataclass(frozen=True)
class RootResult:
    """Roots of a batch of equations, as :func:`find_root` returns them (arrays of the batch's shape)."""

    root: np.ndarray  #: the root of each equation, in the unit of the bracket
    converged: np.ndarray  #: True where the root is bracketed and met the tolerance
    bracketed: np.ndarray  #: False where f(lower) and f(upper) had the same sign
    #: the pass at which every element was done, counting from 1 (one more than the steps taken when
    #: the batch finished early; ``max_iterations`` when it did not)
    iterations: int


def find_root(
    residual: Callable[[np.ndarray], np.ndarray],
    lower: float | np.ndarray,
    upper: float | np.ndarray,
    *,
    xtol: float = 1e-12,
    rtol: float = 1e-12,
    max_iterations: int = 60,
    first_guess: float | np.ndarray | None = None,
) -> RootResult:
    """Solve ``residual(x) == 0`` elementwise for x inside ``[lower, upper]``.

    Each element stops when its bracket is narrower than ``2·rtol·|x| + xtol``; elements already done
    step by zero, so an element's root does not depend on the batch it is solved in.

    Parameters
    ----------
    residual : callable
        ``residual(x)`` for an array x of the broadcast shape of ``lower`` and ``upper``, returning an
        array of that shape, in any unit; its sign must change once inside each bracket.
    lower, upper : float or ndarray
        Ends of each bracket, in the unit of x (broadcast together).
    xtol : float, optional
        Absolute tolerance on x, in the unit of x.
    rtol : float, optional
        Relative tolerance on x [1].
    max_iterations : int, optional
        Iterations at most [1]; elements not done by then have ``converged`` False.
    first_guess : float or ndarray, optional
        An estimate of the root, in the unit of x: inside the bracket it replaces the opening bisection
        step (it saves a few iterations when a cheap estimate is at hand; it cannot break the bracket).

    Returns
    -------
    RootResult
        The roots (NaN where f(lower) and f(upper) had the same sign, with ``bracketed`` False), and
        whether each converged.

    References
    ----------
    .. [1] Chandrupatla 1997 (the method: inverse quadratic interpolation guarded by bisection).
    """
    a = np.array(lower, dtype=float, copy=True)
    b = np.array(upper, dtype=float, copy=True)
    a, b = np.broadcast_arrays(a, b)
    a, b = a.copy(), b.copy()
    fa = np.asarray(residual(a), dtype=float)
    fb = np.asarray(residual(b), dtype=float)
    bracketed = np.isfinite(fa) & np.isfinite(fb) & (np.sign(fa) * np.sign(fb) <= 0)

    c, fc = a.copy(), fa.copy()
    t = np.full(a.shape, 0.5)
    if first_guess is not None:
        with np.errstate(divide="ignore", invalid="ignore"):
            guess_t = (np.asarray(first_guess, dtype=float) - a) / (b - a)
        t = np.where(np.isfinite(guess_t), np.clip(guess_t, 0.02, 0.98), 0.5)
    done = ~bracketed | (fa == 0) | (fb == 0)
    iterations = 0
    with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
        for iteration in range(1, max_iterations + 1):
            iterations = iteration
            if done.all():
                break
            # Elements already done step by t = 0, which re-evaluates their best end and leaves a, b
            # and the root exactly as they are: an element's answer does not depend on its batch.
            t = np.where(done, 0.0, t)
            xt = a + t * (b - a)
            ft = residual(xt)
            same = (ft > 0.0) == (fa > 0.0)
            c = np.where(same, a, b)
            fc = np.where(same, fa, fb)
            b = np.where(same, b, a)
            fb = np.where(same, fb, fa)
            a, fa = xt, ft
            xm = np.where(np.abs(fa) < np.abs(fb), a, b)
            tol = 2.0 * rtol * np.abs(xm) + xtol
            tlim = tol / np.abs(b - a)
            done = done | (tlim > 0.5) | (fa == 0)  # fb was fa once, and checked then
            xi = (a - b) / (c - b)
            phi = (fa - fb) / (fc - fb)
            t = fa / (fb - fa) * fc / (fb - fc) + (c - a) / (b - a) * fa / (fc - fa) * fb / (fc - fb)
            # Where the interpolation is unsafe, bisect. (A NaN or infinite t only arises where phi is
            # infinite, NaN or 1, and then the comparisons are False.)
            t = np.where((phi * phi < xi) & ((1.0 - phi) ** 2 < 1.0 - xi), t, 0.5)
            tlim = np.minimum(tlim, 0.5)
            t = np.clip(t, tlim, 1.0 - tlim)
    root = np.where(np.abs(fa) < np.abs(fb), a, b)
    root = np.where(fa == 0, a, np.where(fb == 0, b, root))

    converged = done & bracketed
    root = np.where(bracketed, root, np.nan)
    return RootResult(root=root, converged=converged, bracketed=bracketed, iterations=iterations)
