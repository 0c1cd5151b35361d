"""Shared pytest hooks of the test suite."""

import pytest


@pytest.hookimpl(wrapper=True)
def pytest_terminal_summary(terminalreporter, exitstatus, config):
    """Say loudly, last before the counts, when the browser tests did not run: a green run
    without them proves less (CI requires them)."""
    result = yield
    skipped = [r for r in terminalreporter.stats.get("skipped", [])
               if "tests/browser" in str(getattr(r, "nodeid", "")).replace("\\", "/")
               or "tests/browser" in str(getattr(r, "longrepr", ""))]
    if skipped:
        terminalreporter.write_sep(
            "!", f"BROWSER TESTS SKIPPED ({len(skipped)}): Chromium not found (apt-get install chromium); "
                 "this run does not prove the screens (CI sets WORKBOOK_REQUIRE_BROWSER=1)", red=True, bold=True)
    return result
