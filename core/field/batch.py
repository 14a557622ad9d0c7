"""Many field solutions at once, on dask.distributed: a local cluster of processes, or any cluster.

Each item (a design and a case) is one task; the solve holds the GIL for most of its time, so the
default is a local cluster of worker processes, one thread each. A task that fails (a design that cannot
be meshed, a solve that does not converge, a worker lost) comes back as data, its error in words, and
the rest go on. Results come back in the order of the items; ``progress`` is called as each finishes.
"""

from __future__ import annotations

import time
import uuid
from collections.abc import Callable, Iterable
from dataclasses import dataclass

from .cases import FieldCase
from .options import FieldOptions
from .postprocess import FieldSolution


@dataclass(frozen=True)
class BatchItem:
    """One field solution to make."""

    label: str  #: how the caller names it (a file name, a candidate number)
    design: object  #: the Design, SI
    case: FieldCase


@dataclass(frozen=True)
class BatchOutcome:
    """What came back for one item: a solution, or the error that stopped it."""

    label: str
    case_name: str
    solution: FieldSolution | None  #: None when the item failed
    error: str | None  #: the error's message, when it failed
    error_type: str | None  #: the error's class name, e.g. "FieldInputError"
    seconds: float  #: wall time of the task on its worker [s]

    @property
    def ok(self) -> bool:
        """The item was solved."""
        return self.solution is not None


def solve_item(item: BatchItem, options: FieldOptions | None = None) -> BatchOutcome:
    """Solve one item, turning any error into data (this is what each worker runs).

    Parameters
    ----------
    item : BatchItem
        The design and case.
    options : FieldOptions, optional
        Mesh and Newton settings.

    Returns
    -------
    BatchOutcome
        The solution, or the error's type and message.
    """
    from .case_solution import solve_case

    started = time.perf_counter()
    try:
        solution = solve_case(item.design, item.case, options)
    # One failed design must not stop the others: whatever went wrong is reported with the item.
    except Exception as error:  # noqa: BLE001
        return BatchOutcome(item.label, item.case.name, None, str(error), type(error).__name__,
                            time.perf_counter() - started)
    return BatchOutcome(item.label, item.case.name, solution, None, None, time.perf_counter() - started)


def solve_many(items: Iterable[BatchItem], scheduler: str | None = None, workers: int = 2,
               progress: Callable[[int, int, BatchOutcome], None] | None = None,
               options: FieldOptions | None = None) -> list[BatchOutcome]:
    """Solve every item in parallel on dask.distributed.

    Parameters
    ----------
    items : iterable of BatchItem
        Designs and cases.
    scheduler : str, optional
        Address of a running dask scheduler (e.g. ``"tcp://10.0.0.5:8786"``); None starts a local
        cluster of ``workers`` processes for this call and stops it afterwards.
    workers : int
        Worker processes of the local cluster [1].
    progress : callable, optional
        ``progress(finished, total, outcome)`` as each item finishes, in the order they finish.
    options : FieldOptions, optional
        Mesh and Newton settings for every item.

    Returns
    -------
    list of BatchOutcome
        One per item, in the items' order.

    References
    ----------
    .. [1] Dask Development Team, "Dask: Library for dynamic task scheduling", 2016,
       https://dask.org (dask.distributed: Client, LocalCluster, as_completed).
    """
    from dask.distributed import Client, LocalCluster, as_completed

    items = list(items)
    if not items:
        return []
    cluster = None
    if scheduler is None:
        cluster = LocalCluster(n_workers=workers, threads_per_worker=1, processes=True, dashboard_address=None)
        client = Client(cluster)
    else:
        client = Client(scheduler)
    batch = uuid.uuid4().hex[:8]
    outcomes: list[BatchOutcome | None] = [None] * len(items)
    try:
        futures = [client.submit(solve_item, item, options, key=f"field-{batch}-{i}", pure=False)
                   for i, item in enumerate(items)]
        position = {future.key: i for i, future in enumerate(futures)}
        for finished, future in enumerate(as_completed(futures), start=1):
            i = position[future.key]
            try:
                outcome = future.result()
            # A lost worker or a failed transfer is this item's failure only.
            except Exception as error:  # noqa: BLE001
                outcome = BatchOutcome(items[i].label, items[i].case.name, None, str(error), type(error).__name__, 0.0)
            outcomes[i] = outcome
            if progress is not None:
                progress(finished, len(items), outcome)
    finally:
        client.close()
        if cluster is not None:
            cluster.close()
    return [outcome for outcome in outcomes if outcome is not None]
