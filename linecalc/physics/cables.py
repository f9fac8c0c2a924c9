"""Physics of cables: attenuation fit, geometry models, per-metre constants (RLGC) and line constants.

Pure functions over numpy arrays in SI units. A cable is reduced to its per-metre resistance R',
inductance L', conductance G' and capacitance C' at each frequency; from those, the complex
characteristic impedance and propagation constant follow (`line_constants`).
"""
from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np

from linecalc.physics.cable_heating import CableThermal, allowed_heat_w_per_m

MU_0 = 4e-7 * np.pi  # H/m (the exact pre-2019 value; the 2019 SI value differs by 1e-10)
EPSILON_0 = 8.8541878128e-12  # F/m, CODATA 2018
SPEED_OF_LIGHT = 299_792_458.0  # m/s, exact

# Conductivities at 20 degC [S/m]; source: CRC Handbook of Chemistry and Physics, table of
# electrical resistivity of pure metals (copper 1.72e-8, aluminium 2.65e-8 ohm m), and
# IACS definition for annealed copper (58.0 MS/m). Copper-clad steel: the value is that of its
# copper cladding; a conductor of it is modelled by its cladding and steel core where its
# composite conductivity is known (`clad_surface_impedance_ohm`, `cladding_thickness_m`).
CONDUCTIVITY_S_PER_M = {
    "copper": 5.80e7,
    "copper-clad steel": 5.80e7,
    "copper-clad aluminium": 5.80e7,
    "aluminium": 3.77e7,
    "silver-plated copper": 6.17e7,
}


# The steel core of copper-clad steel wire: conductivity about 12 % IACS and a small-signal
# relative permeability of about 100 at HF (low-carbon steel; both from memory, and the
# permeability is uncertain by a factor of two or more: it falls with frequency and level).
STEEL_CORE_CONDUCTIVITY_S_PER_M = 7.0e6
STEEL_CORE_RELATIVE_PERMEABILITY = 100.0
IACS_S_PER_M = 5.80e7  # 100 % IACS: annealed copper (IEC 60028)


def cladding_thickness_m(diameter_m, composite_conductivity_s_per_m, cladding_conductivity_s_per_m=5.80e7,
                         core_conductivity_s_per_m=STEEL_CORE_CONDUCTIVITY_S_PER_M):
    """Cladding thickness of a clad round wire from its composite (dc) conductivity.

    Parameters
    ----------
    diameter_m : float
        Wire diameter [m].
    composite_conductivity_s_per_m : float
        Dc conductivity of the whole wire [S/m] (a grade of 40 % IACS is 0.40 * 58.0 MS/m), between
        those of the core and the cladding.
    cladding_conductivity_s_per_m, core_conductivity_s_per_m : float
        Conductivity of the cladding and of the core [S/m].

    Returns
    -------
    float
        t = a (1 - sqrt(1 - x)) with a the radius and x = (sigma - sigma_core)/(sigma_clad -
        sigma_core) the cladding's share of the cross-section: at dc the two metals carry current
        in parallel, so the composite conductivity is the area-weighted mean [m].

    References
    ----------
    IEC 60028, International standard of resistance for copper (the IACS, 58.0 MS/m); parallel
    conductors at dc: Ramo, Whinnery and Van Duzer, 3rd ed., section 5.6 (from memory of its
    discussion of plated and clad conductors).
    """
    share = ((composite_conductivity_s_per_m - core_conductivity_s_per_m)
             / (cladding_conductivity_s_per_m - core_conductivity_s_per_m))
    radius = diameter_m / 2
    return radius * (1 - np.sqrt(1 - share))


