"""Which phase of an emulsion is continuous and which dispersed, by type."""
from __future__ import annotations

CONTINUOUS = {"O/W": "aqueous", "W/O": "oil"}
DISPERSED = {"O/W": "oil", "W/O": "aqueous"}
