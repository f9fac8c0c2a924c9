"""What an element of the feed path offers the studies: the `Element` protocol, and the defaults
of its optional parts.

An element is a two-port between the radio (its input) and the antenna (its output). The
studies need only its chain matrix for a frequency array; everything else has a default in
`ElementDefaults`, which every element of linecalc inherits.
"""
from __future__ import annotations

import re
from typing import Protocol

import numpy as np


def named(kind: str, label: str) -> str:
    """An element as a sentence names it: its kind, then its label ("tuner shack"), or the label
    alone where it already says its kind as a word ("tuner 1", "window line"), so that a default
    label never reads "tuner tuner 1"."""
    return label if _says_kind(kind, label) else f"{kind} {label}"


def column_name(kind: str, label: str) -> str:
    """An element as a table's column heading names it: ``kind: label`` ("line: coax"), or the
    label alone where it already says its kind ("shack meter")."""
    return label if _says_kind(kind, label) else f"{kind}: {label}"


def _says_kind(kind, label):
    return re.search(rf"\b{re.escape(kind)}\b", label, re.IGNORECASE) is not None


def named_first(kind: str, label: str) -> str:
    """`named` at the start of a sentence: its first letter a capital."""
    text = named(kind, label)
    return text[:1].upper() + text[1:]


class Element(Protocol):
    """A two-port of the feed path, over a frequency array [Hz].

    Attributes
    ----------
    kind, label : str
        What it is (``line``, ``connector``, ``choke``, ``balun``, ``meter``, ``series``,
        ``shunt``, ``stub``, ``tuner``) and its name in the station.
    cable : Cable or None
        The cable of a line or a stub (its data range is checked); None for the others.
    output_balanced : bool
        Whether its antenna-side port is balanced (a balun, a balanced tuner).
    adapts_to_load : bool
        True for a tuner: its chain matrix depends on the load it sees, so a study calls
        ``design(frequency_hz, z_load_ohm)`` and uses the design's ``abcd`` instead of ``abcd``.
    """

    kind: str
    label: str
    cable: object
    output_balanced: bool
    adapts_to_load: bool

    def abcd(self, frequency_hz: np.ndarray) -> np.ndarray:
        """Chain matrix, shape (..., nf, 2, 2), output (antenna side) to input (radio side)."""

    def scaled_abcd(self, frequency_hz: np.ndarray):
        """The chain matrix, or a `ScaledAbcd` that stays finite for a very long lossy line."""

    def port_z0_ohm(self, frequency_hz: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
        """The impedances that SWR is measured against at its input and at its output [ohm]."""

    def matched_loss_db(self, frequency_hz: np.ndarray) -> np.ndarray:
        """Its loss when terminated in its own characteristic impedance (heat only) [dB]."""

    def readings(self, voltage_v, current_a, phase_mean, design=None) -> dict:
        """What it shows or how it is set (a meter's reading, a tuner's parts), per row."""

    def notices(self, frequency_hz: np.ndarray, labels) -> list[str]:
        """Warnings about itself (a choke too weak on some band)."""


class ElementDefaults:
    """The optional parts of `Element`: unbalanced output, a fixed chain matrix that needs no
    scaling, no readings and no notices. (Not ``cable``: a dataclass would take a class
    attribute of that name as the default of its ``cable`` field; see `PartDefaults`.)"""

    output_balanced = False
    adapts_to_load = False

    def scaled_abcd(self, frequency_hz):
        return self.abcd(frequency_hz)

    def readings(self, voltage_v, current_a, phase_mean, design=None):
        return {}

    def notices(self, frequency_hz, labels):
        return []


class PartDefaults(ElementDefaults):
    """`ElementDefaults` for an element that is not made of cable (``cable`` is None)."""

    cable = None