def clad_surface_impedance_ohm(frequency_hz, cladding_conductivity_s_per_m, cladding_thickness_m,
                               core_conductivity_s_per_m, core_relative_permeability):
    """Surface impedance of a conductor clad with a layer of another metal (plane-layer form).

    Parameters
    ----------
    frequency_hz : array_like
        Frequency [Hz].
    cladding_conductivity_s_per_m : float
        Conductivity of the cladding [S/m] (its permeability is mu0).
    cladding_thickness_m : float
        Thickness of the cladding [m].
    core_conductivity_s_per_m, core_relative_permeability : float
        Conductivity [S/m] and relative permeability [1] of the core beneath.

    Returns
    -------
    ndarray of complex
        Zs = eta_c (eta_s + eta_c tanh(k_c t)) / (eta_c + eta_s tanh(k_c t)) [ohm], with
        eta = sqrt(j omega mu / sigma) the intrinsic impedance of each metal and
        k_c = sqrt(j omega mu0 sigma_c) the cladding's propagation constant. A thick cladding gives
        the cladding's own (1 + j) Rs; once the skin depth reaches the core, the core's larger
        impedance shows through. Its real part times k/(pi d) is the skin-term resistance per metre
        of a round wire, its imaginary part the internal reactance.

    Notes
    -----
    The plane-layer form neglects the curvature of the wire; against the exact two-layer Bessel
    solution of a 1 mm copper-clad steel wire it is within 1 % from 0.5 MHz up, once the copper
    curvature term of `coax_rlgc` is added (tests/physics/test_cables.py).

    References
    ----------
    Ramo, Whinnery and Van Duzer, Fields and Waves in Communication Electronics, 3rd ed., sections
    5.6 and 6.4 (internal impedance; plane waves normal to layered media, by the transmission-line
    analogy), from memory of the sections; Pozar, Microwave Engineering, 4th ed., eq. (2.44) (the
    input impedance of a loaded line, here of the cladding layer) and section 1.7 (good conductors).
    """
    omega = 2 * np.pi * np.asarray(frequency_hz, dtype=float)
    eta_clad = np.sqrt(1j * omega * MU_0 / cladding_conductivity_s_per_m)
    eta_core = np.sqrt(1j * omega * MU_0 * core_relative_permeability / core_conductivity_s_per_m)
    t = np.tanh(np.sqrt(1j * omega * MU_0 * cladding_conductivity_s_per_m) * cladding_thickness_m)
    return eta_clad * (eta_core + eta_clad * t) / (eta_clad + eta_core * t)


def surface_resistance_ohm(frequency_hz, conductivity_s_per_m, relative_permeability=1.0):
    """Surface resistance of a good conductor in the skin-effect regime.

    Parameters
    ----------
    frequency_hz : array_like
        Frequency [Hz].
    conductivity_s_per_m : float
        Conductivity [S/m].
    relative_permeability : float
        Relative permeability of the conductor [1].

    Returns
    -------
    ndarray
        Surface resistance Rs = sqrt(pi f mu / sigma) [ohm].

    References
    ----------
    Pozar, Microwave Engineering, 4th ed., section 1.7 (good conductors, surface resistance).
    """
    frequency_hz = np.asarray(frequency_hz, dtype=float)
    return np.sqrt(np.pi * frequency_hz * MU_0 * relative_permeability / conductivity_s_per_m)


@dataclass(frozen=True)
class Rlgc:
    """Per-metre line constants at each frequency: R' [ohm/m], L' [H/m], G' [S/m], C' [F/m]."""

    r_ohm_per_m: np.ndarray
    l_h_per_m: np.ndarray
    g_s_per_m: np.ndarray
    c_f_per_m: np.ndarray


