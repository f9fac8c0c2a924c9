"""Matching networks (an antenna tuner): lumped parts, L and T networks, a radio's built-in tuner.

Conventions follow `linecalc.elements`: chain matrices have shape (..., nf, 2, 2) and map the output
(antenna side) state [V, I] to the input (radio side); phasors are RMS, net power is Re(V I*).
A network is a ladder of parts listed from input to output; a part sits in series (impedance
Z) or in shunt (admittance Y). Every part uses the series-resistance loss model Z = R + jX,
R = |X| / Q. A design returns, per load point, the least-loss setting that matches the load
to a real reference R0 with every part inside its range, or else the closest setting.
"""
from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from linecalc.physics.lumped import capacitor_impedance_ohm, inductor_impedance_ohm, series_abcd, shunt_abcd

# Unloaded Q of a good HF inductor and of an air or ceramic variable capacitor: common practice.
INDUCTOR_Q = 100.0
CAPACITOR_Q = 1000.0
# An input SWR at or below this counts as matched. The closed-form settings reach 1 to
# rounding; the threshold matters for a closest setting found by search.
MATCHED_SWR = 1.02
# A radio's built-in tuner tunes loads up to 3:1: common practice.
BUILTIN_MAX_SWR = 3.0
# Searches: log-spaced points of the T scan over the output capacitor, points per part of the
# closest-setting grid, iterations of the golden-section and compass refinements, and load
# points searched at once by the closest-setting search (bounds memory).
T_SCAN_POINTS = 64
CLOSEST_GRID_POINTS = 12
REFINE_ITERATIONS = 48
SEARCH_BATCH = 256

# Ladder slots (name, connection, kind) from input to output; an absent part has value NaN.
# An L network fills one series slot and one shunt slot of _L_SLOTS.
_L_SLOTS = (
    ("input_shunt_capacitor", "shunt", "capacitor"), ("input_shunt_inductor", "shunt", "inductor"),
    ("series_inductor", "series", "inductor"), ("series_capacitor", "series", "capacitor"),
    ("output_shunt_capacitor", "shunt", "capacitor"), ("output_shunt_inductor", "shunt", "inductor"),
)
_T_SLOTS = (("input_series_capacitor", "series", "capacitor"), ("shunt_inductor", "shunt", "inductor"),
            ("output_series_capacitor", "series", "capacitor"))
_UNIT_SUFFIX = {"inductor": "_h", "capacitor": "_f"}
_LABEL = {"inductor": "L", "capacitor": "C"}


@dataclass(frozen=True)
class TunerParts:
    """The variable parts a tuner is built from.

    Every capacitor spans [capacitance_min_f, capacitance_max_f] [F], every inductor
    [inductance_min_h, inductance_max_h] [H]; ranges must be positive and finite. The Qs are
    unloaded Qs of the series-resistance model [1], np.inf for ideal parts; defaults
    ``INDUCTOR_Q`` = 100 and ``CAPACITOR_Q`` = 1000 (common practice).
    """

    capacitance_min_f: float
    capacitance_max_f: float
    inductance_min_h: float
    inductance_max_h: float
    inductor_q: float = INDUCTOR_Q
    capacitor_q: float = CAPACITOR_Q

    def __post_init__(self):
        for kind in ("capacitor", "inductor"):
            low, high = self.value_range(kind)
            if not 0 < low < high < np.inf:
                raise ValueError(f"{kind} range must satisfy 0 < min < max < inf, got [{low}, {high}]")
        for q in (self.inductor_q, self.capacitor_q):
            if not q > 0:
                raise ValueError(f"unloaded Q must be positive (np.inf for an ideal part), got {q}")

    def value_range(self, kind):
        """(min, max) of a 'capacitor' [F] or an 'inductor' [H]."""
        if kind == "capacitor":
            return self.capacitance_min_f, self.capacitance_max_f
        return self.inductance_min_h, self.inductance_max_h

    def q(self, kind):
        """Unloaded Q of a 'capacitor' or an 'inductor'."""
        return self.capacitor_q if kind == "capacitor" else self.inductor_q


