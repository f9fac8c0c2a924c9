"""The units read without pint agree with pint, and the registry stays unimported on a plain budget."""
from __future__ import annotations

import subprocess
import sys

import pytest

from linecalc.io.units import COMMON_UNITS, UnitError, parse_quantity, registry


@pytest.mark.parametrize("symbol", sorted(COMMON_UNITS))
def test_common_unit_factor_equals_pint(symbol):
    # pint is the independent reference here: its definitions file carries the SI prefixes and
    # the international foot and inch (0.3048 m and 0.0254 m exactly, NIST SP 811, appendix B)
    si, factor = COMMON_UNITS[symbol]
    expected = registry().Quantity(2.5, symbol).to(si).magnitude
    assert parse_quantity(f"2.5 {symbol}", si) == pytest.approx(expected, rel=1e-15)


def test_other_units_go_to_pint():
    assert parse_quantity("3 yard", "m") == pytest.approx(2.7432, rel=1e-15)  # 3 x 0.9144 m, NIST SP 811
    assert parse_quantity("98 feet", "m") == pytest.approx(98 * 0.3048, rel=1e-15)
    with pytest.raises(UnitError, match="not a quantity in m"):
        parse_quantity("30 W", "m")
    with pytest.raises(UnitError, match="not a quantity in m"):
        parse_quantity("30 kg", "m")


def test_plain_budget_does_not_import_pint(data_path):
    code = ("import sys; from linecalc.cli import main; main(['budget', sys.argv[1]]); "
            "print('pint' in sys.modules, 'matplotlib' in sys.modules, 'skrf' in sys.modules, file=sys.stderr)")
    result = subprocess.run([sys.executable, "-c", code, str(data_path("hilltop-dipole.yaml"))],
                            capture_output=True, text=True, check=True)
    assert result.stderr.strip().splitlines()[-1] == "False False False"
