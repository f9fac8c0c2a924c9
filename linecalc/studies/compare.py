"""Compare alternatives of one station band by band: other feedlines for the main line, the tuner
at the radio or at the feedpoint, other lengths of one line.

An orchestrator beside budget.py: it builds variant stations, solves each with `solve_budget`
and ranks them. It holds no formulas of its own.

Rules for a change of line kind (documented in the README):
- coax -> balanced line: the element in front of the line must offer a balanced port. A tuner
  right in front becomes a balanced tuner; otherwise a 1:1 balun (default loss) is inserted in
  front of the line.
- balanced line -> coax: a tuner right in front becomes unbalanced, and, because the antenna was
  fed balanced, a 1:1 choke (default loss) is inserted between the coax and the antenna side.
- coax -> balanced line: a choke right after the coax (at the feedpoint) is dropped: the
  balanced line feeds the balanced antenna, and the balun or balanced tuner sits at its radio end.
- the tuner moved to the antenna end of the main line: a choke right after the line stays on the
  line's side of the tuner (between the coax and the tuner), where the coax is matched, rather
  than at the tuner's high-impedance output.
Each alternative lists what it added, moved or dropped (``changes``).
"""
from __future__ import annotations

import dataclasses
from dataclasses import dataclass

import numpy as np

from linecalc.studies.budget import BudgetResult, solve_budget
from linecalc.studies.json_values import finite_or_none
from linecalc.studies.station import CompareSpec, Station
from linecalc.elements import Choke, Line, Transformer
from linecalc.physics.twoports import closed_form_line_loss_db
from linecalc.errors import InputError
from linecalc.elements.base import named

# Loss of the balun or choke inserted by a change of line kind [dB]: the station-file defaults.
INSERTED_BALUN_LOSS_DB = 0.2
INSERTED_CHOKE_LOSS_DB = 0.05


def _same_feed(a: Station, b: Station) -> bool:
    return len(a.feed) == len(b.feed) and all(x is y for x, y in zip(a.feed, b.feed))


def alternatives_from_spec(station: Station, spec: CompareSpec) -> list[Alternative]:
    """Every alternative the spec names; the station as built comes first once."""
    alternatives = cable_alternatives(station, spec.cables, spec.main_line)
    if spec.tuner_positions:
        # a tuner position that is the station as built is already there
        alternatives += [a for a in tuner_alternatives(station, spec.main_line) if not _same_feed(a.station, station)]
    if spec.lengths_m:
        alternatives += length_alternatives(station, spec.line or spec.main_line, spec.lengths_m)
    if len(alternatives) < 2:
        raise CompareError("nothing to compare: give cables, tuner_positions or lengths")
    return alternatives


class CompareError(InputError):
    """A comparison that cannot be built: no alternatives, no line to vary, no tuner to move."""


@dataclass(frozen=True)
class Alternative:
    """One variant to solve: a name, the station it stands for and the line whose length it varies."""

    name: str
    station: Station
    varies: str | None = None
    changes: tuple[str, ...] = ()  # elements added, moved or dropped against the station as built


@dataclass(frozen=True)
class LineStudy:
    """One line across the alternatives that change its length: its exact loss and the figure of
    the closed-form formula, which averages over where the current peaks fall. (alternatives, rows)."""

    label: str
    alternatives: tuple[int, ...]
    length_m: np.ndarray
    exact_loss_db: np.ndarray
    closed_form_loss_db: np.ndarray
    swr_load: np.ndarray