@dataclass(frozen=True, eq=False)
class Part:
    """One ladder slot over the load points (..., nf): ``value`` [H] for an inductor, [F] for
    a capacitor, NaN where the part is not in circuit; ``immittance`` Z [ohm] if ``connection``
    is 'series', Y [S] if 'shunt', 0 where absent; ``kind`` 'inductor' or 'capacitor'."""

    name: str
    connection: str
    kind: str
    value: np.ndarray
    immittance: np.ndarray


@dataclass(frozen=True, eq=False)
class TunerSolution:
    """A network setting per load point; arrays have shape (..., nf) unless stated.

    ``network`` 'L' or 'T'; ``r0_ohm`` reference [ohm]; ``frequency_hz``, ``z_load_ohm`` the
    design load [Hz, ohm]; ``arrangement`` parts from input to output ('series-L/shunt-C',
    'series-C/shunt-L/series-C', 'bypass', ...); ``parts`` the slots from input to output;
    ``abcd`` (..., nf, 2, 2); ``matched`` input SWR <= MATCHED_SWR (and, for a built-in tuner,
    load accepted); ``swr_in`` against r0 with the design load; ``loss_db`` 10 log10(P_in /
    P_load) with the design load; ``dissipated_fraction`` part name -> heat / P_in [1].
    """

    network: str
    r0_ohm: float
    frequency_hz: np.ndarray
    z_load_ohm: np.ndarray
    arrangement: np.ndarray
    parts: tuple[Part, ...]
    abcd: np.ndarray
    matched: np.ndarray
    swr_in: np.ndarray
    loss_db: np.ndarray
    dissipated_fraction: dict

    @property
    def component_values(self):
        """Part name + unit suffix ('_h' or '_f') -> value [H or F], NaN where absent."""
        return {p.name + _UNIT_SUFFIX[p.kind]: p.value for p in self.parts}


@dataclass(frozen=True, eq=False)
class LCandidate:
    """One exact lossy L-network setting: ``arrangement`` and ``component_values`` (its two
    parts, name + unit suffix -> [H or F], NaN where it does not exist or is out of range)."""

    arrangement: str
    component_values: dict


def _prepare(frequency_hz, z_load_ohm, r0_ohm):
    """Validate and flatten the load points: f (N,), z (N,) and their shape."""
    f = np.asarray(frequency_hz, dtype=float)
    z = np.asarray(z_load_ohm, dtype=complex)
    shape = np.broadcast_shapes(f.shape, z.shape)
    if not np.all(np.isfinite(f) & (f > 0)):
        raise ValueError("frequency_hz must be positive and finite")
    if not (np.isfinite(r0_ohm) and r0_ohm > 0):
        raise ValueError(f"r0_ohm must be positive and finite, got {r0_ohm}")
    if not np.all(np.isfinite(z) & (z.real > 0)):
        raise ValueError("the load must have a finite, positive resistance: "
                         "no network delivers power into a pure reactance, a short or an open")
    return np.broadcast_to(f, shape).ravel(), np.broadcast_to(z, shape).ravel(), shape


def _immittances(slots, values, frequency_hz, parts):
    """Z of each series slot, Y of each shunt slot; 0 where the value is NaN (absent)."""
    out = []
    for (_, connection, kind), value in zip(slots, values):
        present = ~np.isnan(value)
        stand_in = np.where(present, value, 1.0)  # any positive value: masked out below
        impedance = inductor_impedance_ohm if kind == "inductor" else capacitor_impedance_ohm
        z = impedance(frequency_hz, stand_in, parts.q(kind))
        out.append(np.where(present, z if connection == "series" else 1 / z, 0))
    return out


def _drive(slots, immittances, z_load):
    """Input [V, I] with V = z_load, I = 1 at the output, walking from output to input."""
    v, i = z_load + 0j, np.ones_like(z_load, dtype=complex)
    for (_, connection, _), w in zip(reversed(slots), reversed(immittances)):
        v, i = (v + w * i, i) if connection == "series" else (v, i + w * v)
    return v, i


