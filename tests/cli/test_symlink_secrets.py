"""A station whose sweep (or which itself) is a symlink to some other file must not show that
file's content in an error: the first word of a system file may be a secret. Messages name the
file, the line and the field, never its text."""
from __future__ import annotations

import pytest

SECRET = "SECRETTOKEN4711"

# system-file shapes: a passwd-like line, a plain word, a key-value line, an option-like
# comment, a 2.x keyword with a value, each with the secret first or in the place a message
# would quote
CONTENTS = {
    "passwd line": f"{SECRET}:x:0:0:root:/root:/bin/sh\n",
    "word": f"{SECRET}\n",
    "words": f"{SECRET} abc def\n",
    "after an option line": f"# MHz S MA R 50\n7.0 {SECRET} 1\n",
    "comment as option line": f"# {SECRET} hosts\n127.0.0.1 localhost\n",
    "reference of the option line": f"# MHz S MA R {SECRET}\n7.0 0.1 1\n",
    "version": f"[Version] {SECRET}\n",
    "ports": f"[Version] 2.0\n[Number of Ports] {SECRET}\n",
    "frequency count": f"[Version] 2.0\n[Number of Ports] 1\n[Number of Frequencies] {SECRET}\n",
    "reference keyword": f"[Version] 2.0\n# MHz S RI R 50\n[Number of Ports] 1\n[Reference] {SECRET}\n",
}

STATION = """\
name: Symlinked sweep
frequencies: [7.1 MHz]
radio: {power: 100 W}
antenna:
  touchstone: sweep.s1p
feed:
  - line: {label: coax, cable: rg-213, length: 10 m}
"""


@pytest.mark.parametrize("case", list(CONTENTS))
def test_a_symlinked_sweep_never_echoes_its_target(case, tmp_path, cli, write_file):
    target = write_file("system-file", CONTENTS[case])
    (tmp_path / "sweep.s1p").symlink_to(target)
    code, out, err = cli("budget", write_file("station.yaml", STATION))
    assert code == 2 and out == ""
    assert SECRET not in err and SECRET.lower() not in err.lower()
    assert "sweep.s1p:" in err  # the message still names the file and its line


@pytest.mark.parametrize("case", ["passwd line", "word", "words"])
def test_a_symlinked_station_never_echoes_its_target(case, tmp_path, cli, write_file):
    target = write_file("system-file", CONTENTS[case])
    (tmp_path / "station.yaml").symlink_to(target)
    code, out, err = cli("budget", tmp_path / "station.yaml")
    assert code == 2 and out == ""
    assert SECRET not in err and SECRET.lower() not in err.lower()
    assert "station.yaml:" in err
