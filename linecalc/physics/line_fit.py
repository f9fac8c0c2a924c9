"""A real line characterised from two sweeps at its near end, far end open and far end shorted.

Per frequency the two input impedances give the line's characteristic impedance and its
gamma·l (`open_short_constants`); the imaginary part of gamma·l, known only modulo pi, is unwrapped
along the sweep and its whole number of half turns fixed where it extrapolates to zero at zero
frequency (`electrical_phase_rad`). The line model of the cable library (a nominal impedance, a
delay, and an attenuation k1·sqrt(f) + k2·f, `linecalc.physics.cables.fitted_rlgc`) is then fitted
to both sweeps by least squares in the reflection coefficient, where an instrument's error lives
(`fit_open_short`), with a covariance from the Jacobian scaled by the residual variance.

Pure functions over numpy arrays in SI units (Hz, ohm, s, Np); scipy for the least squares.
"""
from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from linecalc.errors import InputError
from linecalc.physics.cables import SPEED_OF_LIGHT, fitted_rlgc, line_constants

DB_PER_NEPER = 20 * np.log10(np.e)
# The fit has 4 parameters; each point gives 4 real residuals (open and short, real and
# imaginary), so 5 points leave 16 residual degrees of freedom for the variance.
MIN_POINTS = 5
# Unwrapping along the sweep fails once the electrical phase moves by pi/2 between points; a
# median step above half of that leaves no margin for noise, and the sweep is refused as too sparse.
MAX_PHASE_STEP_RAD = np.pi / 4
# The phase extrapolated to zero frequency sits on a whole number of half turns (pi) for a real
# line (up to a fraction of a radian from the conductor loss's sqrt(f) term); farther than a
# quarter of a half turn from one, the two sweeps are not an open and a short of one line.
MAX_INTERCEPT_RAD = np.pi / 4
# A fitted branch (whole number of half turns) is accepted only where the next best fits with at
# least this many times its sum of squares (twice its RMS residual); otherwise the sweep cannot
# tell the line's length apart from one a half wavelength longer or shorter.
BRANCH_MARGIN = 4.0
# Two-sided confidence of every interval reported, with the Student t quantile of the residual
# degrees of freedom.
CONFIDENCE = 0.95


class SweepFitError(InputError):
    """Open and short sweeps that cannot characterise a line (the message says why)."""


@dataclass(frozen=True)
class OpenShortSweeps:
    """The two sweeps of a line's near end, on one frequency grid.

    ``velocity_factor``: given, the fit reports the physical length from it; None, the fit
    reports the velocity factor from the line's length. ``key`` and ``line`` locate the
    ``sweeps:`` key in the station file.
    """

    frequency_hz: np.ndarray
    z_open_ohm: np.ndarray
    z_short_ohm: np.ndarray
    open_source: str
    short_source: str
    velocity_factor: float | None = None
    key: str = ""
    line: int = 1


def open_short_constants(z_open_ohm, z_short_ohm):
    """Characteristic impedance and gamma·l of a line from its open- and short-circuit input impedances.

    Parameters
    ----------
    z_open_ohm, z_short_ohm : array_like of complex, shape (nf,)
        Input impedance with the far end open, and shorted [ohm]; finite.

    Returns
    -------
    z0_ohm : ndarray of complex
        Z0 = sqrt(Z_open Z_short), the root of positive real part (a passive line's).
    gamma_l : ndarray of complex
        atanh(Z_short / Z0), with tanh(gamma l) = sqrt(Z_short / Z_open) on the same branch as Z0:
        its real part is the matched attenuation alpha·l [Np], its imaginary part beta·l modulo pi,
        in (-pi/2, pi/2] [rad].

    Raises
    ------
    SweepFitError
        Where Z0 is zero or tanh(gamma l) is +-1 (the two sweeps read alike there: no line).

    References
    ----------
    Pozar, Microwave Engineering, 4th ed., section 2.3 (Z_in of a shorted line Z0 tanh(gamma l),
    of an open line Z0 coth(gamma l)); the open/short method is the one of its problems on
    section 2.3 (from memory of the problem's number).
    """
    z_open = np.asarray(z_open_ohm, dtype=complex)
    z_short = np.asarray(z_short_ohm, dtype=complex)
    z0 = np.sqrt(z_open * z_short)  # numpy's principal root has Re >= 0
    bad = (z0 == 0) | (z_short == z0) | (z_short == -z0)
    if np.any(bad):
        raise SweepFitError(f"the open and short sweeps read alike (or a short of 0 ohm) at {int(bad.sum())} "
                            "point(s): they do not describe a line there")
    t = z_short / z0
    return z0, 0.5 * np.log((1 + t) / (1 - t))