def coax_rlgc(frequency_hz, inner_diameter_m, dielectric_diameter_m, relative_permittivity,
              loss_tangent, inner_conductivity_s_per_m, outer_conductivity_s_per_m,
              inner_factor=1.0, outer_factor=1.0, inner_cladding_m=None) -> Rlgc:
    """Per-metre constants of a coaxial line from its geometry, in the skin-effect regime.

    Parameters
    ----------
    frequency_hz : array_like
        Frequency [Hz].
    inner_diameter_m : float
        Diameter of the inner conductor, d [m].
    dielectric_diameter_m : float
        Diameter over the dielectric (inside of the outer conductor), D [m].
    relative_permittivity : float
        Relative permittivity of the dielectric [1].
    loss_tangent : float
        Loss tangent of the dielectric [1].
    inner_conductivity_s_per_m, outer_conductivity_s_per_m : float
        Conductivity of each conductor [S/m].
    inner_factor, outer_factor : float
        Resistance of the real conductor over a smooth solid one (stranding, braid) [1].
    inner_cladding_m : float or None
        For a copper-clad steel inner: the thickness of its cladding [m], of conductivity
        ``inner_conductivity_s_per_m``, over a steel core (`STEEL_CORE_CONDUCTIVITY_S_PER_M`,
        `STEEL_CORE_RELATIVE_PERMEABILITY`); the inner's skin term and internal reactance then come
        from `clad_surface_impedance_ohm`. None: a solid conductor.

    Returns
    -------
    Rlgc
        R' = R_s' + k_i/(sigma_i pi d^2) - k_o/(sigma_o pi D^2) with the skin term
        R_s' = Rs_i k_i/(pi d) + Rs_o k_o/(pi D); L' = mu0/(2 pi) ln(D/d) + R_s'/omega (the
        internal reactance of a skin-effect conductor equals its skin-term resistance);
        C' = 2 pi eps0 eps_r / ln(D/d); G' = omega C' tan(delta).

    Notes
    -----
    The two curvature terms are the first-order corrections in skin depth over radius of the exact
    (Bessel-function) internal impedance: I0(z)/I1(z) ~ 1 + 1/(2z) for the solid inner rod adds a
    quarter of its dc resistance; K0(z)/K1(z) ~ 1 - 1/(2z) for the inside of a thick outer tube
    subtracts the same form. Without them the loss of a 0.9 mm inner conductor reads 5 % low at
    1 MHz. The remaining error is of second order, below 1 % once the inner radius exceeds about
    four skin depths (0.5 mm in copper at 1 MHz).

    References
    ----------
    Pozar, Microwave Engineering, 4th ed., section 2.1, Table 2.1 (coaxial line parameters);
    Ramo, Whinnery and Van Duzer, Fields and Waves in Communication Electronics, 3rd ed.,
    section 5.6 (internal impedance of a conductor in the skin-effect regime); Schelkunoff, "The
    electromagnetic theory of coaxial transmission lines and cylindrical shields", Bell Syst. Tech.
    J. 13 (1934) 532-579 (exact internal impedances); Abramowitz and Stegun, Handbook of
    Mathematical Functions, 9.7.1 and 9.7.2 (large-argument expansions of I_n and K_n).
    """
    frequency_hz = np.asarray(frequency_hz, dtype=float)
    omega = 2 * np.pi * frequency_hz
    log_ratio = np.log(dielectric_diameter_m / inner_diameter_m)
    if inner_cladding_m is None:
        z_inner = (1 + 1j) * surface_resistance_ohm(frequency_hz, inner_conductivity_s_per_m)
    else:
        z_inner = clad_surface_impedance_ohm(frequency_hz, inner_conductivity_s_per_m, inner_cladding_m,
                                             STEEL_CORE_CONDUCTIVITY_S_PER_M, STEEL_CORE_RELATIVE_PERMEABILITY)
    z_skin = (z_inner * inner_factor / (np.pi * inner_diameter_m)
              + (1 + 1j) * surface_resistance_ohm(frequency_hz, outer_conductivity_s_per_m) * outer_factor
              / (np.pi * dielectric_diameter_m))
    r_curvature = (inner_factor / (inner_conductivity_s_per_m * np.pi * inner_diameter_m ** 2)
                   - outer_factor / (outer_conductivity_s_per_m * np.pi * dielectric_diameter_m ** 2))
    l_ext = MU_0 / (2 * np.pi) * log_ratio
    c = 2 * np.pi * EPSILON_0 * relative_permittivity / log_ratio
    return Rlgc(z_skin.real + r_curvature, l_ext + z_skin.imag / omega, omega * c * loss_tangent,
                np.broadcast_to(c, frequency_hz.shape))


