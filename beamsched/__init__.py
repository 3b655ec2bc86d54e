"""beamsched: check a floor's concrete beam schedule against the design standard.

The results help a qualified engineer; the engineer of record must review them, and they do
not replace local codes or licensed practice.
"""

from __future__ import annotations

__version__ = "0.1.0"

CAUTION = (
    "beamsched results help a qualified engineer check a design; they do not replace the "
    "engineer of record's review, local codes or licensed practice. The engineer of record must "
    "review every result before it is relied on."
)

from .api import InputError, check_span  # noqa: E402
from .engine import check_beam  # noqa: E402
from .model import BeamInput, BeamResult, BeamStatus, CheckResult, CheckStatus  # noqa: E402

__all__ = ["check_span", "check_beam", "InputError", "BeamInput", "BeamResult", "BeamStatus",
           "CheckResult", "CheckStatus", "CAUTION", "__version__"]