@dataclass(frozen=True)
class Comparison:
    """Alternatives ranked per row. Arrays are (alternatives, rows) unless stated.

    ``winner`` (rows,) indexes the alternative with the most watts at the antenna; ``margin_db``
    (rows,) is how much less the winner loses than the runner-up [dB].
    """

    station: str
    labels: tuple[str, ...]
    frequency_hz: np.ndarray
    names: tuple[str, ...]
    results: tuple[BudgetResult, ...]
    power_antenna_w: np.ndarray
    total_loss_db: np.ndarray
    winner: np.ndarray
    margin_db: np.ndarray
    warnings: tuple[str, ...] = ()
    line_study: LineStudy | None = None
    changes: tuple[tuple[str, ...], ...] = ()  # per alternative, what it added, moved or dropped
    explanations: tuple | None = None  # --explain: `studies.explain.Explanation` entries; None: not asked
    uncertainty: object | None = None  # compare --uncertainty: a `studies.uncertainty.CompareSpread`

    def to_dict(self) -> dict:
        """The JSON document of ``linecalc compare --format json``: per row, each alternative's
        watts and loss, the winner and its margin."""
        rows = []
        for i, label in enumerate(self.labels):
            rows.append({
                "label": label,
                "frequency_hz": float(self.frequency_hz[i]),
                "alternatives": [{"name": name, "power_antenna_w": float(self.power_antenna_w[k, i]),
                                  "total_loss_db": finite_or_none(self.total_loss_db[k, i]),
                                  "swr_radio": finite_or_none(self.results[k].swr_radio[i])}
                                 for k, name in enumerate(self.names)],
                "winner": self.names[self.winner[i]],
                "margin_db": finite_or_none(self.margin_db[i]),
            })
        doc = {"station": self.station, "alternatives": list(self.names),
               "changes": [list(c) for c in self.changes] if self.changes else [[] for _ in self.names],
               "rows": rows, "warnings": list(self.warnings)}
        study = self.line_study
        if study is not None:
            doc["line_study"] = {
                "label": study.label, "length_m": [float(v) for v in study.length_m],
                "rows": [{"label": label,
                          "exact_loss_db": [finite_or_none(v) for v in study.exact_loss_db[:, i]],
                          "closed_form_loss_db": [finite_or_none(v) for v in study.closed_form_loss_db[:, i]],
                          "swr_load": [finite_or_none(v) for v in study.swr_load[:, i]]}
                         for i, label in enumerate(self.labels)]}
        if self.explanations is not None:  # only when asked for (--explain): absent otherwise
            doc["explanations"] = [e.to_dict() for e in self.explanations]
        if self.uncertainty is not None:
            doc["uncertainty"] = self.uncertainty.to_dict()
        return doc


def main_line_index(feed, label=None) -> int:
    """Index of the main line: the line called ``label``, or else the longest line."""
    lines = [k for k, element in enumerate(feed) if element.kind == "line"]
    if not lines:
        raise CompareError("the feed has no line to compare")
    if label is not None:
        named = [k for k in lines if feed[k].label == label]
        if not named:
            known = ", ".join(feed[k].label for k in lines)
            raise CompareError(f"no line is labelled {label!r}; the lines are: {known}")
        return named[0]
    return max(lines, key=lambda k: float(np.max(feed[k].length_m)))


def _offers_balanced(element) -> bool:
    """Whether an element's antenna-side port may feed a balanced line (a choke counts as a 1:1 balun)."""
    if element is None:
        return False  # the radio's port
    if element.kind == "line":
        return element.cable.kind == "balanced"
    return element.kind == "choke" or bool(element.output_balanced)


def _feedpoint_run_end(feed, index):
    """End (exclusive) of the run of chokes and meters right after line ``index``: what sits at
    the line's antenna end (a meter is lossless, so a choke behind it is still at the feedpoint)."""
    end = index + 1
    while end < len(feed) and feed[end].kind in ("choke", "meter"):
        end += 1
    return end


