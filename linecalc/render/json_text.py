"""Results as JSON text: the document of a result's ``to_dict`` (described in docs/json.md)."""
from __future__ import annotations

import json


def to_json(document) -> str:
    """JSON text of a result document (no NaN or infinity: ``to_dict`` gives those as null)."""
    return json.dumps(document, indent=2, allow_nan=False) + "\n"
