"""Harness for driving a real JupyterLab in headless Chromium.

This module holds everything the browser tests share that is not a pytest
fixture: starting and stopping a loopback JupyterLab, recording what the
browser did, and small page helpers (open a notebook, run it, wait for the
kernel, type into a widget, take a screenshot).  Fixtures live in
``conftest.py`` and wrap these.

Study tests import from here, e.g.::

    from lab import open_notebook, run_all_cells, type_into_field, screenshot
"""

from __future__ import annotations

import json
import os
import re
import secrets
import shutil
import signal
import socket
import subprocess
import sys
import tempfile
import time
import urllib.error
import urllib.parse
import urllib.request
from dataclasses import dataclass, field
from pathlib import Path

HERE = Path(__file__).resolve().parent
REPO_ROOT = HERE.parent.parent
SCREENSHOT_DIR = REPO_ROOT / "screenshots"

LOOPBACK_HOSTS = frozenset({"127.0.0.1", "localhost", "::1", "[::1]"})
LOCAL_SCHEMES = frozenset({"data", "blob", "about", "chrome-error"})

CHROMIUM_CANDIDATES = ("/usr/bin/chromium", "chromium", "chromium-browser")
CHROMIUM_MISSING = (
    "Chromium not found: install it with `apt-get install chromium` (Debian) "
    "to run the browser tests"
)
CHROMIUM_ARGS = [
    "--no-sandbox",
    "--disable-gpu",
    "--disable-background-networking",
    "--disable-component-update",
    "--disable-sync",
    "--no-first-run",
    "--disable-quic",
    "--disable-default-apps",
    "--disable-extensions",
    "--disable-features=OptimizationHints,MediaRouter,Translate",
    "--metrics-recording-only",
    "--no-default-browser-check",
    # Belt and braces: no host name other than localhost resolves at all.
    "--host-resolver-rules=MAP * ~NOTFOUND , EXCLUDE localhost , EXCLUDE 127.0.0.1",
]

# JupyterLab plugins that would talk to the internet (or offer to).
DISABLED_LAB_PLUGINS = {
    "@jupyterlab/apputils-extension:announcements": True,
    "@jupyterlab/extensionmanager-extension": True,
}

SERVER_START_TIMEOUT = 90.0
DEFAULT_TIMEOUT_MS = 60_000


def find_chromium() -> str | None:
    """Path of a Chromium executable, or None.  WORKBOOK_CHROMIUM overrides."""
    override = os.environ.get("WORKBOOK_CHROMIUM")
    candidates = (override,) if override else CHROMIUM_CANDIDATES
    for name in candidates:
        if not name:
            continue
        if os.path.isabs(name):
            if os.path.isfile(name) and os.access(name, os.X_OK):
                return name
        else:
            found = shutil.which(name)
            if found:
                return found
    return None


def browser_required() -> bool:
    return os.environ.get("WORKBOOK_REQUIRE_BROWSER", "") == "1"


# --------------------------------------------------------------------------
# JupyterLab server
# --------------------------------------------------------------------------


def free_port() -> int:
    with socket.socket(socket.AF_INET, socket.SOCK_STREAM) as sock:
        sock.bind(("127.0.0.1", 0))
        return sock.getsockname()[1]


@dataclass
class LabServer:
    """A running JupyterLab.  ``url`` ends with a slash."""

    process: subprocess.Popen
    url: str
    token: str
    root_dir: Path
    base_dir: Path
    log_path: Path
    port: int

    def lab_url(self, path: str = "", reset: bool = True) -> str:
        """URL of the lab UI; ``reset`` starts from an empty workspace so a
        test never sees tabs left open by an earlier test."""
        query = ("reset&" if reset else "") + f"token={self.token}"
        return f"{self.url}lab/{path}?{query}"

    def notebook_url(self, name: str, reset: bool = True) -> str:
        return self.lab_url("tree/" + urllib.parse.quote(name), reset=reset)

    def api(self, path: str, method: str = "GET", timeout: float = 5.0):
        req = urllib.request.Request(
            self.url + path.lstrip("/"),
            method=method,
            headers={"Authorization": f"token {self.token}"},
        )
        with urllib.request.urlopen(req, timeout=timeout) as resp:
            body = resp.read()
        return json.loads(body) if body else None

    def copy_notebook(self, source: str | os.PathLike, name: str | None = None) -> str:
        """Copy a notebook (e.g. from notebooks/) into the server's root dir.

        Returns the name to pass to ``open_notebook``.  The repository copy is
        never touched by the browser.
        """
        source = Path(source)
        name = name or source.name
        target = self.root_dir / name
        target.parent.mkdir(parents=True, exist_ok=True)
        shutil.copy2(source, target)
        return name

    def write_notebook(self, nb, name: str) -> str:
        """Write an nbformat notebook object into the root dir."""
        import nbformat

        target = self.root_dir / name
        target.parent.mkdir(parents=True, exist_ok=True)
        nbformat.write(nb, str(target))
        return name

    def log_tail(self, chars: int = 6000) -> str:
        try:
            return self.log_path.read_text(errors="replace")[-chars:]
        except OSError:
            return "<no server log>"

    def shutdown_kernels(self) -> None:
        try:
            for kernel in self.api("api/kernels") or []:
                try:
                    self.api(f"api/kernels/{kernel['id']}", method="DELETE", timeout=10)
                except Exception:
                    pass
        except Exception:
            pass


