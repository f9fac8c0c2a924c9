"""The README's *Python use* example runs as written and gives the command's JSON document."""
from __future__ import annotations

import json
import os
import re
import subprocess
import sys
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent


def _python_use_example() -> str:
    readme = (ROOT / "README.md").read_text(encoding="utf-8")
    section = readme.split("## Python use", 1)[1].split("\n## ", 1)[0]
    return re.search(r"```python\n(.*?)```", section, re.S).group(1)


def test_the_python_use_example_runs_and_equals_the_json_of_the_command(monkeypatch):
    example = _python_use_example()
    assert len(example.strip().splitlines()) == 3  # the README promises a three-line example
    monkeypatch.chdir(ROOT)
    namespace = {}
    exec(compile(example, "README.md (Python use)", "exec"), namespace)
    command = subprocess.run([str(Path(sys.executable).parent / "linecalc"), "budget", "stations/hilltop-dipole.yaml",
                              "--format", "json"], cwd=ROOT, capture_output=True, text=True, check=True,
                             env={**os.environ, "PYTHONWARNINGS": "error"})
    assert namespace["document"] == json.loads(command.stdout)
