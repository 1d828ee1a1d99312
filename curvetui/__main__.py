"""Entry point for ``python -m curvetui``."""

from curvetui.cli import main

raise SystemExit(main())
