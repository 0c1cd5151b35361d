"""``python -m workbook``: the command line (see :mod:`workbook.cli`)."""

from .cli import main

if __name__ == "__main__":
    raise SystemExit(main())