def _dissipation(slots, immittances, v, i):
    """Heat per slot, |I|^2 Re Z (series) or |V|^2 Re Y (shunt), walking input to output."""
    heat = {}
    for (name, connection, _), w in zip(slots, immittances):
        if connection == "series":
            heat[name], v = np.abs(i) ** 2 * w.real, v - w * i
        else:
            heat[name], i = np.abs(v) ** 2 * w.real, i - w * v
    return heat


def _figures(slots, values, frequency_hz, z_load, r0, parts):
    """|rho| at the input against r0 and loss [dB] of a setting driving ``z_load``."""
    v, i = _drive(slots, _immittances(slots, values, frequency_hz, parts), z_load)
    return np.abs((v - r0 * i) / (v + r0 * i)), 10 * np.log10((v * i.conj()).real / z_load.real)


def _swr(abs_rho):
    """SWR from |rho|, infinite where |rho| >= 1 (Pozar, 4th ed., section 2.3, eq. 2.41)."""
    inside = abs_rho < 1
    return np.where(inside, (1 + abs_rho) / np.where(inside, 1 - abs_rho, 1.0), np.inf)


def _real_roots(c, d0, k, r):
    """Both real t with Re(c / (d0 + t k)) = r, shape (2, ...), NaN where none exists.

    Multiplying by |d0 + t k|^2 gives r|k|^2 t^2 + (2 r Re(d0 k*) - Re(c k*)) t + r|d0|^2
    - Re(c d0*) = 0, solved in the cancellation-free form (Press et al., Numerical Recipes,
    3rd ed., section 5.6).
    """
    a2 = r * np.abs(k) ** 2
    a1 = 2 * r * (d0 * np.conj(k)).real - (c * np.conj(k)).real
    a0 = r * np.abs(d0) ** 2 - (c * np.conj(d0)).real
    discriminant = a1**2 - 4 * a2 * a0
    q = -0.5 * (a1 + np.copysign(np.sqrt(np.where(discriminant >= 0, discriminant, np.nan)), a1))
    t1 = q / a2
    t2 = np.divide(a0, q, out=np.array(t1, copy=True), where=q != 0)  # q = 0: double root 0
    return np.stack([t1, t2])


def _inverse(d):
    """1/d, NaN where d is NaN (a complex division by NaN would warn)."""
    return np.divide(1, d, out=np.full(np.shape(d), np.nan, dtype=complex), where=~np.isnan(d))


def _in_range(value, kind, parts):
    low, high = parts.value_range(kind)
    return (value >= low) & (value <= high)


def _part_value(omega, sigma, x, kind, ok, shunt):
    """[H or F] from the reactance x (series) or u = 1/x (shunt); NaN unless ok and x has sign sigma."""
    out = np.full(np.shape(x), np.nan)
    if kind == "inductor":  # L = x / omega = 1 / (omega u)
        num, den = (1.0, omega * x) if shunt else (x, omega)
    else:  # C = -1 / (omega x) = -u / omega
        num, den = (-x, omega) if shunt else (-1.0, omega * x)
    return np.divide(num, den, out=out, where=ok & (sigma * x > 0))


