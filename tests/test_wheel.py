"""The wheel as a user installs it: built from this checkout, installed into a fresh virtual
environment, and run from a folder outside the checkout.

The other tests run against the editable install, which can find files through the source tree;
these catch what that hides (files left out of the wheel, paths relative to the checkout).

To stay fast and offline, the wheel is built with this environment's setuptools
(``--no-build-isolation``) and installed with ``--no-deps --no-index``; the fresh environment
sees this environment's already installed dependencies through a ``.pth`` file. A ``.pth`` line
that names a folder only adds it to ``sys.path`` (the ``.pth`` files inside that folder, among
them the editable install's hook, are not run), and `test_linecalc_is_imported_from_the_fresh_environment`
checks that the fresh environment's copy is the one imported.
"""
from __future__ import annotations

import importlib.metadata
import json
import os
import shutil
import subprocess
import sys
import sysconfig
import zipfile
from pathlib import Path

import pytest

from linecalc.io import cable_library as library

ROOT = Path(__file__).resolve().parent.parent
# What a build needs is the source, not the checkout's environments, caches or earlier builds
# (a build/ folder left in the source can carry stale modules into a wheel).
_NOT_SOURCE = shutil.ignore_patterns(".git", ".venv", "build", "dist", "*.egg-info", "__pycache__",
                                     ".pytest_cache", ".hypothesis", "*.pyc")

STATION = """\
# Invented scenario: a 40 m dipole at a cabin, fed with coax from the library.
name: Test cabin dipole
region: 1
radio: {power: 100 W, impedance: 50 ohm}
frequencies: [7.1 MHz]
antenna: {impedance: {7.0 MHz: 64-j38, 7.2 MHz: 72+j38}}
feed: [{line: {cable: rg-213, length: 25 m}}]
"""


def _run(command, cwd, check=True):
    """Run ``command`` in ``cwd`` with an environment that points at no checkout or venv."""
    env = {key: value for key, value in os.environ.items()
           if key not in ("PYTHONPATH", "PYTHONHOME", "VIRTUAL_ENV", "PYTHONSTARTUP")}
    result = subprocess.run([str(part) for part in command], cwd=cwd, env=env, capture_output=True,
                            text=True, timeout=300)
    if check:
        assert result.returncode == 0, f"{command} exited {result.returncode}\n{result.stdout}\n{result.stderr}"
    return result


class Installed:
    """The wheel and the fresh environment it is installed in."""

    def __init__(self, wheel: Path, venv: Path, work: Path):
        self.wheel = wheel
        self.venv = venv
        self.bin = venv / "bin"
        self.work = work  # a folder outside the checkout, the current folder of every run

    def linecalc(self, *args, check=True):
        return _run([self.bin / "linecalc", *args], cwd=self.work, check=check)

    def python(self, code):
        return _run([self.bin / "python", "-c", code], cwd=self.work)


@pytest.fixture(scope="module")
def installed(tmp_path_factory) -> Installed:
    base = tmp_path_factory.mktemp("wheel")
    source = base / "source"
    shutil.copytree(ROOT, source, ignore=_NOT_SOURCE)
    dist = base / "dist"
    _run([sys.executable, "-m", "pip", "wheel", "--quiet", "--no-deps", "--no-build-isolation",
          "--wheel-dir", dist, source], cwd=base)
    (wheel,) = dist.glob("linecalc-*.whl")

    venv = base / "venv"
    # No pip in the fresh environment: this environment's pip installs into it (--python).
    _run([sys.executable, "-m", "venv", "--without-pip", venv], cwd=base)
    fresh_site = Path(_run([venv / "bin" / "python", "-c", "import sysconfig; print(sysconfig.get_path('purelib'))"],
                           cwd=base).stdout.strip())
    dev_site = {sysconfig.get_path("purelib"), sysconfig.get_path("platlib")}
    (fresh_site / "_linecalc_test_dependencies.pth").write_text("\n".join(sorted(dev_site)) + "\n")
    _run([sys.executable, "-m", "pip", "--python", venv / "bin" / "python", "install", "--quiet",
          "--no-deps", "--no-index", wheel], cwd=base)

    work = base / "work"
    work.mkdir()
    (work / "cabin.yaml").write_text(STATION)
    return Installed(wheel, venv, work)


def test_linecalc_is_imported_from_the_fresh_environment(installed):
    where = Path(installed.python("import linecalc; print(linecalc.__file__)").stdout.strip())
    assert where.is_relative_to(installed.venv.resolve()) or where.is_relative_to(installed.venv)
    assert not where.resolve().is_relative_to(ROOT)
    data = Path(installed.python("import importlib.resources as r; print(r.files('linecalc.cable_data'))").stdout.strip())
    assert not data.resolve().is_relative_to(ROOT)


def test_the_wheel_ships_every_package_and_the_cable_files(installed):
    names = set(zipfile.ZipFile(installed.wheel).namelist())
    shipped = {str(Path(name).parent) for name in names if name.endswith("/__init__.py")}
    in_source = {str(path.parent.relative_to(ROOT)) for path in (ROOT / "linecalc").rglob("__init__.py")
                 if "__pycache__" not in path.parts}
    # a subpackage missing here is missing from `packages` in pyproject.toml
    assert in_source | {"linecalc/cable_data"} == shipped
    cables = {path.name for path in (ROOT / "cable_data").glob("*.yaml")}
    assert cables
    assert {f"linecalc/cable_data/{name}" for name in cables} <= names
    # the report's template is package data too
    assert "linecalc/render/templates/report.html.j2" in names


def test_report_is_made_from_the_installed_template(installed):
    result = installed.linecalc("report", "cabin.yaml", "--output", "cabin.html")
    assert result.stdout == ""
    page = (installed.work / "cabin.html").read_text(encoding="utf-8")
    assert "<h1>Test cabin dipole</h1>" in page
    assert page.count("<svg") == 4  # swr, smith, voltage, budget; no compare: key


def test_cables_lists_the_library(installed):
    result = installed.linecalc("cables")
    assert "rg-213" in result.stdout
    assert "window-line-450" in result.stdout


def test_budget_of_a_station_naming_a_library_cable(installed):
    table = installed.linecalc("budget", "cabin.yaml")
    assert table.stdout.startswith("Test cabin dipole")
    result = json.loads(installed.linecalc("budget", "--format", "json", "cabin.yaml").stdout)
    assert result["station"] == "Test cabin dipole"
    # the line loss is that of the installed library's rg-213 entry: 25 m of it at 7.1 MHz
    (row,) = result["rows"]
    expected_db = 25 * library.cable("rg-213").matched_loss_db_per_m(7.1e6)
    assert row["matched_loss_db"] == pytest.approx(expected_db, rel=1e-9)


def test_version_is_the_installed_metadata(installed):
    version = installed.python("import importlib.metadata as m; print(m.version('linecalc'))").stdout.strip()
    assert version == importlib.metadata.version("linecalc")
    result = installed.linecalc("--version")
    assert version in result.stdout
