"""Fixtures for the browser tests: a loopback JupyterLab and headless Chromium.

Fixtures
--------
lab_server (session)  -> lab.LabServer   running JupyterLab, stopped at the end
chromium_path (session) -> str           skips (or fails, WORKBOOK_REQUIRE_BROWSER=1)
browser (session)     -> playwright Browser
browser_log (test)    -> lab.BrowserLog  requests, failures, console, page errors
page (test)           -> playwright Page  fresh context, offline guard, logged

Every test in this folder is marked ``browser`` and gets a 300 s timeout
unless it sets its own ``@pytest.mark.timeout``.
"""

from __future__ import annotations

import sys
import time
from pathlib import Path

import pytest

BROWSER_DIR = Path(__file__).resolve().parent
# The project runs pytest with --import-mode=importlib, which does not put
# test folders on sys.path; make ``import lab`` work for every test here.
if str(BROWSER_DIR) not in sys.path:
    sys.path.insert(0, str(BROWSER_DIR))

import lab  # noqa: E402

TEST_TIMEOUT_S = 300


def pytest_configure(config):
    config.addinivalue_line(
        "markers", "browser: drives a real JupyterLab in headless Chromium (tests/browser)"
    )
    config.addinivalue_line(
        "markers",
        "allow_offsite: the test itself checks off-loopback requests (they are still "
        "blocked); the page fixture then skips its own offline assertion",
    )


def pytest_collection_modifyitems(config, items):
    # Without Chromium, skip up front so no JupyterLab is started for nothing;
    # with WORKBOOK_REQUIRE_BROWSER=1 the chromium_path fixture fails instead.
    skip = None
    if lab.find_chromium() is None and not lab.browser_required():
        skip = pytest.mark.skip(reason=lab.CHROMIUM_MISSING)
    for item in items:
        try:
            Path(str(item.fspath)).resolve().relative_to(BROWSER_DIR)
        except ValueError:
            continue
        item.add_marker(pytest.mark.browser)
        if skip is not None:
            item.add_marker(skip)
        if item.get_closest_marker("timeout") is None:
            item.add_marker(pytest.mark.timeout(TEST_TIMEOUT_S))


@pytest.hookimpl(wrapper=True, tryfirst=True)
def pytest_runtest_makereport(item, call):
    report = yield
    setattr(item, f"_wb_report_{report.when}", report)
    return report


@pytest.fixture(scope="session")
def chromium_path() -> str:
    path = lab.find_chromium()
    if path is None:
        if lab.browser_required():
            pytest.fail(lab.CHROMIUM_MISSING + " (WORKBOOK_REQUIRE_BROWSER=1)", pytrace=False)
        pytest.skip(lab.CHROMIUM_MISSING)
    return path


@pytest.fixture(scope="session")
def _playwright(chromium_path):
    try:
        from playwright.sync_api import sync_playwright
    except ImportError as exc:  # pragma: no cover - depends on the environment
        message = f"playwright is not installed ({exc}); pip install -e '.[test]'"
        if lab.browser_required():
            pytest.fail(message, pytrace=False)
        pytest.skip(message)
    manager = sync_playwright().start()
    try:
        yield manager
    finally:
        manager.stop()


@pytest.fixture(scope="session")
def browser(_playwright, chromium_path):
    instance = _playwright.chromium.launch(
        executable_path=chromium_path,
        headless=True,
        args=lab.CHROMIUM_ARGS,
    )
    try:
        yield instance
    finally:
        instance.close()


@pytest.fixture(scope="session")
def lab_server(tmp_path_factory):
    started = time.monotonic()
    server = lab.start_lab_server(tmp_path_factory.mktemp("lab"))
    server.start_seconds = time.monotonic() - started
    try:
        yield server
    finally:
        lab.stop_lab_server(server)


@pytest.fixture
def browser_log():
    return lab.BrowserLog()


@pytest.fixture
def page(browser, browser_log, request):
    """A fresh browser context and page; requests off loopback are blocked.

    At teardown the test fails if the page tried to reach any host other
    than loopback, and a screenshot ``FAILED-<test>.png`` is saved when the
    test itself failed.
    """
    context = browser.new_context(
        viewport={"width": 1400, "height": 1000},
        service_workers="block",
        locale="en-US",
        timezone_id="UTC",
    )
    try:
        context.set_default_timeout(lab.DEFAULT_TIMEOUT_MS)
        lab.guard_offline(context, browser_log)
        pg = context.new_page()
        browser_log.attach(context, pg)
        try:
            yield pg
            report = getattr(request.node, "_wb_report_call", None)
            if report is not None and report.failed:
                try:
                    lab.screenshot(pg, f"FAILED-{request.node.name}")
                except Exception:
                    pass
        finally:
            pg.close()
    finally:
        context.close()
        if "lab_server" in request.fixturenames:
            # Kernels of this test must not leak into the next one.
            request.getfixturevalue("lab_server").shutdown_kernels()
    if request.node.get_closest_marker("allow_offsite") is None:
        browser_log.assert_offline()