def _with_cable(feed, index, cable, z_ref_ohm, name=None):
    """The feed with line ``index`` made of ``cable`` (called ``name``, default its id), plus the
    balun or choke a change of kind needs, and what changed (texts)."""
    feed = list(feed)
    old = feed[index]
    # a line of another kind is no longer what its label says ("window line" made of coax): it
    # takes the name of its alternative (see `retyped_name`)
    feed[index] = dataclasses.replace(old, cable=cable, label=old.label if old.cable.kind == cable.kind
                                      else retyped_name(old.label, name or cable.id))
    if old.cable.kind == cable.kind:
        return tuple(feed), ()
    changes = []
    before = feed[index - 1] if index > 0 else None
    if cable.kind == "balanced":
        for k in reversed(range(index + 1, _feedpoint_run_end(feed, index))):
            if feed[k].kind == "choke":
                changes.insert(0, f"choke {feed[k].label} dropped (balanced line to the antenna)")
                del feed[k]
        if before is not None and before.kind == "tuner":
            feed[index - 1] = dataclasses.replace(before, output_balanced=True)
            changes.append(f"{named('tuner', before.label)} made balanced")
        elif not _offers_balanced(before):
            feed.insert(index, Transformer("balun for " + old.label, 1.0, INSERTED_BALUN_LOSS_DB, z_ref_ohm))
            changes.append(f"1:1 balun added at the radio end of {old.label}")
        return tuple(feed), tuple(changes)
    if before is not None and before.kind == "tuner":
        feed[index - 1] = dataclasses.replace(before, output_balanced=False)
        changes.append(f"{named('tuner', before.label)} made unbalanced")
    feed.insert(index + 1, Choke("choke after " + old.label, INSERTED_CHOKE_LOSS_DB, z_ref_ohm))
    changes.append(f"1:1 choke added between {old.label} and the antenna")
    return tuple(feed), tuple(changes)


def cable_alternatives(station: Station, cables, main_label=None) -> list[Alternative]:
    """The station as it is, and with the main line made of each of ``cables`` (id -> Cable)."""
    index = main_line_index(station.feed, main_label)
    line = station.feed[index]
    alternatives = [Alternative(f"{line.label}: {line.cable.id} (as built)", station)]
    for name, cable in cables:
        feed, changes = _with_cable(station.feed, index, cable, station.reference_impedance_ohm, name)
        named = f"{line.label}: {name}" if cable.kind == line.cable.kind else retyped_name(line.label, name)
        alternatives.append(Alternative(named, dataclasses.replace(station, feed=feed), changes=changes))
    return alternatives


def retyped_name(label, cable_name):
    """The name of a line replaced by a cable of another kind (coax for a window line): the new
    cable first, so that no label calls a coax a window line."""
    return f"{cable_name} in place of {label}"


def tuner_alternatives(station: Station, main_label=None) -> list[Alternative]:
    """The tuner right at the radio end of the main line and right at its antenna end."""
    tuners = [k for k, element in enumerate(station.feed) if element.kind == "tuner"]
    if len(tuners) != 1:
        raise CompareError(f"moving the tuner needs exactly one tuner in the feed, found {len(tuners)}")
    tuner = station.feed[tuners[0]]
    rest = [element for k, element in enumerate(station.feed) if k != tuners[0]]
    index = main_line_index(tuple(rest), main_label)
    at_radio = tuple(rest[:index]) + (tuner,) + tuple(rest[index:])
    # chokes right after the line stay on the line's side of the tuner (README, compare rules);
    # meters among them stay where they read, at the feedpoint
    end = _feedpoint_run_end(rest, index)
    kept = tuple(e for e in rest[index + 1:end] if e.kind == "choke")
    meters = tuple(e for e in rest[index + 1:end] if e.kind != "choke")
    at_antenna = tuple(rest[:index + 1]) + kept + (tuner,) + meters + tuple(rest[end:])
    changes = [f"{named('tuner', tuner.label)} moved to the antenna end of {rest[index].label}"]
    changes += [f"choke {c.label} kept between {rest[index].label} and the tuner" for c in kept]
    if rest[index].cable.kind == "balanced" and not _offers_balanced(rest[index - 1] if index > 0 else None):
        # the line loses its balanced tuner: feed it through a 1:1 balun, as the station would need
        balun = Transformer("balun for " + rest[index].label, 1.0, INSERTED_BALUN_LOSS_DB, station.reference_impedance_ohm)
        at_antenna = tuple(rest[:index]) + (balun, rest[index], *kept, tuner, *meters) + tuple(rest[end:])
        changes.append(f"1:1 balun added at the radio end of {rest[index].label}")
    return [Alternative(f"tuner at the radio end of {rest[index].label}", dataclasses.replace(station, feed=at_radio),
                        changes=(f"{named('tuner', tuner.label)} at the radio end of {rest[index].label}",)),
            Alternative(f"tuner at the antenna end of {rest[index].label}", dataclasses.replace(station, feed=at_antenna),
                        changes=tuple(changes))]