def two_wire_rlgc(frequency_hz, wire_diameter_m, spacing_m, relative_permittivity, loss_tangent,
                  conductivity_s_per_m, conductor_factor=1.0) -> Rlgc:
    """Per-metre constants of a parallel two-wire line from its geometry, in the skin-effect regime.

    Parameters
    ----------
    frequency_hz : array_like
        Frequency [Hz].
    wire_diameter_m : float
        Diameter of each wire, d [m].
    spacing_m : float
        Centre-to-centre spacing, D [m]; must exceed d.
    relative_permittivity : float
        Effective relative permittivity around the wires, 1/VF^2 [1].
    loss_tangent : float
        Effective loss tangent of that dielectric [1].
    conductivity_s_per_m : float
        Conductivity of the wires [S/m].
    conductor_factor : float
        Resistance of the real wire over a smooth solid one (stranding) [1].

    Returns
    -------
    Rlgc
        With x = D/d: R' = R_s' + 2 k/(sigma pi d^2) with the skin term
        R_s' = 2 Rs k/(pi d) * x/sqrt(x^2 - 1) (both wires, with the proximity effect of the
        exact two-cylinder current distribution); L' = (mu0/pi) acosh(x) + R_s'/omega;
        C' = pi eps0 eps_r / acosh(x); G' = omega C' tan(delta).

    Notes
    -----
    The term 2 k/(sigma pi d^2) is a quarter of the dc resistance of each wire: the first-order
    correction in skin depth over radius of the exact internal impedance of a round wire,
    I0(z)/I1(z) ~ 1 + 1/(2z) (see `coax_rlgc`). It matters at the low end of HF for thin wires.

    References
    ----------
    Pozar, Microwave Engineering, 4th ed., section 2.1, Table 2.1 (two-wire line parameters);
    Ramo, Whinnery and Van Duzer, Fields and Waves in Communication Electronics, 3rd ed.,
    problem on the parallel-wire line (proximity factor x/sqrt(x^2-1)), from memory.
    """
    frequency_hz = np.asarray(frequency_hz, dtype=float)
    omega = 2 * np.pi * frequency_hz
    x = spacing_m / wire_diameter_m
    arc = np.arccosh(x)
    proximity = x / np.sqrt(x * x - 1.0)
    r_skin = 2 * surface_resistance_ohm(frequency_hz, conductivity_s_per_m) * conductor_factor / (np.pi * wire_diameter_m) * proximity
    r_curvature = 2 * conductor_factor / (conductivity_s_per_m * np.pi * wire_diameter_m ** 2)
    l_ext = MU_0 / np.pi * arc
    c = np.pi * EPSILON_0 * relative_permittivity / arc
    return Rlgc(r_skin + r_curvature, l_ext + r_skin / omega, omega * c * loss_tangent,
                np.broadcast_to(c, frequency_hz.shape))


def rlgc_for_attenuation(frequency_hz, z0_nominal_ohm, velocity_factor, alpha_conductor_np_per_m,
                         alpha_dielectric_np_per_m) -> Rlgc:
    """Per-metre constants of a line whose exact matched attenuation is a given conductor plus dielectric term.

    Parameters
    ----------
    frequency_hz : array_like
        Frequency [Hz], positive.
    z0_nominal_ohm : float
        Nominal (high-frequency, lossless) characteristic impedance [ohm].
    velocity_factor : float
        Velocity factor [1].
    alpha_conductor_np_per_m, alpha_dielectric_np_per_m : array_like
        The two parts of the matched attenuation at each frequency [Np/m], non-negative.

    Returns
    -------
    Rlgc
        L' = Z0/(VF c) + R'/omega (the external inductance, and the internal inductance of a
        skin-effect conductor, whose internal reactance equals its resistance), C' = 1/(Z0 VF c),
        G' = 2 a_d / Z0 (the low-loss relation for the dielectric term), and R' solved so that the
        exact Re(gamma) = Re(sqrt((R' + j omega L')(G' + j omega C'))) equals a_c + a_d.

    Notes
    -----
    With Y = G' + jB (B = omega C'), X = omega Z0/(VF c) and gamma = alpha + j beta, the series
    impedance Z = gamma^2 / Y must have the form R' + j(X + R'), so Im Z - Re Z = X. Written out,
    this is a quadratic in beta, (B + G') beta^2 + 2 alpha (G' - B) beta - (B + G') alpha^2 - X |Y|^2 = 0,
    whose positive root gives beta and then R' = Re(gamma^2 / Y) in closed form. R' is never
    negative: G' alone gives an exact attenuation of at most a_d. The low-loss relation
    R' = 2 Z0 a_c instead reads low by about the internal-inductance term (1.6 % for a 50-ohm
    coax at 4 MHz, far more for a lossy low-impedance line), which this solution removes.

    References
    ----------
    Pozar, Microwave Engineering, 4th ed., sections 2.1 (gamma from R', L', G', C') and 2.7 (the
    low-loss line, attenuation terms); Ramo, Whinnery and Van Duzer, Fields and Waves in
    Communication Electronics, 3rd ed., section 5.6 (internal impedance).
    """
    frequency_hz = np.asarray(frequency_hz, dtype=float)
    omega = 2 * np.pi * frequency_hz
    velocity = velocity_factor * SPEED_OF_LIGHT
    alpha = np.asarray(alpha_conductor_np_per_m, dtype=float) + np.asarray(alpha_dielectric_np_per_m, dtype=float)
    g = 2 * np.asarray(alpha_dielectric_np_per_m, dtype=float) / z0_nominal_ohm * np.ones_like(frequency_hz)
    c = 1.0 / (z0_nominal_ohm * velocity)
    l_ext = z0_nominal_ohm / velocity
    b, x = omega * c, omega * l_ext
    y2 = g * g + b * b
    beta = (alpha * (b - g) + np.sqrt(alpha ** 2 * (b - g) ** 2 + (b + g) * ((b + g) * alpha ** 2 + x * y2))) / (b + g)
    r = ((alpha ** 2 - beta ** 2) * g + 2 * alpha * beta * b) / y2
    return Rlgc(r, l_ext + r / omega, g, np.broadcast_to(c, frequency_hz.shape))


