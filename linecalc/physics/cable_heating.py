"""Heating of a cable: how hot its conductor runs for a heat per metre, and the heat per metre
(so the matched average power) that keeps it within its insulation's temperature limit.

Pure functions over numpy arrays in SI units, temperatures in kelvin of rise above the ambient
(absolute temperatures in degrees Celsius where the name says ``_c``).

The method is the steady-state current rating of cables, IEC 60287 (from memory): the heat of
each conductor and of the dielectric flows outward through the layers around it in series, each
layer a thermal resistance per metre, then from the surface into still air. A coax's inner
conductor is its hottest point; the temperature limit is that of the dielectric around it.

Approximations, beside the numbers they make:
- the layers are concentric cylinders; the flat ribbon of twin lead and the web of window line
  are taken as a round covering of the stated diameter on each wire, and the two wires of a
  balanced line as two separate cables in free air (each carries half the heat; the other's
  warmth and the web are left out);
- the cable lies alone in still air, out of the sun (sunlight adds a few tens of kelvin to a
  black jacket; a bundle, a conduit or a buried run rates lower); the still-air surface
  coefficient of IEC 60287-2-1 covers convection and radiation together;
- heat does not spread along the cable: at HF a standing wave's hot spots are metres apart, and a
  copper inner carries much less heat along itself than the layers pass outward (a 2 mm wire
  conducts about 1e-3 W/K over a metre, against about 1 W/K per metre outward);
- the allowed heat is found for the matched split between conductor and dielectric heat. At a
  current maximum of a mismatched line the split shifts toward the conductor; dielectric heat
  counts half through the dielectric, so the allowed total then falls by at most half the
  dielectric share times the dielectric's part of the thermal path: under 2 % for the library
  coax below 450 MHz (dielectric share under 12 %, dielectric layer under a third of the path).
"""
from __future__ import annotations

from dataclasses import dataclass

import numpy as np

# Ambient air temperature of the ratings [degC]: 40 degC is the ambient at which cable power
# ratings are usually quoted (common practice, from memory). A hotter place (an attic, a mast in
# the sun) rates lower.
AMBIENT_C = 40.0

# IEC 60287-2-1, section 4.2.1 (cables in free air, protected from solar radiation): the heat
# dissipation coefficient h = Z / De^g + E [W/(m^2 K^(5/4))], De the outer diameter in metres,
# with the constants of its table for a single cable in air (from memory).
FREE_AIR_Z = 0.21
FREE_AIR_E = 3.94
FREE_AIR_G = 0.60

# Halvings of the bracket [0, rise] in `allowed_heat_w_per_m`: 64 take the bracket below the
# spacing of doubles at any rise (2^-64 < 2^-52), so the root is found to rounding.
_BISECTIONS = 64


@dataclass(frozen=True)
class CableThermal:
    """A cable's thermal build, for `allowed_heat_w_per_m`.

    ``insulation_k_m_per_w`` [K m/W]: the dielectric around the hot conductor (T1 of IEC 60287);
    ``jacket_k_m_per_w`` [K m/W]: everything between the outer conductor and the surface (T3), 0
    for a bare wire; ``surface_diameter_m`` [m]: where the heat leaves into the air;
    ``hot_conductor_share`` [1]: the hot conductor's share of the conductor heat (a coax's inner,
    the rest is in its outer conductor; 1 for a balanced line's wire); ``conductors`` [1]: the
    cables in free air that share the heat (1 for coax, 2 for the wires of a balanced line);
    ``max_temperature_c`` [degC]: the highest temperature the insulation takes continuously.
    """

    insulation_k_m_per_w: float
    jacket_k_m_per_w: float
    surface_diameter_m: float
    hot_conductor_share: float
    conductors: int
    max_temperature_c: float


def layer_thermal_resistance_k_m_per_w(thermal_resistivity_k_m_per_w, inner_diameter_m, outer_diameter_m):
    """Thermal resistance per metre of a cylindrical layer.

    Parameters
    ----------
    thermal_resistivity_k_m_per_w : array_like
        Thermal resistivity of the layer's material [K m/W].
    inner_diameter_m, outer_diameter_m : array_like
        Diameters under and over the layer [m].

    Returns
    -------
    ndarray
        T = rho_T / (2 pi) ln(D_out / D_in) [K m/W].

    References
    ----------
    IEC 60287-2-1, section 4.1.2 (thermal resistance of the insulation, T1 = rho_T/(2 pi)
    ln(1 + 2 t1/dc)) and section 4.1.4 (outer covering, T3, the same form) (from memory);
    Incropera and DeWitt, Fundamentals of Heat and Mass Transfer, section 3.3.1 (radial conduction
    in a cylindrical wall).
    """
    return (np.asarray(thermal_resistivity_k_m_per_w, dtype=float) / (2 * np.pi)
            * np.log(np.asarray(outer_diameter_m, dtype=float) / np.asarray(inner_diameter_m, dtype=float)))