def _l_exact(frequency_hz, z_load, r0, parts):
    """Every exact lossy L setting: values (16, 6, N), NaN where invalid; (series, shunt) slots.

    Series part toward the input (Pozar fig. 5.2a): Z_in = Z_s + W, W = 1/(Y_L + u k_p), the
    shunt admittance u k_p with k_p = 1/(sigma_p/Q_p + j), u = 1/X_p. Z_in = R0 needs
    X_s = -Im W and Re W - (sigma_s/Q_s) Im W = R0, i.e. Re((1 + j sigma_s/Q_s)/(Y_L + u k_p))
    = R0, a quadratic in u. Series part at the load (fig. 5.2b) is the dual,
    Re((1 - j sigma_p/Q_p)/(Z_L + X_s m_s)) = 1/R0 with m_s = sigma_s/Q_s + j, a quadratic in
    X_s. sigma = +1 for an inductor, -1 for a capacitor; a root counts only where the
    reactances it gives have those signs. With Q = inf these are Pozar's eqs. (5.3), (5.6).
    """
    omega = 2 * np.pi * frequency_hz
    y_load = 1 / z_load
    slot_of = {name: n for n, (name, _, _) in enumerate(_L_SLOTS)}
    values, used = [], []
    for sigma_s, kind_s in ((1, "inductor"), (-1, "capacitor")):
        for sigma_p, kind_p in ((1, "inductor"), (-1, "capacitor")):
            q_s, q_p = parts.q(kind_s), parts.q(kind_p)
            k_p, m_s = 1 / (sigma_p / q_p + 1j), sigma_s / q_s + 1j
            solutions = [("output", -_inverse(y_load + u * k_p).imag, u)
                         for u in _real_roots(1 + 1j * sigma_s / q_s, y_load, k_p, r0)]
            solutions += [("input", x, _inverse(z_load + x * m_s).imag * (1 + 1 / q_p**2))
                          for x in _real_roots(1 - 1j * sigma_p / q_p, z_load, m_s, 1 / r0)]
            for side, x_s, u in solutions:
                ok = (sigma_s * x_s > 0) & (sigma_p * u > 0)
                series = _part_value(omega, sigma_s, x_s, kind_s, ok, shunt=False)
                shunt = _part_value(omega, sigma_p, u, kind_p, ok, shunt=True)
                ok &= _in_range(series, kind_s, parts) & _in_range(shunt, kind_p, parts)
                slots = slot_of[f"series_{kind_s}"], slot_of[f"{side}_shunt_{kind_p}"]
                row = np.full((len(_L_SLOTS), len(z_load)), np.nan)
                row[list(slots)] = np.where(ok, [series, shunt], np.nan)
                values.append(row)
                used.append(slots)
    return np.stack(values), used


def _arrangement_name(slots, present):
    """Names like 'series-L/shunt-C' from present slots (n_slots, ...); 'bypass' if none."""
    names = np.full(present.shape[1:], "", dtype=object)
    for (_, connection, kind), here in zip(slots, present):
        label = f"{connection}-{_LABEL[kind]}"
        names = np.where(here, np.where(names == "", label, names + "/" + label), names)
    return np.where(names == "", "bypass", names).astype(str)


def _best_matched(slots, candidates, frequency_hz, z_load, r0, parts):
    """Least-loss matched setting among candidates (M, n_slots, N) and a bypass.

    Returns values (n_slots, N) and where a matched setting was found (N,)."""
    candidates = np.concatenate([candidates, np.full((1,) + candidates.shape[1:], np.nan)])
    valid = ~np.all(np.isnan(candidates), axis=1)
    valid[-1] = True
    rho, loss_db = _figures(slots, candidates.swapaxes(0, 1), frequency_hz, z_load, r0, parts)
    score = np.where(valid & (_swr(rho) <= MATCHED_SWR), loss_db, np.inf)
    best = np.argmin(score, axis=0)
    values = np.take_along_axis(candidates, best[None, None, :], axis=0)[0]
    return values, np.isfinite(np.take_along_axis(score, best[None], axis=0)[0])


