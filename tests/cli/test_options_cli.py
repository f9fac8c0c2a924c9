"""Option values checked and blamed on the option: one line `linecalc CMD: --option: ...`, exit 2,
nothing on stdout. Lengths on the command line are held to the limits of a station file's
lengths (README, Errors and exit status: lengths up to 1,000 km, at least 1e-6 m)."""
from __future__ import annotations

import pytest


@pytest.mark.parametrize("args, option", [
    (["advise", "orchard-doublet.yaml", "--max-loss", "nan"], "--max-loss"),
    (["advise", "orchard-doublet.yaml", "--max-loss", "-1"], "--max-loss"),
    (["advise", "orchard-doublet.yaml", "--max-loss", "inf"], "--max-loss"),
    (["advise", "orchard-doublet.yaml", "--top", "-1"], "--top"),
    (["advise", "orchard-doublet.yaml", "--top", "0"], "--top"),
    (["advise", "orchard-doublet.yaml", "--to", "1e9 m"], "--to"),
    (["advise", "orchard-doublet.yaml", "--from", "-5 m"], "--from"),
    (["advise", "orchard-doublet.yaml", "--step", "0 m"], "--step"),
    (["compare", "hilltop-dipole.yaml", "--lengths", "2000km"], "--lengths"),
    (["compare", "hilltop-dipole.yaml", "--lengths", "1m", "1e-7 m"], "--lengths"),
])
def test_a_bad_option_value_is_blamed_on_the_option(cli, data_path, args, option):
    args = [str(data_path(a)) if a.endswith(".yaml") else a for a in args]
    code, out, err = cli(*args)
    assert code == 2 and out == ""
    assert err.startswith(f"linecalc {args[0]}: {option}: ") and err.count("\n") == 1, err