def fitted_rlgc(frequency_hz, z0_nominal_ohm, velocity_factor, k_conductor, k_dielectric) -> Rlgc:
    """Per-metre constants from a nominal impedance, velocity factor and fitted attenuation terms.

    Parameters
    ----------
    frequency_hz : array_like
        Frequency [Hz].
    z0_nominal_ohm : float
        Nominal (high-frequency, lossless) characteristic impedance [ohm].
    velocity_factor : float
        Velocity factor [1].
    k_conductor : float
        Conductor term of the matched attenuation, a_c = k_conductor * sqrt(f) [Np/m/sqrt(Hz)].
    k_dielectric : float
        Dielectric term of the matched attenuation, a_d = k_dielectric * f [Np/m/Hz].

    Returns
    -------
    Rlgc
        The constants of `rlgc_for_attenuation` for a_c + a_d: the exact matched attenuation
        Re(gamma), internal inductance included, equals the fitted k_c sqrt(f) + k_d f.

    References
    ----------
    Pozar, Microwave Engineering, 4th ed., section 2.7 (the low-loss line, attenuation terms);
    Ramo, Whinnery and Van Duzer, 3rd ed., section 5.6 (internal impedance).
    """
    frequency_hz = np.asarray(frequency_hz, dtype=float)
    return rlgc_for_attenuation(frequency_hz, z0_nominal_ohm, velocity_factor, k_conductor * np.sqrt(frequency_hz),
                                k_dielectric * frequency_hz)


def line_constants(frequency_hz, rlgc: Rlgc):
    """Complex characteristic impedance and propagation constant from per-metre constants.

    Parameters
    ----------
    frequency_hz : array_like
        Frequency [Hz].
    rlgc : Rlgc
        Per-metre constants at the same frequencies.

    Returns
    -------
    z0_ohm : ndarray of complex
        Z0 = sqrt((R' + j omega L') / (G' + j omega C')) [ohm].
    gamma : ndarray of complex
        gamma = sqrt((R' + j omega L')(G' + j omega C')) = alpha + j beta [1/m].

    References
    ----------
    Pozar, Microwave Engineering, 4th ed., section 2.1, equations (2.5) and (2.7).
    """
    omega = 2 * np.pi * np.asarray(frequency_hz, dtype=float)
    z = rlgc.r_ohm_per_m + 1j * omega * rlgc.l_h_per_m
    y = rlgc.g_s_per_m + 1j * omega * rlgc.c_f_per_m
    # principal square roots: with R', G' >= 0 both results lie in the right half-plane
    return np.sqrt(z / y), np.sqrt(z * y)