def electrical_phase_rad(frequency_hz, wrapped_rad):
    """beta·l along the sweep from its values modulo pi: unwrapped, then set on its whole number of half turns.

    Parameters
    ----------
    frequency_hz : ndarray, shape (nf,)
        Increasing frequencies [Hz].
    wrapped_rad : ndarray, shape (nf,)
        beta·l modulo pi [rad] (`open_short_constants`).

    Returns
    -------
    phase_rad : ndarray, shape (nf,)
        beta·l [rad], continuous along the sweep, with the multiple of pi chosen so that a
        straight line through it meets zero at zero frequency as nearly as it can.
    intercept_rad : float
        Where that straight line meets zero frequency after the choice [rad]: a fraction of a
        radian for a real line (the conductor loss's internal inductance adds a sqrt(f) part).

    Raises
    ------
    SweepFitError
        Points too far apart to unwrap (median step over `MAX_PHASE_STEP_RAD`), a phase that
        falls with frequency, or an intercept farther than `MAX_INTERCEPT_RAD` from a whole
        number of half turns (the open and the short swapped, or not of one line).

    References
    ----------
    beta = omega / v_p, so beta·l = 2 pi f tau through the origin (Pozar, Microwave Engineering,
    4th ed., section 2.1); phase unwrapping with a period of pi, as numpy.unwrap does for 2 pi.
    """
    f = np.asarray(frequency_hz, dtype=float)
    phase = np.unwrap(2 * np.asarray(wrapped_rad, dtype=float)) / 2
    steps = np.diff(phase)
    if np.median(np.abs(steps)) > MAX_PHASE_STEP_RAD:
        raise SweepFitError(f"the points are too far apart: the line's electrical length moves by "
                            f"{np.degrees(np.median(np.abs(steps))):.0f} degrees between points, and at "
                            f"{np.degrees(MAX_PHASE_STEP_RAD):.0f} or more its half turns cannot be followed; "
                            "sweep with more points")
    slope, intercept = np.polyfit(f, phase, 1)
    if not slope > 0:
        raise SweepFitError("the line's electrical length falls with frequency: is the sweep's phase "
                            "convention reversed (S conjugated)?")
    half_turns = np.round(-intercept / np.pi)
    phase = phase + half_turns * np.pi
    intercept = intercept + half_turns * np.pi
    if abs(intercept) > MAX_INTERCEPT_RAD:
        raise SweepFitError(f"the two sweeps are not an open and a short of one line: their electrical length "
                            f"meets zero frequency {np.degrees(intercept):.0f} degrees away from a whole number of "
                            "half turns (90 degrees when the open and the short are swapped); check which file is "
                            "which, and that the far end was open, then shorted")
    return phase, float(intercept)


def model_reflections(params, frequency_hz, centre_hz, z_ref_ohm):
    """Reflection coefficients of the model line at its near end, far end open and shorted.

    Parameters
    ----------
    params : array_like, shape (4,)
        Nominal impedance [ohm]; delay in cycles at ``centre_hz`` (tau·f_c); conductor and
        dielectric attenuation of the whole line at ``centre_hz`` [Np] (k1·l·sqrt(f_c), k2·l·f_c).
    frequency_hz : ndarray, shape (nf,)
    centre_hz : float
        The frequency the parameters are scaled to [Hz].
    z_ref_ohm : float
        The instrument's reference resistance [ohm].

    Returns
    -------
    rho_open, rho_short : ndarray of complex, shape (nf,)
        (Z - R)/(Z + R) for Z = Z0 coth(gamma l) and Z0 tanh(gamma l), written with tanh only so
        that an open's infinite impedance never appears.

    References
    ----------
    Pozar, Microwave Engineering, 4th ed., section 2.3; the line constants of
    `linecalc.physics.cables.fitted_rlgc` for a line of one metre with the same delay.
    """
    z0n, cycles, a_c, a_d = (float(p) for p in params)
    tau_s = cycles / centre_hz
    # a 1 m line with the fitted delay and attenuation has the line's gamma·l and Z0
    rlgc = fitted_rlgc(frequency_hz, z0n, 1 / (tau_s * SPEED_OF_LIGHT), a_c / np.sqrt(centre_hz), a_d / centre_hz)
    z0, gamma_l = line_constants(frequency_hz, rlgc)
    t = np.tanh(gamma_l)
    return (z0 - z_ref_ohm * t) / (z0 + z_ref_ohm * t), (z0 * t - z_ref_ohm) / (z0 * t + z_ref_ohm)