def _write_isolated_config(base: Path) -> dict[str, Path]:
    """Config, settings, runtime dirs for one server, all under ``base``."""
    dirs = {
        name: base / name
        for name in ("config", "runtime", "data", "ipython", "settings", "workspaces", "root")
    }
    for path in dirs.values():
        path.mkdir(parents=True, exist_ok=True)

    # Server-side: never fetch the news feed, never ask PyPI for a newer
    # JupyterLab, never list extensions from PyPI.
    server_config = {
        "LabApp": {
            "news_url": None,
            "check_for_updates_class": "jupyterlab.NeverCheckForUpdate",
            "extension_manager": "readonly",
            "expose_app_in_browser": True,
        }
    }
    (dirs["config"] / "jupyter_server_config.json").write_text(json.dumps(server_config, indent=1))

    # Front end: switch off the plugins that would fetch or offer to.
    labconfig = dirs["config"] / "labconfig"
    labconfig.mkdir(exist_ok=True)
    (labconfig / "page_config.json").write_text(
        json.dumps({"disabledExtensions": DISABLED_LAB_PLUGINS}, indent=1)
    )

    # User settings: no news, no update check, no toast asking about them.
    notification = dirs["settings"] / "@jupyterlab" / "apputils-extension"
    notification.mkdir(parents=True, exist_ok=True)
    (notification / "notification.jupyterlab-settings").write_text(
        json.dumps({"fetchNews": "false", "checkForUpdates": False}, indent=1)
    )
    return dirs


def start_lab_server(base_dir: str | os.PathLike | None = None) -> LabServer:
    """Start JupyterLab on 127.0.0.1 with everything isolated under a temp dir.

    The caller must call ``stop_lab_server`` (use try/finally).
    """
    base = Path(base_dir) if base_dir else Path(tempfile.mkdtemp(prefix="wb-lab-"))
    dirs = _write_isolated_config(base)
    port = free_port()
    token = secrets.token_hex(24)

    env = dict(os.environ)
    # records go where a user's would (beside the notebook), not into a folder another part
    # of the test run (nbval's notebooks/conftest.py) chose for its own kernels
    env.pop("WORKBOOK_RECORDS_DIR", None)
    env.update(
        JUPYTER_CONFIG_DIR=str(dirs["config"]),
        JUPYTER_RUNTIME_DIR=str(dirs["runtime"]),
        # User-level data dir isolated; sys.prefix/share/jupyter (where the
        # ipywidgets and jupyter_bokeh labextensions and the python3 kernel
        # spec live) stays on the search path regardless.
        JUPYTER_DATA_DIR=str(dirs["data"]),
        IPYTHONDIR=str(dirs["ipython"]),
        PYTHONPATH=os.pathsep.join(
            p for p in (str(REPO_ROOT), env.get("PYTHONPATH", "")) if p
        ),
        PYDEVD_DISABLE_FILE_VALIDATION="1",
    )
    env.pop("JUPYTER_PATH", None)
    env.pop("JUPYTERLAB_DIR", None)

    cmd = [
        sys.executable,
        "-m",
        "jupyterlab",
        "--no-browser",
        "--ServerApp.ip=127.0.0.1",
        f"--ServerApp.port={port}",
        "--ServerApp.port_retries=0",
        f"--IdentityProvider.token={token}",
        f"--ServerApp.root_dir={dirs['root']}",
        "--ServerApp.terminals_enabled=False",
        f"--LabApp.user_settings_dir={dirs['settings']}",
        f"--LabApp.workspaces_dir={dirs['workspaces']}",
        "--LabApp.check_for_updates_class=jupyterlab.NeverCheckForUpdate",
        "--LabApp.extension_manager=readonly",
        "--LabApp.expose_app_in_browser=True",
    ]
    if hasattr(os, "geteuid") and os.geteuid() == 0:
        cmd.append("--ServerApp.allow_root=True")

    log_path = base / "server.log"
    log = open(log_path, "wb")
    try:
        proc = subprocess.Popen(
            cmd,
            cwd=str(dirs["root"]),
            env=env,
            stdin=subprocess.DEVNULL,
            stdout=log,
            stderr=subprocess.STDOUT,
            start_new_session=True,
        )
    finally:
        log.close()

    server = LabServer(
        process=proc,
        url=f"http://127.0.0.1:{port}/",
        token=token,
        root_dir=dirs["root"],
        base_dir=base,
        log_path=log_path,
        port=port,
    )
    try:
        _wait_until_up(server, SERVER_START_TIMEOUT)
    except BaseException:
        stop_lab_server(server)
        raise
    return server


