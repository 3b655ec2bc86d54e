"""beamsched: check a floor's concrete beam schedule against the design standard.

The results help a qualified engineer; the engineer of record must review them, and they do
not replace local codes or licensed practice.
"""

from __future__ import annotations

from typing import TYPE_CHECKING

__version__ = "0.1.0"

CAUTION = (
    "beamsched results help a qualified engineer check a design; they do not replace the "
    "engineer of record's review, local codes or licensed practice. The engineer of record must "
    "review every result before it is relied on."
)

# The public names load on first use (PEP 562), so that ``beamsched --help`` and ``--version``
# answer without importing numpy and the checks (see the README's performance section).
if TYPE_CHECKING:  # what type checkers and editors see; at run time, __getattr__ below
    from .api import InputError, check_span
    from .engine import check_beam
    from .model import BeamInput, BeamResult, BeamStatus, CheckResult, CheckStatus

_PUBLIC = {
    "InputError": "api", "check_span": "api", "check_beam": "engine",
    "BeamInput": "model", "BeamResult": "model", "BeamStatus": "model", "CheckResult": "model",
    "CheckStatus": "model",
}

# a literal list, so that linters and type checkers see the public names
__all__ = ["check_span", "check_beam", "InputError", "BeamInput", "BeamResult", "BeamStatus",
           "CheckResult", "CheckStatus", "CAUTION", "__version__"]


def __getattr__(name: str):
    module = _PUBLIC.get(name)
    if module is None:
        raise AttributeError(f"module 'beamsched' has no attribute {name!r}")
    from importlib import import_module

    value = getattr(import_module(f".{module}", __name__), name)
    globals()[name] = value  # later reads find it directly
    return value


def __dir__() -> list[str]:
    return sorted(set(globals()) | set(__all__))