def _closest(slots, grid, frequency_hz, z_load, r0, parts):
    """Least input SWR inside the ranges: best of ``grid`` (M, n_slots) and a bypass, then a
    compass search that moves one present part a step up or down in log(value) while that
    lowers |rho| and stays in range, halving the step when no move does."""
    grid = np.concatenate([grid, np.full((1, len(slots)), np.nan)])
    step0 = max(np.log(high / low) for low, high in map(parts.value_range, ("capacitor", "inductor")))
    out = np.empty((len(slots), len(z_load)))
    for start in range(0, len(z_load), SEARCH_BATCH):
        batch = slice(start, start + SEARCH_BATCH)
        f, z = frequency_hz[batch], z_load[batch]
        values = grid[np.argmin(_figures(slots, grid.T[:, :, None], f, z, r0, parts)[0], axis=0)].T
        best = _figures(slots, values, f, z, r0, parts)[0]
        step = np.full(len(z), step0 / (CLOSEST_GRID_POINTS - 1))
        for _ in range(REFINE_ITERATIONS):
            trials = np.repeat(values[None], 2 * len(slots), axis=0)
            for n, (_, _, kind) in enumerate(slots):
                for row, sign in ((2 * n, 1), (2 * n + 1, -1)):
                    moved = values[n] * np.exp(sign * step)
                    trials[row, n] = np.where(_in_range(moved, kind, parts), moved, values[n])
            rho = _figures(slots, trials.swapaxes(0, 1), f, z, r0, parts)[0]
            pick = np.argmin(rho, axis=0)
            better = rho[pick, np.arange(len(z))] < best
            values = np.where(better, trials[pick, :, np.arange(len(z))].T, values)
            best = np.where(better, rho[pick, np.arange(len(z))], best)
            step = np.where(better, step, step / 2)
        out[:, batch] = values
    return out


def _design_l_flat(frequency_hz, z_load, r0, parts):
    candidates, used = _l_exact(frequency_hz, z_load, r0, parts)
    values, found = _best_matched(_L_SLOTS, candidates, frequency_hz, z_load, r0, parts)
    if not np.all(found):
        blocks = []
        for series, shunt in used[::2]:  # each arrangement once: a grid over its two parts
            s, p = np.meshgrid(*(np.geomspace(*parts.value_range(_L_SLOTS[n][2]), CLOSEST_GRID_POINTS)
                                 for n in (series, shunt)))
            block = np.full((s.size, len(_L_SLOTS)), np.nan)
            block[:, series], block[:, shunt] = s.ravel(), p.ravel()
            blocks.append(block)
        values[:, ~found] = _closest(_L_SLOTS, np.concatenate(blocks), frequency_hz[~found],
                                     z_load[~found], r0, parts)
    return values


def _t_best_at(c2, frequency_hz, z_load, r0, parts):
    """Least-loss matched T setting with output capacitor c2 [F] (broadcasts with (N,)).

    The output capacitor makes the load Z2 = Z_L + Z_C2; input capacitor and shunt inductor
    are then an L section with its series part toward the input (see _l_exact, sigma_s = -1,
    sigma_p = +1), solved in closed form with the losses. Returns the loss [dB] (inf where no
    matched setting is in range) and the values (3, ..., N).
    """
    omega = 2 * np.pi * frequency_hz
    y2 = 1 / (z_load + capacitor_impedance_ohm(frequency_hz, c2, parts.capacitor_q))
    k_p = 1 / (1 / parts.inductor_q + 1j)
    u = _real_roots(1 - 1j / parts.capacitor_q, y2, k_p, r0)
    x_s = -_inverse(y2 + u * k_p).imag
    ok = (u > 0) & (x_s < 0)
    c1 = _part_value(omega, -1, x_s, "capacitor", ok, shunt=False)
    inductance = _part_value(omega, 1, u, "inductor", ok, shunt=True)
    c2 = np.broadcast_to(c2, c1.shape)
    ok &= (_in_range(c1, "capacitor", parts) & _in_range(inductance, "inductor", parts)
           & _in_range(c2, "capacitor", parts))
    values = np.where(ok[:, None], np.stack([c1, inductance, c2], axis=1), np.nan)
    rho, loss_db = _figures(_T_SLOTS, values.swapaxes(0, 1), frequency_hz, z_load, r0, parts)
    score = np.where(ok & (_swr(rho) <= MATCHED_SWR), loss_db, np.inf)
    root = np.argmin(score, axis=0)
    return (np.take_along_axis(score, root[None], axis=0)[0],
            np.take_along_axis(values, root[None, None], axis=0)[0])


