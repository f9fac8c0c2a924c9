"""The fast twin of `linecalc.physics.matching`: least tuner loss over many loads at once,
whether an L or T network matches, and at what loss.

The designs of `linecalc.physics.matching` choose and describe a setting per load; scanning a feeder's
length needs only two answers per load, for a million loads: can the tuner match, and what is
its least loss. These functions give them with the same closed forms and the same output
capacitor grid as the full designs, in real arithmetic, without the full designs' last resort
(a search for the closest setting where nothing matches).
"""
from __future__ import annotations

import numpy as np

from linecalc.physics.lumped import capacitor_impedance_ohm, inductor_impedance_ohm
from linecalc.physics.matching import MATCHED_SWR, T_SCAN_POINTS, l_network_candidates

# Golden-section steps that refine the T network's output capacitor between grid points; 12
# steps bring the loss within 1e-3 dB of the full design's 48 (measured on random loads).
T_REFINE_ITERATIONS = 12


def _swr_at_most(z_load, r0_ohm, swr):
    """Where the SWR of ``z_load`` against ``r0_ohm`` is at most ``swr`` (|rho| <= (s-1)/(s+1))."""
    return np.abs(z_load - r0_ohm) <= (swr - 1) / (swr + 1) * np.abs(z_load + r0_ohm)


class _TLossRatio:
    """P_in / P_load of the least-loss matched T for a given output capacitor, over many loads.

    The output capacitor turns the load into z2 (admittance y2 = g - j b); the input capacitor
    and the shunt inductor are an L section (series part toward the input) in closed form with
    the losses, the quadratic that `linecalc.physics.matching` solves: Re((1 - j/Q_C) / (y2 + u k)) = R0 for
    the shunt admittance u k, k = 1/(1/Q_L + j), here in real arithmetic: a2 u^2 + a1 u + a0 = 0.
    A root counts where the inductance 1/(omega u) and the series reactance
    -Im(1/(y2 + u k)) = Im(y2 + u k) / |y2 + u k|^2 are in range. The input is then exactly R0,
    so with 1 A in the load P_in / P_load = R0 |1 + u k z2|^2 / R_load; inf where no root counts.

    Every operation writes into buffers made once per call of `t_network_least_loss` and used for
    all its evaluations: with fresh temporaries the memory allocator returned them to the system
    and faulted them in again, which took a third of the scan's time (measured).
    """

    _FLOATS = ("x", "z2r", "z2i", "m", "g", "b", "a1", "a0", "q", "pr", "pi", "p2", "u", "wr", "wi", "t")

    def __init__(self, inv_omega, r_load, x_load, r0_ohm, parts):
        n = np.shape(r_load)
        self.inv_omega, self.r_load, self.x_load, self.r0 = inv_omega, r_load, x_load, r0_ohm
        self.u_low, self.u_high = inv_omega / parts.inductance_max_h, inv_omega / parts.inductance_min_h
        self.x_low, self.x_high = -inv_omega / parts.capacitance_min_f, -inv_omega / parts.capacitance_max_f
        self.scale = r0_ohm / r_load
        self.inv_qc = 1 / parts.capacitor_q
        k = 1 / (1 / parts.inductor_q + 1j)
        self.kr, self.ki, self.a2 = k.real, k.imag, r0_ohm * abs(k) ** 2
        self.buffers = {name: np.empty(n) for name in self._FLOATS}
        self.real, self.ok, self.flag = (np.empty(n, dtype=bool) for _ in range(3))

    def __call__(self, c2_f, out):
        """Write the ratio for output capacitor ``c2_f`` [F] (scalar or per load) into ``out``."""
        x, z2r, z2i, m, g, b, a1, a0, q, pr, pi, p2, u, wr, wi, t = (self.buffers[n] for n in self._FLOATS)
        kr, ki, inv_qc, r0 = self.kr, self.ki, self.inv_qc, self.r0
        np.divide(self.inv_omega, c2_f, out=x)                                  # x_C2 = 1/(omega C2)
        np.multiply(x, inv_qc, out=z2r)
        z2r += self.r_load                                                      # Re z2 = R + x_C2/Q_C
        np.subtract(self.x_load, x, out=z2i)                                    # Im z2 = X - x_C2
        np.multiply(z2r, z2r, out=m)
        np.multiply(z2i, z2i, out=t)
        m += t
        np.reciprocal(m, out=m)                                                 # 1/|z2|^2 = |y2|^2
        np.multiply(z2r, m, out=g)
        np.multiply(z2i, m, out=b)
        np.multiply(g, 2 * r0 * kr, out=a1)                                     # a1 = 2 R0 Re(y2 k*)
        np.multiply(b, 2 * r0 * ki, out=t)                                      #      - Re(c k*)
        a1 -= t
        a1 -= kr - ki * inv_qc
        np.multiply(m, r0, out=a0)                                              # a0 = R0 |y2|^2 - Re(c y2*)
        a0 -= g
        np.multiply(b, inv_qc, out=t)
        a0 -= t
        np.multiply(a1, a1, out=q)                                              # discriminant
        np.multiply(a0, 4 * self.a2, out=t)
        q -= t
        np.greater_equal(q, 0.0, out=self.real)
        np.maximum(q, 0.0, out=q)  # where it is negative there is no real root: masked by `real`
        # the cancellation-free roots of Press et al., Numerical Recipes, 3rd ed., section 5.6
        np.sqrt(q, out=q)
        np.copysign(q, a1, out=q)
        q += a1
        q *= -0.5
        np.multiply(z2r, kr, out=pr)                                            # k z2
        np.multiply(z2i, ki, out=t)
        pr -= t
        np.multiply(z2i, kr, out=pi)
        np.multiply(z2r, ki, out=t)
        pi += t
        np.multiply(pr, pr, out=p2)
        np.multiply(pi, pi, out=t)
        p2 += t
        pr *= 2
        out.fill(np.inf)
        for root in (0, 1):
            if root == 0:
                np.multiply(q, 1 / self.a2, out=u)                              # u = q / a2
            else:
                u.fill(0.0)
                np.not_equal(q, 0.0, out=self.flag)
                np.divide(a0, q, out=u, where=self.flag)                        # u = a0 / q
            np.multiply(u, kr, out=wr)
            wr += g                                                             # y2 + u k
            np.multiply(u, ki, out=wi)
            wi -= b
            np.multiply(wr, wr, out=t)
            np.multiply(wi, wi, out=wr)
            t += wr                                                             # |y2 + u k|^2 > 0
            ok, flag = self.ok, self.flag
            np.greater_equal(u, self.u_low, out=ok)
            ok &= self.real
            np.less_equal(u, self.u_high, out=flag)
            ok &= flag
            np.multiply(t, self.x_low, out=wr)                                  # series reactance
            np.greater_equal(wi, wr, out=flag)                                  # wi/t in range,
            ok &= flag                                                          # times t > 0
            np.multiply(t, self.x_high, out=wr)
            np.less_equal(wi, wr, out=flag)
            ok &= flag
            np.multiply(u, p2, out=t)                                           # |1 + u k z2|^2
            t += pr
            t *= u
            t += 1.0
            np.less(t, out, out=flag)
            ok &= flag
            np.copyto(out, t, where=ok)
        out *= self.scale
        return out