@dataclass(frozen=True)
class LineFit:
    """The fitted line: parameters (see `model_reflections`), their covariance, the residual.

    ``residual_rms`` and ``residual_max`` are |rho_model - rho_measured| over both sweeps;
    ``t_quantile`` the two-sided `CONFIDENCE` quantile of Student's t at ``dof`` degrees of freedom.
    """

    params: np.ndarray
    covariance: np.ndarray
    centre_hz: float
    frequency_hz: np.ndarray
    dof: int
    t_quantile: float
    residual_rms: float
    residual_max: float
    intercept_rad: float
    at_bound: tuple

    @property
    def sigma(self):
        """Standard errors of the parameters."""
        return np.sqrt(np.diag(self.covariance))

    @property
    def delay_s(self) -> float:
        """The line's one-way delay tau = l / (VF c) [s]."""
        return float(self.params[1] / self.centre_hz)

    def z0_ohm(self, frequency_hz, params=None):
        """The model's complex characteristic impedance at ``frequency_hz`` [ohm]."""
        z0n, cycles, a_c, a_d = self.params if params is None else params
        rlgc = fitted_rlgc(frequency_hz, z0n, 1 / (cycles / self.centre_hz * SPEED_OF_LIGHT),
                           a_c / np.sqrt(self.centre_hz), a_d / self.centre_hz)
        return line_constants(frequency_hz, rlgc)[0]

    def loss_db(self, frequency_hz, params=None):
        """Matched loss of the whole line [dB]: 8.686 (a_c sqrt(f/f_c) + a_d f/f_c)."""
        _, _, a_c, a_d = self.params if params is None else params
        x = np.asarray(frequency_hz, dtype=float) / self.centre_hz
        return DB_PER_NEPER * (a_c * np.sqrt(x) + a_d * x)

    def propagate(self, figure):
        """A figure of the parameters with its `CONFIDENCE` half-width, to first order.

        ``figure(params)`` returns an array; its derivatives are central differences over one
        standard error of each parameter (exact for a figure linear in them), and its variance
        g^T C g.

        References
        ----------
        JCGM 100:2008 (GUM), section 5.1.2 (the law of propagation of uncertainty).
        """
        value = np.asarray(figure(self.params), dtype=float)
        gradient = []
        for i, step in enumerate(self.sigma):
            if step == 0:
                gradient.append(np.zeros_like(value))
                continue
            up, down = self.params.copy(), self.params.copy()
            up[i] += step
            down[i] -= step
            gradient.append((np.asarray(figure(up)) - np.asarray(figure(down))) / (2 * step))
        g = np.stack(gradient, axis=-1)
        variance = np.einsum("...i,ij,...j->...", g, self.covariance, g)
        return value, self.t_quantile * np.sqrt(variance)


def _start(frequency_hz, gamma_l, phase_rad, z0_ohm, centre_hz):
    """Starting parameters from the per-frequency constants: the delay through the origin, the
    two attenuation terms by non-negative least squares, the median |Z0|."""
    from scipy.optimize import nnls

    omega = 2 * np.pi * frequency_hz
    tau = float(phase_rad @ omega / (omega @ omega))
    x = frequency_hz / centre_hz
    (a_c, a_d), _ = nnls(np.column_stack([np.sqrt(x), x]), gamma_l.real)
    return np.array([float(np.median(np.abs(z0_ohm))), tau * centre_hz, a_c, a_d])


