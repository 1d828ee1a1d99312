"""Python's cycle collector paused while the app starts.

Each collection of the oldest generation walks every object alive, and at start-up that is
every object of the modules just imported (Textual, Rich, numpy, the engine): on the
benchmark machine (benchmarks/app_startup.py) the collections before the first bend's
results came on screen took about 0.2-0.3 s of CPU, a third of the start-up, and freed
almost nothing. So the app started from the command line pauses the collector (``pause``)
until the first bend's results are painted; then (``resume``) one full collection frees
the cycles start-up left, what survives (the modules, the project screen's widgets, the
project: alive for the whole run) is frozen (``gc.freeze``: later collections leave it
out, so they stay short while the user types) and the collector runs again as usual.
Reference counting frees most objects at once throughout; only cycles wait.
No Textual here: the command line imports this before the app.
"""

from __future__ import annotations

import gc

_paused = False


def pause() -> None:
    """Pause the cycle collector (when it runs) until ``resume``."""
    global _paused
    if gc.isenabled():
        gc.disable()
        _paused = True


def resume() -> None:
    """After ``pause``: collect once, freeze what is left, run the collector again.
    Without a ``pause`` before it, nothing happens (the app in tests, a second call)."""
    global _paused
    if not _paused:
        return
    _paused = False
    gc.collect()
    gc.freeze()
    gc.enable()


def paused() -> bool:
    """True between ``pause`` and ``resume``."""
    return _paused