def _wait_until_up(server: LabServer, timeout: float) -> None:
    deadline = time.monotonic() + timeout
    last_error: Exception | None = None
    while time.monotonic() < deadline:
        if server.process.poll() is not None:
            raise RuntimeError(
                f"JupyterLab exited with code {server.process.returncode} during start-up.\n"
                f"--- server log ---\n{server.log_tail()}"
            )
        try:
            status = server.api("api/status", timeout=2)
            if isinstance(status, dict) and "started" in status:
                return
        except (urllib.error.URLError, ConnectionError, OSError, ValueError) as exc:
            last_error = exc
        time.sleep(0.25)
    raise TimeoutError(
        f"JupyterLab did not answer /api/status within {timeout:.0f} s "
        f"(last error: {last_error!r}).\n--- server log ---\n{server.log_tail()}"
    )


def _signal_group(proc: subprocess.Popen, sig: int) -> None:
    try:
        os.killpg(proc.pid, sig)  # the server leads its own session/group
    except (ProcessLookupError, PermissionError):
        try:
            proc.send_signal(sig)
        except ProcessLookupError:
            pass


def stop_lab_server(server: LabServer, grace: float = 10.0) -> None:
    """Stop the server and its process group: kernels down, TERM, then KILL."""
    proc = server.process
    try:
        if proc.poll() is None:
            server.shutdown_kernels()
            _signal_group(proc, signal.SIGTERM)
            try:
                proc.wait(timeout=grace)
            except subprocess.TimeoutExpired:
                pass
    finally:
        # Whatever is left in the group (the server, stray children) dies now.
        _signal_group(proc, signal.SIGKILL)
        try:
            proc.wait(timeout=5)
        except subprocess.TimeoutExpired:
            pass


# --------------------------------------------------------------------------
# What the browser did
# --------------------------------------------------------------------------


def is_loopback_url(url: str) -> bool:
    parsed = urllib.parse.urlsplit(url)
    if parsed.scheme in LOCAL_SCHEMES:
        return True
    if parsed.scheme in ("http", "https", "ws", "wss"):
        return (parsed.hostname or "") in LOOPBACK_HOSTS
    return False


def assert_offline(requests) -> None:
    """Fail if any recorded URL left loopback (data:, blob: are fine)."""
    urls = [getattr(r, "url", r) for r in requests]
    off = [u for u in urls if not is_loopback_url(u)]
    assert not off, "browser requested hosts other than loopback:\n  " + "\n  ".join(
        sorted(set(off))
    )


