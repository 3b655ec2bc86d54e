"""The checks, run in this order for every span. Each module's ``run(ctx)`` adds its
:class:`~beamsched.model.CheckResult` objects and trace lines to the span context; adding a
check is adding a module here, with no change to any writer."""

from __future__ import annotations

from . import detailing, flexure, scope, serviceability, shear, torsion

CHECK_MODULES = [flexure, shear, torsion, detailing, serviceability, scope]

__all__ = ["CHECK_MODULES"]
