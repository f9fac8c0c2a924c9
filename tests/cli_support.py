"""Helpers shared by the CLI test files: run linecalc in-process, write a file."""
from __future__ import annotations

from linecalc.cli import main


def run(capsys, *args):
    """linecalc in-process: (exit status, stdout, stderr)."""
    code = main([str(a) for a in args])
    out, err = capsys.readouterr()
    return code, out, err


def write(folder, name, text):
    path = folder / name
    path.write_text(text)
    return path