def fit_attenuation(frequency_hz, attenuation_np_per_m):
    """Fit a(f) = k_c sqrt(f) + k_d f, both terms non-negative, to matched-attenuation points.

    The fit minimises the relative error (each point weighted by 1/a), so that the few-tenths-dB
    figures at HF count as much as the large ones at UHF.

    Parameters
    ----------
    frequency_hz : array_like
        Frequencies of the points [Hz], positive.
    attenuation_np_per_m : array_like
        Matched attenuation at those frequencies [Np/m], positive.

    Returns
    -------
    k_conductor : float
        [Np/m/sqrt(Hz)]
    k_dielectric : float
        [Np/m/Hz]

    References
    ----------
    Pozar, Microwave Engineering, 4th ed., section 2.7: conductor loss grows as the surface
    resistance (sqrt f), dielectric loss as omega tan(delta) (f). Non-negative least squares:
    Lawson and Hanson, Solving Least Squares Problems (1974), chapter 23 (the result equals
    scipy.optimize.nnls, which the tests check; numpy alone keeps the start-up light).
    """
    f = np.asarray(frequency_hz, dtype=float)
    a = np.asarray(attenuation_np_per_m, dtype=float)
    design = np.column_stack([np.sqrt(f), f]) / a[:, None]
    target = np.ones_like(a)
    # Two unknowns: the non-negative optimum is the free least-squares solution when both terms
    # come out non-negative, otherwise the better of the two one-term fits (the active-set
    # method of Lawson and Hanson reduces to this for two variables).
    both, *_ = np.linalg.lstsq(design, target, rcond=None)
    if np.all(both >= 0):
        return float(both[0]), float(both[1])
    candidates = []
    for column in (0, 1):
        x = design[:, column]
        k = max(float(x @ target / (x @ x)), 0.0)
        candidates.append((float(np.sum((x * k - target) ** 2)), column, k))
    _, column, k = min(candidates)
    return (k, 0.0) if column == 0 else (0.0, k)


@dataclass(frozen=True)
class Cable:
    """A cable reduced to what the line model needs, with where its data are valid.

    ``rlgc_model`` is ``"fit"`` (nominal Z0 and VF with the fitted attenuation terms),
    ``"coax"`` or ``"two-wire"`` (geometry; parameters in ``geometry``).
    """

    id: str
    description: str
    kind: str  # "coax" or "balanced"
    z0_nominal_ohm: float
    velocity_factor: float
    k_conductor: float = 0.0
    k_dielectric: float = 0.0
    data_range_hz: tuple[float, float] = (0.0, np.inf)
    max_voltage_v: float | None = None
    max_power_w: float | None = None  # matched average power rating, where the user knows one
    rlgc_model: str = "fit"
    thermal: CableThermal | None = None  # the thermal build of a library cable, for its rating
    geometry: dict = field(default_factory=dict, compare=False, hash=False)

    def rlgc(self, frequency_hz) -> Rlgc:
        """Per-metre constants at ``frequency_hz`` [Hz]."""
        if self.rlgc_model == "coax":
            return coax_rlgc(frequency_hz, **self.geometry)
        if self.rlgc_model == "two-wire":
            return two_wire_rlgc(frequency_hz, **self.geometry)
        return fitted_rlgc(frequency_hz, self.z0_nominal_ohm, self.velocity_factor,
                           self.k_conductor, self.k_dielectric)

    def constants(self, frequency_hz):
        """Characteristic impedance [ohm] and propagation constant [1/m] at ``frequency_hz``."""
        return line_constants(frequency_hz, self.rlgc(frequency_hz))

    def matched_loss_db_per_m(self, frequency_hz):
        """Matched attenuation [dB/m]: 20 log10(e) Re(gamma)."""
        _, gamma = self.constants(frequency_hz)
        return 20 * np.log10(np.e) * gamma.real

    def power_rating_w(self, frequency_hz):
        """Matched average power rating [W] at ``frequency_hz`` [Hz], or None without one.

        The user's ``max_power_w`` where given (the same at every frequency); otherwise, for a
        cable with a thermal build, the power whose matched heat per metre, 2 Re(gamma) P (the
        heat R'|I|^2 + G'|V|^2 of a matched line), is the heat that takes the hot conductor to
        its insulation's limit (`cable_heating.allowed_heat_w_per_m`, at its dielectric share
        G'|Z0|^2 / (R' + G'|Z0|^2)).
        """
        f = np.asarray(frequency_hz, dtype=float)
        if self.max_power_w is not None:
            return np.full(f.shape, float(self.max_power_w))
        if self.thermal is None:
            return None
        rlgc = self.rlgc(f)
        z0, gamma = line_constants(f, rlgc)
        dielectric = rlgc.g_s_per_m * np.abs(z0) ** 2
        share = dielectric / (rlgc.r_ohm_per_m + dielectric)
        return allowed_heat_w_per_m(self.thermal, share) / (2 * gamma.real)


