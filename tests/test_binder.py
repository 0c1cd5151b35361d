"""The binder configuration installs exactly what pyproject.toml declares."""

import pathlib
import re

try:
    import tomllib
except ModuleNotFoundError:  # Python 3.10
    import tomli as tomllib

ROOT = pathlib.Path(__file__).resolve().parents[1]


def _normalise(req: str) -> str:
    req = req.split("#", 1)[0].strip()
    name, _, rest = re.match(r"^([A-Za-z0-9_.\-]+)(.*)$", req).group(1, 0, 2)
    return re.sub(r"[-_.]+", "-", name).lower() + rest.replace(" ", "")


def test_binder_requirements_match_pyproject_dependencies():
    project = tomllib.loads((ROOT / "pyproject.toml").read_text())["project"]
    declared = {_normalise(r) for r in project["dependencies"]}
    lines = (ROOT / "binder" / "requirements.txt").read_text().splitlines()
    listed = {_normalise(line) for line in lines if line.split("#", 1)[0].strip()}
    assert listed == declared, f"only in binder: {listed - declared}; only in pyproject: {declared - listed}"


def test_binder_installs_the_package_and_python_matches():
    post = (ROOT / "binder" / "postBuild").read_text()
    assert "pip install" in post and " ." in post
    runtime = (ROOT / "binder" / "runtime.txt").read_text().strip()
    major, minor = map(int, runtime.removeprefix("python-").split(".")[:2])
    requires = tomllib.loads((ROOT / "pyproject.toml").read_text())["project"]["requires-python"]
    floor = tuple(map(int, requires.removeprefix(">=").split(".")))
    assert (major, minor) >= floor
