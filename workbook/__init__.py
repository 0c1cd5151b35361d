"""Design workbook for flow-controlled hydraulic cylinder axes.

The package is layered (see DEVELOPERS.md): ``units`` and ``fields`` at the boundary,
``fluid``, ``restrictor``, ``cylinder``, ``supply`` and ``valve`` as pure physics on SI
floats, ``circuit`` for the steady-state axis solution, ``checks`` for design rules,
``record`` and ``design`` for the design record and design files, ``ui`` for widgets
and ``cli`` for the command line.

Importing :mod:`workbook` is cheap: nothing heavy (pint, scipy, bokeh) is imported until a
submodule that needs it is used.
"""

__version__ = "0.1.0"

CAUTION = (
    "Caution: hydraulic energy can injure and kill. These results are design estimates "
    "from simplified steady-state models. Confirm every value with the component data "
    "sheets, ISO 4413 (safety of hydraulic fluid power systems), local codes and a "
    "qualified engineer. Never rely on a flow control valve to hold a load."
)

__all__ = ["__version__", "CAUTION"]