def cable_from_points(id, description, kind, z0_nominal_ohm, velocity_factor, frequency_hz,
                      loss_db_per_m, max_voltage_v=None, thermal=None) -> Cable:
    """Build a fitted `Cable` from matched-loss points [Hz], [dB/m] (``thermal``: its
    `CableThermal` build, for a power rating, or None)."""
    np_per_m = np.asarray(loss_db_per_m, dtype=float) / (20 * np.log10(np.e))
    k_c, k_d = fit_attenuation(frequency_hz, np_per_m)
    f = np.asarray(frequency_hz, dtype=float)
    return Cable(id=id, description=description, kind=kind, z0_nominal_ohm=z0_nominal_ohm,
                 velocity_factor=velocity_factor, k_conductor=k_c, k_dielectric=k_d,
                 data_range_hz=(float(f.min()), float(f.max())), max_voltage_v=max_voltage_v, thermal=thermal)


def coax_from_geometry(id, description, inner_diameter_m, dielectric_diameter_m, relative_permittivity,
                       loss_tangent, inner_material="copper", outer_material="copper",
                       inner_factor=1.0, outer_factor=1.0, max_voltage_v=None, inner_cladding_m=None) -> Cable:
    """Build a geometry `Cable` for a coax; nominal Z0 = 60/sqrt(eps_r) ln(D/d), VF = 1/sqrt(eps_r).
    ``inner_cladding_m``: the copper cladding of a copper-clad steel inner (see `coax_rlgc`).

    References
    ----------
    Pozar, Microwave Engineering, 4th ed., Table 2.1 (lossless limit of the coax parameters).
    """
    geometry = dict(inner_diameter_m=inner_diameter_m, dielectric_diameter_m=dielectric_diameter_m,
                    relative_permittivity=relative_permittivity, loss_tangent=loss_tangent,
                    inner_conductivity_s_per_m=CONDUCTIVITY_S_PER_M[inner_material],
                    outer_conductivity_s_per_m=CONDUCTIVITY_S_PER_M[outer_material],
                    inner_factor=inner_factor, outer_factor=outer_factor, inner_cladding_m=inner_cladding_m)
    eta0 = np.sqrt(MU_0 / EPSILON_0)
    z0 = eta0 / (2 * np.pi * np.sqrt(relative_permittivity)) * np.log(dielectric_diameter_m / inner_diameter_m)
    return Cable(id=id, description=description, kind="coax", z0_nominal_ohm=float(z0),
                 velocity_factor=float(1 / np.sqrt(relative_permittivity)), max_voltage_v=max_voltage_v,
                 rlgc_model="coax", geometry=geometry)


def two_wire_from_geometry(id, description, wire_diameter_m, spacing_m, relative_permittivity=1.0,
                           loss_tangent=0.0, material="copper", conductor_factor=1.0,
                           max_voltage_v=None) -> Cable:
    """Build a geometry `Cable` for a two-wire line; nominal Z0 = (eta0/pi)/sqrt(eps_r) acosh(D/d).

    References
    ----------
    Pozar, Microwave Engineering, 4th ed., Table 2.1; the trade form 120/sqrt(eps_r) acosh(D/d)
    (ARRL Antenna Book, transmission-line chapter).
    """
    geometry = dict(wire_diameter_m=wire_diameter_m, spacing_m=spacing_m,
                    relative_permittivity=relative_permittivity, loss_tangent=loss_tangent,
                    conductivity_s_per_m=CONDUCTIVITY_S_PER_M[material], conductor_factor=conductor_factor)
    eta0 = np.sqrt(MU_0 / EPSILON_0)
    z0 = eta0 / (np.pi * np.sqrt(relative_permittivity)) * np.arccosh(spacing_m / wire_diameter_m)
    return Cable(id=id, description=description, kind="balanced", z0_nominal_ohm=float(z0),
                 velocity_factor=float(1 / np.sqrt(relative_permittivity)), max_voltage_v=max_voltage_v,
                 rlgc_model="two-wire", geometry=geometry)
