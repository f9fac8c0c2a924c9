"""The budget study: the SWR at the antenna against the feeding line's nominal (real) impedance."""
from __future__ import annotations

import math

import numpy as np
import pytest

from linecalc import elements
from linecalc.studies import budget

HF_HZ = np.array([3.6e6, 7.1e6, 14.2e6])


@pytest.mark.parametrize("z_load", [2 + 300j, 2 - 300j], ids=str)
def test_swr_at_antenna_is_against_the_nominal_real_impedance(z_load, library, make_station):
    # Worked by hand (Pozar, 4th ed., section 2.3, rho = (Z - Z0)/(Z + Z0), SWR = (1 + |rho|)/(1 - |rho|))
    # with the RG-58 class line's nominal Z0 = 50 ohm:
    #   |Z - Z0| = |-48 +- j300| = sqrt(48^2 + 300^2) = sqrt(92304) = 303.8157
    #   |Z + Z0| = | 52 +- j300| = sqrt(52^2 + 300^2) = sqrt(92704) = 304.4733
    #   |rho| = 0.9978402, SWR = 1.9978402 / 0.0021598 = 925.0
    # the same for +j300 and -j300; the complex Z0 of the lossy cable gave inf for +j300.
    cable = library["rg-58"]
    assert cable.z0_nominal_ohm == 50.0
    rho = math.sqrt(92304) / math.sqrt(92704)
    expected_swr = (1 + rho) / (1 - rho)
    assert expected_swr == pytest.approx(925.0, rel=1e-3)
    result = budget.solve_budget(make_station([elements.Line(cable, 20.0, "coax")], HF_HZ, z_load))
    np.testing.assert_allclose(result.swr_antenna, expected_swr, rtol=1e-9)
    assert np.all(np.isfinite(result.swr_antenna))


def test_a_load_with_no_resistance_through_a_line_is_solved(library, make_station):
    # 0+j50000 ohm takes no power: everything the radio sends is heat in the line (energy balance,
    # Pozar, Microwave Engineering, 4th ed., section 2.3: a reactive load absorbs nothing). Its
    # net power at the antenna is rounding residue of either sign, and its exposure is that of no power.
    line = elements.Line(library["rg-213"], 10.0, "coax")
    result = budget.solve_budget(make_station([line], [7.1e6], 0 + 50000j))
    assert abs(result.power_antenna_w[0]) < 1e-9 * 100.0
    np.testing.assert_allclose(result.elements[0].dissipated_w + result.power_antenna_w, 100.0, rtol=1e-9)
    assert result.exposure["power_average_w"][0] == 0.0
    assert np.all(np.isfinite([v[0] for v in result.exposure.values()]))