def _design_t_flat(frequency_hz, z_load, r0, parts):
    """Scan the output capacitor on a log grid, refine by golden section, keep the least loss."""
    c2_grid = np.geomspace(*parts.value_range("capacitor"), T_SCAN_POINTS)
    grid_loss = _t_best_at(c2_grid[:, None], frequency_hz, z_load, r0, parts)[0]
    best = np.argmin(grid_loss, axis=0)
    # the least loss seen anywhere in the search, not only where the search ends: the loss need
    # not be unimodal between grid points, and a bracket end may be the best there is
    best_x = np.log(c2_grid[best])
    best_loss = np.take_along_axis(grid_loss, best[None], axis=0)[0]
    low = np.log(c2_grid[np.maximum(best - 1, 0)])
    high = np.log(c2_grid[np.minimum(best + 1, T_SCAN_POINTS - 1)])
    inv_phi = (np.sqrt(5) - 1) / 2
    for _ in range(REFINE_ITERATIONS):  # golden section; both inner points evaluated afresh
        x1, x2 = high - inv_phi * (high - low), low + inv_phi * (high - low)
        loss1 = _t_best_at(np.exp(x1), frequency_hz, z_load, r0, parts)[0]
        loss2 = _t_best_at(np.exp(x2), frequency_hz, z_load, r0, parts)[0]
        for x, loss in ((x1, loss1), (x2, loss2)):
            better = loss < best_loss
            best_x, best_loss = np.where(better, x, best_x), np.where(better, loss, best_loss)
        left = loss1 <= loss2
        high, low = np.where(left, x2, high), np.where(left, low, x1)
    candidates = np.stack([_t_best_at(c2, frequency_hz, z_load, r0, parts)[1]
                           for c2 in (c2_grid[best], np.exp(best_x), np.exp((low + high) / 2))])
    values, found = _best_matched(_T_SLOTS, candidates, frequency_hz, z_load, r0, parts)
    if not np.all(found):
        axes = np.meshgrid(*(np.geomspace(*parts.value_range(kind), CLOSEST_GRID_POINTS) for _, _, kind in _T_SLOTS))
        grid = np.stack([a.ravel() for a in axes], axis=1)
        values[:, ~found] = _closest(_T_SLOTS, grid, frequency_hz[~found], z_load[~found], r0, parts)
    return values


def _solution(network, slots, values, frequency_hz, z_load, r0, parts, shape, accepted):
    """The TunerSolution of the setting ``values`` (n_slots, N)."""
    immittances = _immittances(slots, values, frequency_hz, parts)
    abcd = np.broadcast_to(np.eye(2, dtype=complex), (len(z_load), 2, 2))
    for (_, connection, _), w in zip(slots, immittances):
        abcd = abcd @ (series_abcd(w) if connection == "series" else shunt_abcd(w))
    v, i = _drive(slots, immittances, z_load)
    swr_in = _swr(np.abs((v - r0 * i) / (v + r0 * i)))
    p_in = (v * i.conj()).real
    heat = _dissipation(slots, immittances, v, i)
    return TunerSolution(
        network=network, r0_ohm=float(r0),
        frequency_hz=frequency_hz.reshape(shape), z_load_ohm=z_load.reshape(shape),
        arrangement=_arrangement_name(slots, ~np.isnan(values)).reshape(shape),
        parts=tuple(Part(name, connection, kind, value.reshape(shape), w.reshape(shape))
                    for (name, connection, kind), value, w in zip(slots, values, immittances)),
        abcd=abcd.reshape(shape + (2, 2)),
        matched=((swr_in <= MATCHED_SWR) & accepted).reshape(shape),
        swr_in=swr_in.reshape(shape),
        loss_db=(10 * np.log10(p_in / z_load.real)).reshape(shape),
        dissipated_fraction={name: (h / p_in).reshape(shape) for name, h in heat.items()},
    )


_NETWORKS = {"L": (_L_SLOTS, _design_l_flat), "T": (_T_SLOTS, _design_t_flat)}