def t_network_least_loss(frequency_hz, z_load_ohm, r0_ohm, parts):
    """Least loss of a high-pass T network (series C, shunt L, series C) that matches the load.

    Parameters
    ----------
    frequency_hz : array_like
        Frequency [Hz]; broadcasts with ``z_load_ohm``.
    z_load_ohm : array_like of complex
        Impedance at the tuner's output [ohm].
    r0_ohm : float
        Reference resistance at its input [ohm].
    parts : linecalc.physics.matching.TunerParts

    Returns
    -------
    loss_db : ndarray
        10 log10(P_in / P_load) of the least-loss setting found [dB]; inf where none matches.
    matched : ndarray of bool
        Where an in-range matched setting (or the bypass, when the load is already matched to
        ``MATCHED_SWR``) exists.
    output_capacitance_f : ndarray
        The output capacitor of that setting [F] (the other two parts follow in closed form);
        NaN where unmatched or bypassed.

    Notes
    -----
    The scan of `linecalc.physics.matching.design_t_network`: the output capacitor on the same
    ``T_SCAN_POINTS`` log-spaced values, the other two parts in closed form; then a golden-section
    refinement of ``T_REFINE_ITERATIONS`` steps (one evaluation each) between the best value's
    grid neighbours, where the full design takes 48. The full design's last resort, a search for
    the closest setting where no grid value matches, is left out. So a load this function calls
    matched is matched by the full design (the same grid value matches there), while a load the
    full design rescues by its search counts as unmatched here. The loss is that of a real
    in-range setting, the least of every value the scan and the refinement meet: at most 1e-3 dB
    above the full design's, and sometimes below it (by up to 0.4 dB for extreme loads, in
    trials) where the bracket is not unimodal and the full design's golden section settles on
    its worse part.

    References
    ----------
    Pozar, Microwave Engineering, 4th ed., section 5.1 (lumped-element L networks);
    Press et al., Numerical Recipes, 3rd ed., section 10.2 (golden-section search).
    """
    f, z = np.broadcast_arrays(np.asarray(frequency_hz, dtype=float), np.asarray(z_load_ohm, dtype=complex))
    inv_omega = 1 / (2 * np.pi * f)
    r_load, x_load = z.real, z.imag
    positive = r_load > 0  # no network delivers power into a pure reactance
    r_load = np.where(positive, r_load, 1.0)  # stand-in, masked out below
    ratio_at = _TLossRatio(inv_omega, r_load, x_load, r0_ohm, parts)
    # every value of the full design's grid: a matching range of the output capacitor can be
    # narrower than one step (a coarser grid lost whole windows in trials)
    grid = np.log(np.geomspace(parts.capacitance_min_f, parts.capacitance_max_f, T_SCAN_POINTS))
    best, best_log_c2 = np.full(f.shape, np.inf), np.full(f.shape, np.nan)
    better = np.empty(f.shape, dtype=bool)

    def evaluate(log_c2, out):
        """The loss ratio at ``log_c2`` into ``out``, remembered where it beats the best so far."""
        ratio_at(np.exp(log_c2), out)
        np.less(out, best, out=better)
        np.copyto(best, out, where=better)
        np.copyto(best_log_c2, log_c2, where=better)
        return out

    f1, f2 = np.empty(f.shape), np.empty(f.shape)
    for log_c2 in grid:
        evaluate(log_c2, f1)
    found = np.isfinite(best)
    index = np.searchsorted(grid, np.where(found, best_log_c2, grid[0]))
    low, high = grid[np.maximum(index - 1, 0)], grid[np.minimum(index + 1, grid.size - 1)]
    inv_phi = (np.sqrt(5) - 1) / 2
    x1, x2 = high - inv_phi * (high - low), low + inv_phi * (high - low)
    evaluate(x1, f1)
    evaluate(x2, f2)
    fresh = np.empty(f.shape)
    for _ in range(T_REFINE_ITERATIONS):
        left = f1 <= f2  # the minimum lies in [low, x2]: x1 becomes the new x2
        low, high = np.where(left, low, x1), np.where(left, x2, high)
        x1, x2 = high - inv_phi * (high - low), low + inv_phi * (high - low)
        evaluate(np.where(left, x1, x2), fresh)
        f1, f2 = np.where(left, fresh, f2), np.where(left, f1, fresh)
    bypass = positive & _swr_at_most(z, r0_ohm, MATCHED_SWR)
    best = np.where(bypass, 1.0, np.where(positive, best, np.inf))
    matched = np.isfinite(best)
    output_capacitance_f = np.where(matched & ~bypass, np.exp(best_log_c2), np.nan)
    return 10 * np.log10(best), matched, output_capacitance_f