@dataclass
class BrowserLog:
    """Everything one page did: requests, failures, console, page errors."""

    requests: list[str] = field(default_factory=list)
    blocked: list[str] = field(default_factory=list)
    failed_requests: list[str] = field(default_factory=list)
    http_errors: list[str] = field(default_factory=list)
    console: list[tuple[str, str]] = field(default_factory=list)
    page_errors: list[str] = field(default_factory=list)

    def attach(self, context, page) -> None:
        context.on("request", lambda r: self.requests.append(r.url))
        context.on(
            "requestfailed",
            lambda r: self.failed_requests.append(f"{r.method} {r.url}: {r.failure}"),
        )
        context.on("response", self._on_response)
        page.on("websocket", lambda ws: self.requests.append(ws.url))
        page.on("console", lambda m: self.console.append((m.type, m.text)))
        page.on("pageerror", lambda e: self.page_errors.append(str(e)))

    def _on_response(self, response) -> None:
        if response.status >= 400:
            self.http_errors.append(f"{response.status} {response.request.method} {response.url}")

    def console_errors(self) -> list[str]:
        return [text for kind, text in self.console if kind == "error"]

    def console_warnings(self) -> list[str]:
        return [text for kind, text in self.console if kind == "warning"]

    def assert_offline(self) -> None:
        assert_offline(self.requests + self.blocked)

    def assert_no_console_errors(self) -> None:
        errors = self.console_errors()
        assert not errors, "console errors:\n  " + "\n  ".join(errors)

    def assert_no_page_errors(self) -> None:
        assert not self.page_errors, "uncaught page errors:\n  " + "\n  ".join(self.page_errors)

    def assert_no_failed_requests(self) -> None:
        bad = self.failed_requests + self.http_errors
        assert not bad, "failed requests:\n  " + "\n  ".join(bad)

    def assert_clean(self) -> None:
        """Offline, no console error, no page error, no failed request."""
        self.assert_offline()
        self.assert_no_page_errors()
        self.assert_no_console_errors()
        self.assert_no_failed_requests()


def guard_offline(context, log: BrowserLog) -> None:
    """Abort every request that would leave loopback, and remember it."""

    def handler(route):
        url = route.request.url
        if is_loopback_url(url):
            route.continue_()
        else:
            log.blocked.append(url)
            route.abort("blockedbyclient")

    context.route("**/*", handler)


# --------------------------------------------------------------------------
# Page helpers
# --------------------------------------------------------------------------

_JS_PANEL = """
() => {
  const app = window.jupyterapp;
  if (!app) return null;
  const w = app.shell.currentWidget;
  return (w && w.sessionContext && w.content && w.content.model) ? w : null;
}
"""

_JS_STATE = (
    "() => { const w = ("
    + _JS_PANEL
    + """)();
  if (!w) return {ready: false};
  const s = w.sessionContext;
  const k = s.session && s.session.kernel;
  const busyPrompts = Array.from(
    w.node.querySelectorAll('.jp-InputPrompt')).filter(p => p.textContent.includes('[*]')).length;
  return {
    ready: !!(s.isReady && k),
    kernel: k ? k.status : null,
    connection: k ? k.connectionStatus : null,
    busyPrompts,
    pending: s.pendingInput || false,
  };
}"""
)

# Counts how often the current notebook's kernel has gone busy; the
# listener is attached once per notebook panel.
_JS_BUSY_COUNTER = (
    "() => { const w = ("
    + _JS_PANEL
    + """)();
  if (!w) return -1;
  if (!w.__wbBusy) {
    w.__wbBusy = {count: 0};
    w.sessionContext.statusChanged.connect((_, status) => {
      if (status === 'busy') w.__wbBusy.count++;
    });
  }
  return w.__wbBusy.count;
}"""
)

_JS_OUTPUT_ERRORS = (
    "() => { const w = ("
    + _JS_PANEL
    + """)();
  if (!w) return [];
  const found = [];
  const cells = w.content.model.cells;
  for (let i = 0; i < cells.length; i++) {
    const cell = cells.get(i);
    if (cell.type !== 'code') continue;
    const outs = cell.outputs.toJSON();
    for (const o of outs) {
      if (o.output_type === 'error') {
        found.push({cell: i, ename: o.ename, evalue: o.evalue});
      }
    }
  }
  return found;
}"""
)


def _app_ready(page, timeout_ms: int) -> None:
    page.wait_for_function(
        "() => window.jupyterapp && window.jupyterapp.started !== undefined", timeout=timeout_ms
    )
    page.evaluate("() => window.jupyterapp.restored")


def open_notebook(page, server: LabServer, name: str, timeout_ms: int = DEFAULT_TIMEOUT_MS) -> None:
    """Open ``name`` (relative to the server root) and wait for an idle kernel."""
    page.goto(server.notebook_url(name), wait_until="domcontentloaded", timeout=timeout_ms)
    _app_ready(page, timeout_ms)
    page.locator(".jp-NotebookPanel .jp-Notebook").first.wait_for(
        state="visible", timeout=timeout_ms
    )
    page.wait_for_function(
        "(name) => { const w = window.jupyterapp.shell.currentWidget;"
        " return !!(w && w.context && w.context.path === name); }",
        arg=name,
        timeout=timeout_ms,
    )
    wait_for_idle(page, timeout_ms=timeout_ms)


