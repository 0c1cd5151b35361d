"""``python -m workbook``: the command line (see :mod:`workbook.cli`)."""

from .cli import main

raise SystemExit(main())
