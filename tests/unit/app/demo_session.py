"""A Session (no Textual) on a copy of the bundled demo project (an invented scenario), for
the tests of the app's logic that need no screen."""

from __future__ import annotations

import shutil
from pathlib import Path

from curvetui.app.session import Session

DEMO = Path(__file__).resolve().parents[3] / "projects" / "quillmere-valley-road.json"


def demo_session(folder: Path) -> Session:
    """Open a copy of the demo in ``folder``."""
    path = folder / "demo.json"
    shutil.copyfile(DEMO, path)
    return Session.open(path)