def wait_for_idle(page, timeout_ms: int = DEFAULT_TIMEOUT_MS, settle_ms: int = 300) -> None:
    """Wait until the kernel is connected and idle and no cell shows ``[*]``.

    The condition must hold twice, ``settle_ms`` apart, so that a queue of
    cells between two executions is not mistaken for the end of the run.
    """
    deadline = time.monotonic() + timeout_ms / 1000
    stable_since = None
    last = None
    while time.monotonic() < deadline:
        last = page.evaluate(_JS_STATE)
        idle = (
            last.get("ready")
            and last.get("kernel") == "idle"
            and last.get("connection") == "connected"
            and last.get("busyPrompts") == 0
        )
        if idle:
            if stable_since is None:
                stable_since = time.monotonic()
            elif (time.monotonic() - stable_since) * 1000 >= settle_ms:
                return
        else:
            stable_since = None
        page.wait_for_timeout(100)
    raise TimeoutError(f"notebook did not become idle within {timeout_ms} ms; last state {last}")


WIDGET_RACE_TEXT = "Error displaying widget"


def run_all_cells(page, via: str = "command", timeout_ms: int = 180_000) -> None:
    """Run every cell of the current notebook and wait until all have run.

    ``via="command"`` executes the ``notebook:run-all-cells`` command;
    ``via="menu"`` clicks Run > Run All Cells like a user would.
    Raises AssertionError if a cell produced an error output, and if any widget output shows
    the widget front end's "Error displaying widget": that is what a user meets on first
    open, so it fails the test (no re-run hides it). The study notebooks load BokehJS in a
    cell of its own before any widget exists, which keeps the large inline script out of
    the panel cell's burst of widget messages.
    """
    _run_all_once(page, via, timeout_ms)
    # the message is rendered a moment after the kernel goes idle (the widget manager waits
    # two seconds for a model before it gives up): look for a while
    page.wait_for_timeout(2500)
    shown = page.get_by_text(WIDGET_RACE_TEXT)
    assert shown.count() == 0, (f"a widget did not display on first open: {shown.first.inner_text()!r} "
                                f"({shown.count()} output(s))")


def _run_all_once(page, via: str, timeout_ms: int) -> None:
    wait_for_idle(page)
    # give the widget manager a moment to register with a freshly started kernel
    page.wait_for_timeout(2000)
    before = page.evaluate(_JS_BUSY_COUNTER)
    if via == "menu":
        page.locator(".lm-MenuBar-itemLabel", has_text=re.compile(r"^Run$")).first.click()
        page.locator(
            ".lm-Menu-content .lm-Menu-itemLabel", has_text=re.compile(r"^Run All Cells$")
        ).first.click()
    elif via == "command":
        page.evaluate("() => window.jupyterapp.commands.execute('notebook:run-all-cells')")
    else:
        raise ValueError(f"unknown via={via!r}")
    # The kernel must have gone busy at least once since the command, so a
    # still-idle kernel is not mistaken for a finished run.
    page.wait_for_function(
        "(before) => (" + _JS_BUSY_COUNTER + ")() > before", arg=before, timeout=30_000
    )
    wait_for_idle(page, timeout_ms=timeout_ms, settle_ms=500)
    assert_no_cell_errors(page)


def cell_errors(page) -> list[dict]:
    """Error outputs (ename, evalue, cell index) of the current notebook."""
    return page.evaluate(_JS_OUTPUT_ERRORS)


def assert_no_cell_errors(page) -> None:
    errors = cell_errors(page)
    assert not errors, "cells raised:\n  " + "\n  ".join(
        f"cell {e['cell']}: {e['ename']}: {e['evalue']}" for e in errors
    )


def widget(page, css_class: str):
    """Locator for the widget carrying ``css_class`` (see ``add_class``)."""
    return page.locator(f".{css_class.lstrip('.')}").first


def _looks_like_selector(text: str) -> bool:
    return text[:1] in ".#[" or any(ch in text for ch in "[]>:=")


