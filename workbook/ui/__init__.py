"""Widgets and figures of the studies (no physics here).

``open_study(kind, design, axis)`` is what a study notebook calls: it loads the axis from the
design file, reopens the values recorded in the axis's record when one exists, and returns a
:class:`~workbook.ui.panel.StudyPanel`.
"""

from __future__ import annotations

from .opening import open_study, record_paths

__all__ = ["open_study", "record_paths"]
