"""A bracketed root finder shared by the solvers."""

from __future__ import annotations

from collections.abc import Callable


def bracketed_root(
    fn: Callable[[float], float], lo: float, hi: float, f_lo: float, f_hi: float,
    tol_f: float, tol_x: float, max_iter: int = 200,
) -> float:
    """Root of an increasing function bracketed by fn(lo) < 0 < fn(hi).

    Illinois false position: it keeps the bracket like bisection (so it cannot diverge or step
    outside it) and converges superlinearly on the smooth pieces of a force balance.
    """
    x, side = hi, 0
    for _ in range(max_iter):
        x = (lo * f_hi - hi * f_lo) / (f_hi - f_lo)
        if not (lo < x < hi):
            x = 0.5 * (lo + hi)
        f = fn(x)
        if abs(f) <= tol_f or hi - lo <= tol_x:
            return x
        if f < 0:
            lo, f_lo = x, f
            if side == -1:
                f_hi *= 0.5
            side = -1
        else:
            hi, f_hi = x, f
            if side == 1:
                f_lo *= 0.5
            side = 1
    return x