def field_input(page, label_or_selector: str):
    """Locator for the <input>/<textarea> of an ipywidgets text-like field.

    Accepts a CSS selector (``.wb-field-bore``), a bare class name
    starting with ``wb-`` or the widget's description label text.
    """
    key = label_or_selector
    if key.startswith("wb-"):
        key = "." + key
    if _looks_like_selector(key):
        host = page.locator(key).first
    else:
        host = page.locator(
            ".jupyter-widgets.widget-inline-hbox",
            has=page.locator("label.widget-label", has_text=key),
        ).first
    inner = host.locator("input, textarea")
    tag = host.evaluate("el => el.tagName.toLowerCase()")
    return host if tag in ("input", "textarea") else inner.first


def type_into_field(page, label_or_selector: str, text: str, press_enter: bool = True) -> None:
    """Replace the text of an ipywidgets Text/FloatText field and press Enter."""
    box = field_input(page, label_or_selector)
    box.wait_for(state="visible")
    box.fill(text)
    if press_enter:
        box.press("Enter")


def screenshot(page, name: str, locator=None) -> Path:
    """Save a PNG to <repo>/screenshots/<name>.png and return its path."""
    SCREENSHOT_DIR.mkdir(parents=True, exist_ok=True)
    safe = "".join(ch if ch.isalnum() or ch in "-_." else "_" for ch in name)
    path = SCREENSHOT_DIR / (safe if safe.endswith(".png") else safe + ".png")
    (locator or page).screenshot(path=str(path))
    return path


# --------------------------------------------------------------------------
# Reading what a study panel shows
# --------------------------------------------------------------------------

# Pixels of a canvas that are not (nearly) white or transparent.
_JS_CANVAS_INK = """
(canvas) => {
  const w = canvas.width, h = canvas.height;
  if (!w || !h) return {width: w, height: h, ink: 0};
  const px = canvas.getContext('2d').getImageData(0, 0, w, h).data;
  let ink = 0;
  for (let i = 0; i < px.length; i += 4) {
    if (px[i + 3] === 0) continue;
    if (Math.min(px[i], px[i + 1], px[i + 2]) < 200) ink += 1;
  }
  return {width: w, height: h, ink: ink};
}
"""

# Every column ``name`` of every ColumnDataSource in the page's Bokeh
# documents, rounded to 6 significant figures (NaN -> null).
_JS_BOKEH_COLUMNS = """
(name) => {
  const B = window.Bokeh;
  if (!B || !B.documents) return null;
  const columns = [];
  for (const doc of B.documents) {
    for (const model of doc.all_models) {
      if (typeof model.get_column !== 'function') continue;
      const col = model.get_column(name);
      if (col == null) continue;
      columns.push(Array.from(col, v => Number.isFinite(v) ? Number(v.toPrecision(6)) : null));
    }
  }
  return columns;
}
"""

# Rows of the first table inside an element: lists of cell texts.
_JS_TABLE_ROWS = """
(root) => {
  const table = root.querySelector('table');
  if (!table) return [];
  return Array.from(table.querySelectorAll('tr'))
    .map(tr => Array.from(tr.querySelectorAll('td')).map(td => td.textContent.trim()))
    .filter(cells => cells.length > 0);
}
"""


def canvas_ink(canvas) -> dict:
    """``{width, height, ink}`` of a <canvas> locator; ``ink`` counts drawn pixels."""
    return canvas.evaluate(_JS_CANVAS_INK)


def wait_for_ink(page, canvas, min_ink: int = 500, timeout_ms: int = DEFAULT_TIMEOUT_MS) -> dict:
    """Wait until a canvas has at least ``min_ink`` drawn pixels; return its ink."""
    page.wait_for_function(
        "([c, n]) => (" + _JS_CANVAS_INK + ")(c).ink >= n",
        arg=[canvas.element_handle(), min_ink],
        polling=200,
        timeout=timeout_ms,
    )
    return canvas_ink(canvas)


def bokeh_columns(page, name: str = "y") -> list | None:
    """Column ``name`` of every ColumnDataSource BokehJS holds (None: no BokehJS)."""
    return page.evaluate(_JS_BOKEH_COLUMNS, name)


def table_rows(locator) -> list[list[str]]:
    """Cell texts of the first <table> inside ``locator`` (header rows left out)."""
    return locator.evaluate(_JS_TABLE_ROWS)


