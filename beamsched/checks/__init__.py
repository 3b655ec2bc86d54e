"""The checks, run in this order for every span. Each module's optional ``prepare(contexts)``
works out what it can for a chunk of spans at once; its ``run(ctx)`` adds each span's results
(``ctx.result``, the fields of a :class:`~beamsched.model.CheckResult`) and trace lines to the
span context. Adding a check is adding a module here, with no change to any writer."""

from __future__ import annotations

from . import detailing, flexure, scope, serviceability, shear, torsion

CHECK_MODULES = [flexure, shear, torsion, detailing, serviceability, scope]

__all__ = ["CHECK_MODULES"]
