"""Where an operating point's losses enter the thermal network, for a batch of designs at once.

The winding node takes the copper, brush and iron losses, the housing node friction and drag
(:func:`point_losses`); :func:`take` picks some designs of a batch's network. The duty's hot state
(:mod:`core.thermal_duty`) and the ratings (:mod:`core.ratings`) iterate losses ⇄ temperatures on these.

References
----------
.. [1] the losses of :func:`core.performance.operating_points` (summation of losses, IEC 60034-2-1).
.. [2] the network of :mod:`core.thermal_network`.
"""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import dataclass, fields

import numpy as np

from . import thermal_network as tn
from .performance import MotorModel, operating_points, stall_torque
from .shared_docs import parameter_table

#: ``motor_at(rows, winding_C, magnet_C)``: the motor models of the designs ``rows`` (indices into the
#: batch) with their windings and magnets at those temperatures (arrays of the shape of ``rows``).
MotorAt = Callable[[np.ndarray, np.ndarray, np.ndarray], MotorModel]

#: The fixed points stop when winding and magnets together move less than this [K] (our choice).
TOLERANCE = 1e-4

#: The arguments the batch's thermal functions share (here, core.thermal_duty, core.ratings), described
#: once (:mod:`core.shared_docs`).
BATCH_PARAMETERS = parameter_table("""
network : ThermalNetwork
    The motors' network.
rows : ndarray
    The designs' indices for ``motor_at``.
ambient_C : ndarray
    Ambient [°C].
motor_at : callable
    ``motor_at(rows, winding_C, magnet_C) -> MotorModel``.
torque : ndarray
    Shaft torque [N·m].
limit_C : ndarray
    The insulation class temperature [°C].
model_high_C : ndarray
    Where the magnet grade's temperature model ends [°C].
losses : Losses
    While loaded [W].
duty : str or ndarray
    "S1", "S2" or "S3" (IEC 60034-1), or their codes per design (``DUTY_CODES``).
run_time : float or ndarray
    Length of the S2 run [s].
cycle_factor : float or ndarray
    S3 cycle duration factor, loaded time over cycle time [1].
cycle_time : float or ndarray
    S3 cycle duration [s].
""")

# Every function below works on a batch of designs at once: arrays of one shape (n,), ``rows`` the
# designs' indices into the batch that ``motor_at`` knows, ``network`` a ThermalNetwork of arrays of
# that shape. An element's result never depends on the rest of its batch: the fixed points run each
# element to its own end, and the root finder steps a finished element by zero (core.solvers).


def take(network: tn.ThermalNetwork, index) -> tn.ThermalNetwork:
    """The network of some of a batch's designs.

    Parameters
    ----------
    network : ThermalNetwork
        A batch, every field an array of shape (n,).
    index : ndarray
        Integer indices or a boolean mask into the batch.

    Returns
    -------
    ThermalNetwork
        Its fields at ``index``.
    """
    return tn.ThermalNetwork(**{f.name: np.asarray(getattr(network, f.name))[index] for f in fields(network)})


@dataclass(frozen=True)
class Losses:
    """Where the losses of one operating point go in the network (arrays over a batch)."""

    winding: np.ndarray  #: copper, brush and iron losses, into the winding node [W]
    housing: np.ndarray  #: friction and drag, into the housing node [W]
    current: np.ndarray  #: armature current [A]
    reached: np.ndarray  #: the torque is below the stall torque at these temperatures (bool)

    def at(self, index) -> Losses:
        """The losses of some of the batch.

        Parameters
        ----------
        index : ndarray
            Integer indices or a boolean mask.

        Returns
        -------
        Losses
            Each field at ``index``.
        """
        return Losses(self.winding[index], self.housing[index], self.current[index], self.reached[index])


def point_losses(model: MotorModel, torque) -> Losses:
    """The losses at a shaft torque, split between the network's nodes (at stall beyond it).

    Parameters
    ----------
    model : MotorModel
        The motors at their temperatures (array fields, or floats for one).
    torque : float or ndarray
        Shaft torque [N·m].

    Returns
    -------
    Losses
        Winding-node and housing-node losses [W], the current [A], and whether the torque is reached.

    References
    ----------
    .. [1] the losses of :func:`core.performance.operating_points` (summation of losses, IEC 60034-2-1).
    """
    torque = np.asarray(torque, dtype=float)
    stall = stall_torque(model)
    p = operating_points(model, np.minimum(torque, stall))
    winding = np.asarray(p.copper_loss + p.brush_loss + p.iron_loss, dtype=float)
    return Losses(winding=winding, housing=np.maximum(np.asarray(p.total_loss) - winding, 0.0),
                  current=np.asarray(p.current, dtype=float), reached=np.asarray(torque < stall))


__all__ = ["TOLERANCE", "Losses", "MotorAt", "point_losses", "take"]
