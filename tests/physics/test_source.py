"""The radio's drive (linecalc.physics.source): forward, reflected and net power at its port."""
from __future__ import annotations

import math

import numpy as np
import pytest

from linecalc.physics.source import radio_drive, rho_from_swr


@pytest.mark.parametrize("swr", [1.0, 1.5, 2.0, 3.2, 10.0])
def test_held_forward_mismatch_loss_is_the_textbook_formula(swr):
    # Pozar, Microwave Engineering, 4th ed., section 2.3: the power delivered to a load of
    # reflection rho is the incident power times (1 - |rho|^2); the mismatch loss is
    # 10 log10(1 / (1 - |rho|^2)) and |rho| = (SWR - 1)/(SWR + 1) (equation 2.41).
    rho = (swr - 1) / (swr + 1)
    drive = radio_drive(np.array([rho]), 100.0, "forward")
    assert drive.forward_w[0] == pytest.approx(100.0, rel=1e-12)
    assert drive.net_w[0] == pytest.approx(100.0 * (1 - rho**2), rel=1e-12)
    assert drive.mismatch_loss_db[0] == pytest.approx(10 * math.log10(1 / (1 - rho**2)), rel=1e-12, abs=1e-12)


def test_held_forward_into_3_2_to_1_delivers_72_6_watts():
    # Worked by hand: SWR 3.2 gives |rho| = 2.2/4.2 = 0.52381, |rho|^2 = 0.27438, so 100 W
    # forward leaves 100 (1 - 0.27438) = 72.56 W net (Pozar, section 2.3).
    drive = radio_drive(rho_from_swr(np.array([3.2])), 100.0, "forward")
    assert drive.net_w[0] == pytest.approx(72.56, abs=0.005)
    assert drive.reflected_w[0] == pytest.approx(27.44, abs=0.005)


def test_held_net_costs_nothing_against_the_setting():
    # Pozar, section 2.3: to deliver P into |rho| the incident power is P / (1 - |rho|^2).
    rho = np.array([0.0, 0.5])
    drive = radio_drive(rho, 100.0, "net")
    np.testing.assert_allclose(drive.net_w, [100.0, 100.0], rtol=1e-12)
    np.testing.assert_allclose(drive.forward_w, [100.0, 100.0 / 0.75], rtol=1e-12)
    np.testing.assert_allclose(drive.mismatch_loss_db, [0.0, 0.0], atol=1e-12)


def test_reflected_power_limit_worked_by_hand():
    # Worked by hand. Foldback at 2:1: |rho_f| = 1/3, |rho_f|^2 = 1/9, so with 100 W forward the
    # reflected power is held at 100/9 = 11.11 W from there on.
    # - SWR 1.5 (|rho| = 0.2, below the limit): 100 W forward, 4 W reflected, 96 W net.
    # - SWR 3 (|rho| = 0.5): forward = 11.11 / 0.25 = 44.44 W, reflected 11.11 W, net 33.33 W.
    # - SWR 2 itself: not folded, 100 W forward.
    drive = radio_drive(rho_from_swr(np.array([1.5, 3.0, 2.0])), 100.0, "forward", foldback_swr=2.0)
    np.testing.assert_allclose(drive.forward_w, [100.0, 400 / 9, 100.0], rtol=1e-12)
    np.testing.assert_allclose(drive.reflected_w, [4.0, 100 / 9, 100 / 9], rtol=1e-12)
    np.testing.assert_allclose(drive.net_w, [96.0, 100 / 3, 800 / 9], rtol=1e-12)
    assert drive.folded.tolist() == [False, True, False]


def test_held_net_with_a_reflected_power_limit_worked_by_hand():
    # Worked by hand. Holding 100 W net, at the 2:1 limit the forward power is 100/(8/9) =
    # 112.5 W and the reflected 12.5 W; at SWR 3 (|rho|^2 = 0.25) forward = 12.5/0.25 = 50 W,
    # net 37.5 W, so 10 log10(100/37.5) = 4.26 dB short of the setting.
    drive = radio_drive(rho_from_swr(np.array([3.0])), 100.0, "net", foldback_swr=2.0)
    assert drive.forward_w[0] == pytest.approx(50.0, rel=1e-12)
    assert drive.net_w[0] == pytest.approx(37.5, rel=1e-12)
    assert drive.mismatch_loss_db[0] == pytest.approx(10 * math.log10(100 / 37.5), rel=1e-12)


def test_largest_forward_power_caps_a_net_holding_source():
    # Worked by hand: 100 W net into SWR 3 needs 133.3 W forward; a 120 W limit leaves 120 W
    # forward, 30 W reflected and 90 W net.
    drive = radio_drive(rho_from_swr(np.array([3.0, 1.0])), 100.0, "net", max_power_w=120.0)
    np.testing.assert_allclose(drive.forward_w, [120.0, 100.0], rtol=1e-12)
    np.testing.assert_allclose(drive.net_w, [90.0, 100.0], rtol=1e-12)
    assert drive.limited.tolist() == [True, False]


def test_unknown_holds_is_refused():
    with pytest.raises(ValueError):
        radio_drive(np.array([0.1]), 100.0, "available")