def free_air_coefficient(surface_diameter_m):
    """Heat dissipation coefficient of a single cable in still air.

    Parameters
    ----------
    surface_diameter_m : array_like
        Outer diameter of the cable [m].

    Returns
    -------
    ndarray
        h = Z / De^g + E [W/(m^2 K^(5/4))] with the constants of a single cable (`FREE_AIR_Z`,
        `FREE_AIR_E`, `FREE_AIR_G`).

    References
    ----------
    IEC 60287-2-1, section 4.2.1 and its table of Z, E and g (from memory).
    """
    return FREE_AIR_Z / np.asarray(surface_diameter_m, dtype=float) ** FREE_AIR_G + FREE_AIR_E


def surface_rise_k(heat_w_per_m, surface_diameter_m):
    """Temperature rise of a cable's surface above still air for the heat it gives off.

    Parameters
    ----------
    heat_w_per_m : array_like
        Heat leaving the surface, per metre [W/m].
    surface_diameter_m : array_like
        Outer diameter [m].

    Returns
    -------
    ndarray
        The rise dtheta_s [K] from W = pi De h dtheta_s^(5/4), the free-air thermal resistance
        T4 = 1 / (pi De h dtheta_s^(1/4)) solved in closed form for a given W.

    References
    ----------
    IEC 60287-2-1, section 4.2.1 (external thermal resistance of a cable in free air) (from
    memory).
    """
    d = np.asarray(surface_diameter_m, dtype=float)
    return (np.asarray(heat_w_per_m, dtype=float) / (np.pi * d * free_air_coefficient(d))) ** 0.8


def _linear_path_k_m_per_w(thermal: CableThermal, dielectric_share):
    """The layers' part of the hot conductor's rise per watt per metre of the whole cable [K m/W].

    IEC 60287-1-1, section 1.4.1.1 (from memory): the hot conductor's heat crosses the insulation,
    the dielectric's own heat crosses half of it, and all the heat crosses the jacket.
    """
    conductor_share = 1 - np.asarray(dielectric_share, dtype=float)
    hot = thermal.hot_conductor_share * conductor_share
    return (hot + dielectric_share / 2) * thermal.insulation_k_m_per_w + thermal.jacket_k_m_per_w


def conductor_rise_k(thermal: CableThermal, heat_w_per_m, dielectric_share):
    """Temperature rise of a cable's hot conductor above the ambient air.

    Parameters
    ----------
    thermal : CableThermal
        The cable's build.
    heat_w_per_m : array_like
        Heat of the whole cable per metre (both conductors and the dielectric) [W/m].
    dielectric_share : array_like
        The dielectric's share of that heat, in [0, 1] [1].

    Returns
    -------
    ndarray
        dtheta = W_c T1 + (1/2) W_d T1 + W T3 + dtheta_s(W) [K], per conductor of a balanced line
        with W split between its wires.

    References
    ----------
    IEC 60287-1-1, section 1.4.1.1 (the permissible current from the conductor temperature rise
    through the insulation, sheath and covering, and the surroundings) and IEC 60287-2-1,
    sections 4.1 and 4.2.1 (the thermal resistances) (from memory).
    """
    per_cable = np.asarray(heat_w_per_m, dtype=float) / thermal.conductors
    return (per_cable * _linear_path_k_m_per_w(thermal, dielectric_share)
            + surface_rise_k(per_cable, thermal.surface_diameter_m))


def allowed_heat_w_per_m(thermal: CableThermal, dielectric_share, ambient_c=AMBIENT_C):
    """The heat per metre at which the hot conductor reaches the insulation's temperature limit.

    Parameters
    ----------
    thermal : CableThermal
        The cable's build.
    dielectric_share : array_like
        The dielectric's share of the heat, in [0, 1] (per frequency) [1].
    ambient_c : float
        Ambient air temperature [degC]; `AMBIENT_C` by default (the usual ambient of ratings),
        below ``thermal.max_temperature_c``.

    Returns
    -------
    ndarray
        W [W/m], the heat of the whole cable per metre, with the shape of ``dielectric_share``.

    Notes
    -----
    With s the surface rise, W = n pi De h s^(5/4) for n cables in air, and the conductor's rise
    is s + (W/n) a with a the layers' resistance (`conductor_rise_k`): s + a pi De h s^(5/4) = dT
    rises with s, so its root in [0, dT] is found by bisection (`_BISECTIONS` halvings, to
    rounding), over every frequency at once.

    References
    ----------
    IEC 60287-1-1, section 1.4.1.1, and IEC 60287-2-1, sections 4.1 and 4.2.1 (from memory).
    """
    rise = thermal.max_temperature_c - ambient_c
    if not rise > 0:
        raise ValueError(f"ambient {ambient_c} degC is not below the limit {thermal.max_temperature_c} degC")
    share = np.asarray(dielectric_share, dtype=float)
    d = thermal.surface_diameter_m
    surface = np.pi * d * free_air_coefficient(d)  # W/m per K^(5/4), one cable
    layers = _linear_path_k_m_per_w(thermal, share)
    low, high = np.zeros(share.shape), np.full(share.shape, rise)
    for _ in range(_BISECTIONS):
        middle = (low + high) / 2
        over = middle + layers * surface * middle ** 1.25 > rise
        high, low = np.where(over, middle, high), np.where(over, low, middle)
    return thermal.conductors * surface * low ** 1.25
