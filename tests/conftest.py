"""Shared pytest hooks of the test suite.

A run without Chromium skips the browser tests (tests/browser); such a run must not read as
a plain green run. Their skips are counted under a category of their own, so pytest's last
line says it (``== 412 passed, 9 browser tests skipped in 95s ==``), and a
banner just above that line says what it means. CI sets ``WORKBOOK_REQUIRE_BROWSER=1``
(.ci/run), which turns a missing browser into a failure instead.
"""

from pathlib import Path

import pytest

BROWSER_DIR = Path(__file__).resolve().parent / "browser"
#: the category of a skipped browser test: pytest prints it, with its count, in the last line
BROWSER_SKIPPED = "browser tests skipped"


def _is_browser(report) -> bool:
    path = str(getattr(report, "fspath", "") or "") or str(getattr(report, "nodeid", "")).split("::")[0]
    try:
        Path(path).resolve().relative_to(BROWSER_DIR)
        return True
    except ValueError:
        return "tests/browser/" in str(getattr(report, "nodeid", "")).replace("\\", "/")


def pytest_report_teststatus(report, config):
    """A skipped browser test is counted as ``BROWSER_SKIPPED``, not as an ordinary skip."""
    if report.skipped and _is_browser(report):
        return BROWSER_SKIPPED, "B", ("SKIPPED (browser)", {"yellow": True, "bold": True})
    return None


def _reason(report) -> str:
    longrepr = getattr(report, "longrepr", None)
    text = longrepr[2] if isinstance(longrepr, tuple) and len(longrepr) == 3 else str(longrepr or "")
    return text.removeprefix("Skipped: ")


@pytest.hookimpl(wrapper=True)
def pytest_terminal_summary(terminalreporter, exitstatus, config):
    """Say loudly, last before the counts, when the browser tests did not run: a green run
    without them proves less (CI requires them)."""
    result = yield
    skipped = terminalreporter.stats.get(BROWSER_SKIPPED, [])
    if skipped:
        reasons = sorted({_reason(r) for r in skipped})
        terminalreporter.write_sep(
            "!", f"BROWSER TESTS SKIPPED ({len(skipped)}): {'; '.join(reasons)}. This run does not prove the "
                 "screens (CI sets WORKBOOK_REQUIRE_BROWSER=1)", red=True, bold=True)
    return result
