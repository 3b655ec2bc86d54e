"""Design codes behind one interface; look one up by its id."""

from __future__ import annotations

from .base import DesignCode, FlangeWidth, MaterialError, StressBlock
from .csa_a23_3_19 import CSAA23319

_REGISTRY: dict[str, type[DesignCode]] = {CSAA23319.id: CSAA23319}
_ALIASES = {"CSA A23.3-19": CSAA23319.id, "CSA A23.3:19": CSAA23319.id, "A23.3-19": CSAA23319.id,
            "CSA A23.3": CSAA23319.id, "CSA": CSAA23319.id}

DEFAULT_CODE = CSAA23319.id


def get_code(code_id: str | None = None) -> DesignCode:
    """Return the design code for an id such as ``"CSA A23.3-19"`` (None: the default)."""
    key = (code_id or DEFAULT_CODE).strip()
    key = _ALIASES.get(key, _ALIASES.get(key.upper(), key))
    if key not in _REGISTRY:
        raise KeyError(f"unknown design code '{code_id}': known codes are {', '.join(_REGISTRY)}")
    return _REGISTRY[key]()


def known_codes() -> list[str]:
    return list(_REGISTRY)


__all__ = ["DesignCode", "FlangeWidth", "MaterialError", "StressBlock", "get_code", "known_codes", "DEFAULT_CODE"]