def length_alternatives(station: Station, label, lengths_m) -> list[Alternative]:
    """The station with line ``label`` cut to each of ``lengths_m`` [m]."""
    index = main_line_index(station.feed, label)
    line = station.feed[index]
    alternatives = []
    for length in lengths_m:
        feed = list(station.feed)
        feed[index] = Line(line.cable, float(length), line.label)
        alternatives.append(Alternative(f"{line.label}: {length:g} m", dataclasses.replace(station, feed=tuple(feed)),
                                        varies=line.label))
    return alternatives


def compare(station: Station, alternatives) -> Comparison:
    """Solve every alternative and rank them per row by watts at the antenna; where some
    alternatives vary the length of a line, add the `LineStudy` of that line."""
    if len(alternatives) < 2:
        raise CompareError("a comparison needs at least two alternatives")
    results = tuple(solve_budget(alternative.station) for alternative in alternatives)
    power = np.array([r.power_antenna_w for r in results])
    loss = np.array([r.total_loss_db for r in results])
    # ranked by what the user gets: watts at the antenna, so that a radio that holds its forward
    # power and folds back into a mismatch counts against the alternative that causes it
    order = np.argsort(-power, axis=0, kind="stable")
    winner = order[0]
    columns = np.arange(power.shape[1])
    best, runner_up = power[winner, columns], power[order[1], columns]
    # two alternatives into a dead short both deliver nothing: no margin between them
    both_lost = (best == 0) & (runner_up == 0)
    # only the runner-up delivering nothing: an infinite margin (null in JSON)
    delivers = runner_up > 0
    margin = np.where(both_lost, 0.0,
                      np.where(delivers, 10 * np.log10(np.where(delivers, best, 1.0) / np.where(delivers, runner_up, 1.0)),
                               np.inf))
    warnings = _named_warnings(alternatives, results)
    return Comparison(station.name, tuple(station.labels), np.asarray(station.frequency_hz), tuple(a.name for a in alternatives),
                      results, power, loss, winner, margin, warnings, _line_study(alternatives, results),
                      tuple(a.changes for a in alternatives))


def _named_warnings(alternatives, results):
    """Each warning once, led by the alternatives that raise it (or 'every alternative')."""
    raised = {}
    for alternative, result in zip(alternatives, results):
        for warning in result.warnings:
            raised.setdefault(warning, []).append(alternative.name)
    return tuple(f"{'every alternative' if len(names) == len(alternatives) else '; '.join(names)}: {warning}"
                 for warning, names in raised.items())


def _line_study(alternatives, results):
    """Exact and closed-form loss of the line whose length some alternatives vary (None if none do)."""
    label = next((a.varies for a in alternatives if a.varies is not None), None)
    if label is None:
        return None
    picked, lengths, exact, closed, swr = [], [], [], [], []
    for k, (alternative, result) in enumerate(zip(alternatives, results)):
        if alternative.varies != label:
            continue
        index = next(i for i, e in enumerate(alternative.station.feed) if e.kind == "line" and e.label == label)
        element = result.elements[index]
        rho = (element.swr_out - 1) / (element.swr_out + 1)
        picked.append(k)
        lengths.append(alternative.station.feed[index].length_m)
        exact.append(element.loss_db)
        closed.append(closed_form_line_loss_db(element.matched_loss_db, rho))
        swr.append(element.swr_out)
    return LineStudy(label, tuple(picked), np.array(lengths), np.array(exact), np.array(closed), np.array(swr))