def l_network_candidates(frequency_hz, z_load_ohm, r0_ohm, parts):
    """Every exact L-network setting that matches the load to r0 with the part losses included.

    Parameters
    ----------
    frequency_hz : array_like, shape (nf,)
        Frequency [Hz].
    z_load_ohm : array_like of complex, shape (..., nf)
        Impedance the network must match, at its output [ohm]; real part positive.
    r0_ohm : float
        Reference resistance at the input [ohm].
    parts : TunerParts
        Ranges and Qs of the parts.

    Returns
    -------
    tuple of LCandidate
        16 entries: each arrangement (series L or C; shunt L or C on the input or the output
        side) with both roots of its quadratic; values NaN where that root does not exist,
        gives reactances of the wrong sign or falls outside the ranges.

    References
    ----------
    Pozar, Microwave Engineering, 4th ed., section 5.1 (lumped-element L networks).
    """
    f, z, shape = _prepare(frequency_hz, z_load_ohm, r0_ohm)
    values, used = _l_exact(f, z, r0_ohm, parts)
    out = []
    for row, slots in zip(values, used):
        present = np.isin(np.arange(len(_L_SLOTS)), slots)[:, None]
        out.append(LCandidate(str(_arrangement_name(_L_SLOTS, present)[0]),
                              {_L_SLOTS[n][0] + _UNIT_SUFFIX[_L_SLOTS[n][2]]: row[n].reshape(shape)
                               for n in slots}))
    return tuple(out)


def design_l_network(frequency_hz, z_load_ohm, r0_ohm, parts) -> TunerSolution:
    """Least-loss L network matching the load to r0, per load point.

    Parameters are those of ``l_network_candidates``. Among its settings and a bypass (no
    parts), the one with the least loss and input SWR <= MATCHED_SWR is chosen; where there is
    none, the closest setting (grid, then compass search) with ``matched`` False unless that
    search itself reaches MATCHED_SWR. Parts: 'series_inductor' or 'series_capacitor', and one
    of 'input_shunt_*' (shunt toward the radio) or 'output_shunt_*' (shunt across the load).

    References
    ----------
    Pozar, Microwave Engineering, 4th ed., section 5.1 (lumped-element L networks).
    """
    f, z, shape = _prepare(frequency_hz, z_load_ohm, r0_ohm)
    return _solution("L", _L_SLOTS, _design_l_flat(f, z, r0_ohm, parts), f, z, r0_ohm, parts,
                     shape, True)


def design_t_network(frequency_hz, z_load_ohm, r0_ohm, parts) -> TunerSolution:
    """Least-loss high-pass T network (series C, shunt L, series C) matching the load to r0.

    Parameters are those of ``l_network_candidates``. Parts 'input_series_capacitor',
    'shunt_inductor', 'output_series_capacitor'. The T has one free setting: the output
    capacitor is scanned on a log grid over its range (``T_SCAN_POINTS``), the other two parts
    follow in closed form with the losses (an L section), and the least-loss matched value is
    refined by golden section between its grid neighbours; a bypass competes too. Where no
    matched setting is in range, the closest setting is returned as for the L.

    References
    ----------
    Pozar, Microwave Engineering, 4th ed., section 5.1 (lumped-element L networks).
    Press et al., Numerical Recipes, 3rd ed., section 10.2 (golden-section search).
    """
    f, z, shape = _prepare(frequency_hz, z_load_ohm, r0_ohm)
    return _solution("T", _T_SLOTS, _design_t_flat(f, z, r0_ohm, parts), f, z, r0_ohm, parts,
                     shape, True)


