"""Python's cyclic garbage collection, kept on the GUI thread.

The evaluation and field-solution workers run long Python computations on other threads. Left alone,
the collector runs in whichever thread allocates: a worker can then collect a reference cycle that holds
a Qt widget and run its C++ destructor off the GUI thread, which deadlocks against the GUI thread's own
object deletion (seen in the test suite: a QMenu destroyed inside ``gc_collect_main`` on an evaluation
thread while the GUI thread waited on the same Qt mutex). So automatic collection is switched off while
the desktop tool runs, and a timer on the GUI thread collects instead, a few times a second.
"""

from __future__ import annotations

import gc

from PySide6.QtCore import QCoreApplication, QObject, QTimer

COLLECT_EVERY_MS = 500  #: often enough that cycles never pile up; a collection takes well under a millisecond


class _Collector(QObject):
    def __init__(self, parent: QObject):
        super().__init__(parent)
        self.timer = QTimer(self)
        self.timer.setInterval(COLLECT_EVERY_MS)
        self.timer.timeout.connect(self.collect)
        self.timer.start()

    @staticmethod
    def collect() -> None:
        gc.collect()


def collect_on_gui_thread() -> None:
    """Switch automatic collection off and collect from a GUI-thread timer instead (once per application).

    Call from the GUI thread once a Q(Core)Application exists.
    """
    app = QCoreApplication.instance()
    if app is None or app.findChild(_Collector, "pmdc_sizer_collector") is not None:
        return
    collector = _Collector(app)
    collector.setObjectName("pmdc_sizer_collector")
    gc.disable()
    app.aboutToQuit.connect(gc.enable)