def l_network_least_loss(frequency_hz, z_load_ohm, r0_ohm, parts):
    """Least loss of an L network that matches the load, from its exact lossy settings.

    Parameters as for `t_network_least_loss`; returns ``loss_db`` and ``matched`` as it does.

    Notes
    -----
    Every setting of `linecalc.physics.matching.l_network_candidates` and the bypass, each driven with the
    load: with 1 A in the load, a shunt part adds V/Z to the current and a series part adds Z I
    to the voltage; loss 10 log10(Re(V I*) / Re(z_load)), kept where the input SWR is at most
    ``MATCHED_SWR``. This is `linecalc.physics.matching.design_l_network` without its closest-setting
    search: matched here means matched there, and the loss is the same.

    References
    ----------
    Pozar, Microwave Engineering, 4th ed., section 5.1 (lumped-element L networks) and
    section 4.4 (chain matrices of series and shunt elements).
    """
    f, z = np.broadcast_arrays(np.asarray(frequency_hz, dtype=float), np.asarray(z_load_ohm, dtype=complex))
    positive = z.real > 0
    z_safe = np.where(positive, z, 1.0)  # stand-in, masked out below
    best = np.where(positive & _swr_at_most(z, r0_ohm, MATCHED_SWR), 1.0, np.inf)
    for candidate in l_network_candidates(f, z_safe, r0_ohm, parts):
        values = candidate.component_values
        present = np.all([~np.isnan(v) for v in values.values()], axis=0)
        v, i = z_safe, np.ones_like(z_safe)
        # drive from the load toward the input: output shunt, series part, input shunt
        for name in sorted(values, key=lambda n: (not n.startswith("output"), not n.startswith("series"))):
            value = np.where(present, values[name], 1.0)  # stand-in where absent
            impedance = (inductor_impedance_ohm(f, value, parts.inductor_q) if name.endswith("_h")
                         else capacitor_impedance_ohm(f, value, parts.capacitor_q))
            v, i = (v + impedance * i, i) if name.startswith("series") else (v, i + v / impedance)
        ok = present & positive & _swr_at_most(v / i, r0_ohm, MATCHED_SWR)
        ratio = (v * i.conj()).real / z_safe.real
        best = np.where(ok & (ratio < best), ratio, best)
    return 10 * np.log10(best), np.isfinite(best)


# network -> function(frequency_hz, z_load_ohm, r0_ohm, parts) -> (loss_db, matched)
LEAST_LOSS = {"T": lambda *args: t_network_least_loss(*args)[:2], "L": l_network_least_loss}