def fit_open_short(frequency_hz, z_open_ohm, z_short_ohm, z_ref_ohm=50.0) -> LineFit:
    """Fit the cable library's line model to open- and short-circuit sweeps of a line's near end.

    Parameters
    ----------
    frequency_hz : ndarray, shape (nf,)
        Increasing frequencies [Hz], at least `MIN_POINTS`.
    z_open_ohm, z_short_ohm : ndarray of complex, shape (nf,)
        The measured input impedances, far end open and shorted [ohm], finite.
    z_ref_ohm : float
        The instrument's reference resistance [ohm]: the residual is taken in reflection
        coefficient against it.

    Returns
    -------
    LineFit
        Nominal impedance, delay and the two attenuation terms (all non-negative), fitted by
        `scipy.optimize.least_squares` from the per-frequency extraction; covariance
        s^2 (J^T J)^-1 with s^2 the residual sum of squares over its degrees of freedom. The
        whole number of half turns is tried at the extraction's choice and one either side, and
        the best kept.

    Raises
    ------
    SweepFitError
        Too few points, sweeps that are not an open and a short of one line, or a branch that
        the sweep cannot decide (`BRANCH_MARGIN`).

    References
    ----------
    Pozar, Microwave Engineering, 4th ed., section 2.3 (open and short input impedances);
    Press et al., Numerical Recipes, 3rd ed., section 15.5 (nonlinear least squares, the
    covariance from the Jacobian); SciPy's least_squares (trust region reflective, bounded).
    """
    from scipy.optimize import least_squares
    from scipy.special import stdtrit

    f = np.asarray(frequency_hz, dtype=float)
    if f.size < MIN_POINTS:
        raise SweepFitError(f"{f.size} point(s): at least {MIN_POINTS} are needed to fit the line's 4 figures "
                            "and say how sure they are")
    z_open = np.asarray(z_open_ohm, dtype=complex)
    z_short = np.asarray(z_short_ohm, dtype=complex)
    z0, gamma_l = open_short_constants(z_open, z_short)
    phase, intercept = electrical_phase_rad(f, gamma_l.imag)
    centre = float(np.sqrt(f[0] * f[-1]))
    rho_open = (z_open - z_ref_ohm) / (z_open + z_ref_ohm)
    rho_short = (z_short - z_ref_ohm) / (z_short + z_ref_ohm)

    def residuals(p):
        model_open, model_short = model_reflections(p, f, centre, z_ref_ohm)
        d = np.concatenate([model_open - rho_open, model_short - rho_short])
        return np.concatenate([d.real, d.imag])

    fits = []
    for half_turns in (0, -1, 1):
        start = _start(f, gamma_l, phase + half_turns * np.pi, z0, centre)
        if not start[1] > 0:
            continue
        start[2:] = np.maximum(start[2:], 0.0)  # nnls gives >= 0; the bound below must hold at the start
        fits.append(least_squares(residuals, start, bounds=([0, 0, 0, 0], np.inf), x_scale="jac",
                                  method="trf"))
    fits.sort(key=lambda r: r.cost)
    best = fits[0]
    distinct = [r for r in fits[1:] if abs(r.x[1] - best.x[1]) > 0.25]  # a quarter turn apart: another branch
    if distinct and distinct[0].cost < BRANCH_MARGIN * best.cost:
        raise SweepFitError("the sweep cannot tell this line's length from one half a wavelength longer or "
                            "shorter: sweep a wider span, or start it lower in frequency")
    dof = 4 * f.size - 4
    variance = 2 * best.cost / dof
    _, singular, vt = np.linalg.svd(best.jac, full_matrices=False)
    if not singular[-1] > singular[0] * np.finfo(float).eps * best.jac.shape[0]:
        raise SweepFitError("the sweeps do not determine the line's four figures (the fit's Jacobian is "
                            "singular): sweep a wider span")
    covariance = variance * (vt.T / singular ** 2) @ vt
    d = residuals(best.x)
    magnitude = np.hypot(d[: 2 * f.size], d[2 * f.size:])
    at_bound = tuple(name for name, active in zip(("impedance", "delay", "conductor loss", "dielectric loss"),
                                                  best.active_mask) if active)
    return LineFit(params=best.x, covariance=covariance, centre_hz=centre, frequency_hz=f, dof=dof,
                   t_quantile=float(stdtrit(dof, 0.5 + CONFIDENCE / 2)),
                   residual_rms=float(np.sqrt(np.mean(magnitude ** 2))), residual_max=float(magnitude.max()),
                   intercept_rad=intercept, at_bound=at_bound)