def wait_until(page, predicate, timeout_ms: int = 30_000, interval_ms: int = 100, message: str = ""):
    """Poll ``predicate()`` (Python side) until it returns a truthy value; return it."""
    deadline = time.monotonic() + timeout_ms / 1000
    while True:
        value = predicate()
        if value:
            return value
        if time.monotonic() > deadline:
            raise TimeoutError(message or f"condition not met within {timeout_ms} ms")
        page.wait_for_timeout(interval_ms)


def union_box(page, locators, padding: int = 0) -> dict:
    """Bounding box (page CSS pixels) around all ``locators``, grown by ``padding``."""
    boxes = [loc.bounding_box() for loc in locators]
    boxes = [b for b in boxes if b]
    if not boxes:
        raise ValueError("none of the elements has a bounding box")
    x0 = max(0.0, min(b["x"] for b in boxes) - padding)
    y0 = max(0.0, min(b["y"] for b in boxes) - padding)
    x1 = max(b["x"] + b["width"] for b in boxes) + padding
    y1 = max(b["y"] + b["height"] for b in boxes) + padding
    return {"x": x0, "y": y0, "width": x1 - x0, "height": y1 - y0}


def screenshot_region(page, path, locators, padding: int = 8) -> Path:
    """Save a PNG of the region around ``locators`` to ``path`` (any folder)."""
    path = Path(path)
    path.parent.mkdir(parents=True, exist_ok=True)
    page.screenshot(path=str(path), clip=union_box(page, locators, padding), scale="css")
    return path


def screenshot_whole(page, name: str, locator, margin: int = 200, max_height: int = 8000) -> Path:
    """Screenshot of an element taller than the window (e.g. a whole panel).

    JupyterLab scrolls inside its own panes, so a plain element screenshot
    of something taller than the viewport comes out cut or blank. The window
    is made tall enough for the element, the shot taken, and the window
    size put back.
    """
    old = page.viewport_size
    height = locator.evaluate("el => Math.ceil(el.getBoundingClientRect().height)")
    width = old["width"] if old else 1400
    page.set_viewport_size({"width": width, "height": min(max_height, max(height + margin, 600))})
    try:
        page.wait_for_timeout(400)  # let the lab re-lay out and bokeh repaint
        locator.scroll_into_view_if_needed()
        page.wait_for_timeout(200)
        return screenshot(page, name, locator=locator)
    finally:
        if old:
            page.set_viewport_size(old)
            page.wait_for_timeout(200)


# --------------------------------------------------------------------------
# Reading the rendered screen: tables, Bokeh figures, pixels of a plot frame
# --------------------------------------------------------------------------

# Every Bokeh figure BokehJS has on the page: its title, where it sits on the page
# (CSS pixels), its plot frame (the area inside the axes, relative to the figure) and,
# for every glyph renderer, the name, visibility, glyph type, line alpha, width and
# colour, and the x / y columns of its data source as drawn (NaN -> null).
_JS_BOKEH_FIGURES = """
() => {
  const B = window.Bokeh;
  if (!B || !B.index) return null;
  const spec = (v) => (v !== null && typeof v === 'object' && 'value' in v) ? v.value : v;
  const col = (src, name) => {
    const c = src.get_column ? src.get_column(name) : null;
    return c == null ? null : Array.from(c, v => (typeof v === 'number' && Number.isFinite(v)) ? v : null);
  };
  const out = [];
  for (const view of Object.values(B.index)) {
    const m = view.model;
    if (!m || !m.renderers || !view.frame) continue;
    const r = view.el.getBoundingClientRect();
    const f = view.frame.bbox;
    out.push({
      title: m.title ? m.title.text : null,
      in_wb_plot: !!view.el.closest('.wb-plot'),
      rect: {x: r.x, y: r.y, width: r.width, height: r.height},
      frame: {x0: f.x0, y0: f.y0, x1: f.x1, y1: f.y1},
      // colours of everything else the frame may show (grids, limit lines, labels, bands)
      other_colours: [m.outline_line_color].concat(...(m.center || []).map(a => [
        a.line_color, a.text_color, a.fill_color, a.grid_line_color, a.minor_grid_line_color,
        a.border_line_color].map(spec))).filter(c => typeof c === 'string'),
      renderers: m.renderers.filter(rr => rr.glyph).map(rr => ({
        name: rr.name, visible: rr.visible, glyph: rr.glyph.type,
        line_alpha: spec(rr.glyph.line_alpha), line_width: spec(rr.glyph.line_width),
        line_color: spec(rr.glyph.line_color),
        x: col(rr.data_source, 'x'), y: col(rr.data_source, 'y'),
      })),
    });
  }
  return out;
}
"""

