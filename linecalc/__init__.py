"""linecalc: transmission-line and station loss-budget engine."""
__version__ = "0.1.0"
