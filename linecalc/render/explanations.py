"""Explanations (``--explain``) as text for people: a paragraph per entry, after the table,
wrapped to a width. Formatting only: the sentences come from studies/explain.py."""
from __future__ import annotations

import re
import textwrap

# What each topic is about, as the paragraph's heading says it.
TOPIC_HEADINGS = {
    "swr": "SWR at the radio",
    "tuner": "the tuner",
    "alternative": "what would deliver more",
    "radio": "the radio",
    "watts": "where the watts go",
    "safety": "safety",
    "compare": "the comparison",
}
# Width of the text where the output is not a terminal [columns].
DEFAULT_WIDTH = 78
NARROWEST = 40  # a terminal narrower than this is wrapped at this width
# A number and its unit stay on one line: the space between them is held (a no-break space while
# wrapping; textwrap breaks only at ASCII whitespace).
_NUMBER_UNIT = re.compile(r"(\d) (?=(?:W|dB|V|m|ohm|%)\b)")
_HELD = "\u00a0"


def explanations_text(explanations, width=DEFAULT_WIDTH) -> str:
    """Every explanation as ``ROWS, topic: text``, wrapped to ``width`` columns (at least
    `NARROWEST`), a blank line between paragraphs; empty where there are none."""
    if not explanations:
        return ""
    width = max(int(width), NARROWEST)
    paragraphs = [textwrap.fill(_NUMBER_UNIT.sub(r"\1" + _HELD, f"{e.to_dict()['row']}, {TOPIC_HEADINGS[e.topic]}: "
                                                                 f"{e.text}"),
                                width=width, subsequent_indent="  ", break_on_hyphens=False).replace(_HELD, " ")
                  for e in explanations]
    return "\nIn words:\n\n" + "\n\n".join(paragraphs) + "\n"