# Rows of a table rendered by workbook.ui.tables: the row's level class, the text of
# every cell, and the data-rules attribute (verdict rows).
_JS_LEVEL_ROWS = """
([root, selector]) => Array.from(root.querySelectorAll(selector)).map(tr => ({
  level: (Array.from(tr.classList).find(c => c.startsWith('wb-level-')) || '').slice(9),
  cells: Array.from(tr.querySelectorAll('td')).map(td => td.textContent.trim()),
  rules: tr.getAttribute('data-rules'),
}))
"""


def bokeh_figures(page) -> list[dict] | None:
    """Every Bokeh figure on the page as drawn (see ``_JS_BOKEH_FIGURES``); None without BokehJS."""
    return page.evaluate(_JS_BOKEH_FIGURES)


def level_rows(locator, selector: str) -> list[dict]:
    """``[{level, cells, rules}]`` of the rows matching ``selector`` inside ``locator``."""
    return locator.evaluate("(root, selector) => (" + _JS_LEVEL_ROWS + ")([root, selector])", selector)


def hex_rgb(colour: str) -> tuple[int, int, int]:
    """``"#0072B2"`` -> ``(0, 114, 178)``; CSS colour names too (``"white"``)."""
    from PIL import ImageColor

    return ImageColor.getrgb(colour)[:3]


def frame_pixels(page, plot_locator, title: str, inset: int = 3):
    """A screenshot (PIL image, CSS pixels) of the plot frame of the Bokeh figure ``title``:
    the area inside its axes, shrunk by ``inset`` pixels so neither axis line nor the frame
    outline is in it. The plot is scrolled into view first: what the user sees."""
    from io import BytesIO

    from PIL import Image

    plot_locator.scroll_into_view_if_needed()
    page.wait_for_timeout(300)   # BokehJS repaints a figure that scrolled into view
    fig = next((f for f in bokeh_figures(page) or [] if f["title"] == title), None)
    assert fig is not None, f"no Bokeh figure titled {title!r} on the page"
    r, f = fig["rect"], fig["frame"]
    clip = {"x": r["x"] + f["x0"] + inset, "y": r["y"] + f["y0"] + inset,
            "width": f["x1"] - f["x0"] - 2 * inset, "height": f["y1"] - f["y0"] - 2 * inset}
    assert clip["width"] > 100 and clip["height"] > 80, ("plot frame too small", title, clip)
    png = page.screenshot(clip=clip, scale="css")
    return Image.open(BytesIO(png)).convert("RGB")


def pixels_near(image, colour, tolerance: float = 60.0, foreign=(), background=None) -> int:
    """How many pixels of ``image`` lie within ``tolerance`` (RGB distance) of ``colour``.

    With ``foreign`` colours and the ``background``, a pixel closer to a blend of a foreign
    colour with the background (the anti-aliased edge of a dark red limit line looks pink)
    than to ``colour`` is not counted."""
    import numpy as np

    def rgb(c):
        return np.array(hex_rgb(c) if isinstance(c, str) else c, dtype=float)

    px = np.asarray(image, dtype=float)
    near = np.linalg.norm(px - rgb(colour), axis=-1)
    hit = near < tolerance
    if background is not None:
        bg = rgb(background)
        for other in foreign:
            try:
                f = rgb(other)
            except ValueError:       # a colour PIL cannot read: nothing to discount
                continue
            span = bg - f
            if not span.any():
                continue
            t = np.clip(((px - f) @ span) / (span @ span), 0.0, 1.0)
            hit &= near < np.linalg.norm(px - (f + t[..., None] * span), axis=-1)
    return int(hit.sum())


def dominant_colour(image) -> tuple[int, int, int]:
    """The most frequent colour of ``image`` (a plot frame's background)."""
    colours = image.getcolors(maxcolors=1 << 24)
    return max(colours)[1]


def colour_distance(a, b) -> float:
    """RGB distance between two colours (``"#rrggbb"`` or tuples)."""
    a = hex_rgb(a) if isinstance(a, str) else a
    b = hex_rgb(b) if isinstance(b, str) else b
    return sum((x - y) ** 2 for x, y in zip(a, b)) ** 0.5