def design_builtin_tuner(frequency_hz, z_load_ohm, r0_ohm, parts, network="L",
                         max_swr=BUILTIN_MAX_SWR) -> TunerSolution:
    """A radio's built-in tuner: an L or T network that only tunes loads up to ``max_swr``.

    Parameters
    ----------
    frequency_hz, z_load_ohm, r0_ohm, parts
        As for ``l_network_candidates``.
    network : {'L', 'T'}
        Network inside the radio.
    max_swr : float
        Largest load SWR against r0 the tuner accepts [1]; default 3 (common practice).

    Returns
    -------
    TunerSolution
        Where the load SWR exceeds ``max_swr``: bypass (identity chain matrix, arrangement
        'bypass'), ``matched`` False. Elsewhere as ``design_l_network`` / ``design_t_network``.
    """
    if network not in _NETWORKS:
        raise ValueError(f"network must be 'L' or 'T', got {network!r}")
    if not max_swr >= 1:
        raise ValueError(f"max_swr must be at least 1, got {max_swr}")
    f, z, shape = _prepare(frequency_hz, z_load_ohm, r0_ohm)
    slots, design = _NETWORKS[network]
    accepted = _swr(np.abs((z - r0_ohm) / (z + r0_ohm))) <= max_swr
    values = np.full((len(slots), len(z)), np.nan)
    if np.any(accepted):
        values[:, accepted] = design(f[accepted], z[accepted], r0_ohm, parts)
    return _solution(network, slots, values, f, z, r0_ohm, parts, shape, accepted)


def held_setting(solution: TunerSolution, set_at, parts) -> TunerSolution:
    """A setting held fixed: at every load point, the part values that ``solution`` chose at
    the point ``set_at`` names, in circuit with this point's frequency and load.

    Parameters
    ----------
    solution : TunerSolution
        A design at every load point, shapes (..., nf).
    set_at : array_like of int, shape (nf,)
        For each frequency, the index (along the last axis) of the frequency whose setting it
        keeps: a manual tuner set once at a band's centre and left there across the band.
    parts : TunerParts
        The Qs of the parts (their ranges are not consulted: the values are held).

    Returns
    -------
    TunerSolution
        Arrangement, parts and chain matrix of the held values at each point's frequency;
        ``swr_in``, ``loss_db`` and ``matched`` (input SWR <= MATCHED_SWR) with each point's own
        load. At the points where ``set_at`` names the point itself it equals ``solution``.

    References
    ----------
    Pozar, Microwave Engineering, 4th ed., sections 4.4 (chain matrices of series and shunt
    elements) and 5.1 (lumped-element matching networks).
    """
    slots = tuple((p.name, p.connection, p.kind) for p in solution.parts)
    shape = solution.z_load_ohm.shape
    set_at = np.asarray(set_at, dtype=int)
    values = np.stack([np.broadcast_to(p.value[..., set_at], shape).reshape(-1) for p in solution.parts])
    frequency_hz = np.broadcast_to(solution.frequency_hz, shape).reshape(-1)
    return _solution(solution.network, slots, values, frequency_hz, solution.z_load_ohm.reshape(-1),
                     solution.r0_ohm, parts, shape, True)


def component_dissipation_w(solution, voltage_in_v, current_in_a):
    """Heat in each part of a tuner setting, from the RMS phasors at its input node.

    Parameters
    ----------
    solution : TunerSolution
        The setting, shapes (..., nf).
    voltage_in_v : array_like of complex
        RMS voltage at the tuner's input (radio side) [V]; broadcasts with (..., nf).
    current_in_a : array_like of complex
        RMS current into the tuner's input [A]; broadcasts with (..., nf).

    Returns
    -------
    dict of str to ndarray
        Part name -> dissipated power [W], 0 where absent: walking from input to output, a
        series part takes |I|^2 Re Z and passes on V - Z I, a shunt part takes |V|^2 Re Y and
        passes on I - Y V. The sum equals Re(V_in I_in*) - Re(V_out I_out*) to rounding.

    References
    ----------
    Pozar, Microwave Engineering, 4th ed., section 4.4 (chain matrices of series and shunt
    elements).
    """
    slots = tuple((p.name, p.connection, p.kind) for p in solution.parts)
    return _dissipation(slots, [p.immittance for p in solution.parts],
                        np.asarray(voltage_in_v, dtype=complex), np.asarray(current_in_a, dtype=complex))
