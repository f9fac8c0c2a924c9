"""Small-part models: the connector's series resistance and the choke and balun windings."""
from __future__ import annotations

import numpy as np
import pytest

from linecalc.physics import small_parts
from linecalc.physics.twoports import terminated_loss_db

F_HZ = np.array([0.5e6, 1.8e6, 7.1e6, 28.5e6, 146e6, 435e6])


def test_series_resistance_for_loss_by_hand():
    # Worked by hand: R = 50 (10^(0.05/10) - 1) = 50 x 0.01157945 = 0.578973 ohm; P_in / P_out =
    # (50 + R) / 50 between 50-ohm terminations (Pozar, 4th ed., section 4.4). Six figures: rtol 2e-6.
    assert small_parts.series_resistance_for_loss_ohm(0.05, 50.0) == pytest.approx(0.578973, rel=2e-6)
    assert small_parts.series_resistance_for_loss_ohm(0.0, 50.0) == 0.0


@pytest.mark.parametrize("loss_db, length_m, velocity_factor", [(0.05, 1.5, 0.66), (0.2, 1.0, 0.7), (3.0, 0.1, 0.7)])
def test_winding_loses_its_loss_between_reference_terminations(loss_db, length_m, velocity_factor):
    # The loss key's meaning (README): the loss between reference terminations, at every frequency,
    # also where R' is not small against omega L' (0.5 MHz). Bisection to float resolution: rtol 1e-9.
    abcd = small_parts.winding_abcd(F_HZ, 50.0, velocity_factor, length_m, loss_db)
    np.testing.assert_allclose(terminated_loss_db(abcd, 50.0), loss_db, rtol=1e-9)
    r = small_parts.winding_resistance_ohm_per_m(F_HZ, 50.0, velocity_factor, length_m, loss_db)
    assert np.all(r > 0)


@pytest.mark.parametrize("loss_db", [7e-25, 1e-12, 5e-7])
def test_winding_of_a_loss_below_float_resolution_scales_with_it(loss_db):
    # A property test found 7e-25 dB refused ("no conductor resistance gives a loss"). To first order
    # a line section's loss grows as R' (Pozar, 4th ed., section 2.7: alpha = R'/(2 Z0) + G' Z0/2), so
    # R' for a tiny loss is R' of a resolvable one scaled by the ratio; the lumped estimate
    # Z0 (10^(L/10) - 1) / length = Z0 L ln(10)/10 / length agrees to a few 1e-3 at HF (the section is
    # short against a wavelength).
    r = small_parts.winding_resistance_ohm_per_m(F_HZ[1:4], 50.0, 0.66, 1.5, loss_db)
    lumped = 50.0 * loss_db * np.log(10) / 10 / 1.5
    np.testing.assert_allclose(r, lumped, rtol=5e-2)
    assert np.all(r > 0)


def test_winding_of_zero_length_is_no_section():
    abcd = small_parts.winding_abcd(F_HZ, 50.0, 0.7, 0.0, 0.0)
    np.testing.assert_array_equal(abcd, np.broadcast_to(np.eye(2), abcd.shape))
    with pytest.raises(ValueError):
        small_parts.winding_abcd(F_HZ, 50.0, 0.7, 0.0, 0.1)
