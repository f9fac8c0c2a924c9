"""The two-port elements of the feed path, behind one protocol (`Element`)."""
from linecalc.elements.base import Element, ElementDefaults, PartDefaults
from linecalc.elements.line import Line, Stub
from linecalc.elements.parts import Choke, Connector, LumpedPart, Meter, Transformer, VoltageBalun
from linecalc.elements.tuner import Tuner

__all__ = ["Choke", "Connector", "Element", "ElementDefaults", "PartDefaults", "Line", "LumpedPart", "Meter", "Stub", "Transformer", "Tuner", "VoltageBalun"]
