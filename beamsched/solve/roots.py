"""A bracketed root finder shared by the solvers, over columns: one row per equation."""

from __future__ import annotations

from collections.abc import Callable

import numpy as np

MAX_ITER = 200  # iterations, as many as any row may take


def bracketed_roots(fn: Callable[[np.ndarray, np.ndarray], np.ndarray], lo: np.ndarray, hi: np.ndarray,
                    f_lo: np.ndarray, f_hi: np.ndarray, tol_f: np.ndarray, tol_x: np.ndarray) -> np.ndarray:
    """Root of each row's increasing function, bracketed by fn(lo) < 0 < fn(hi).

    Illinois false position: it keeps the bracket like bisection (so it cannot diverge or step
    outside it) and converges superlinearly on the smooth pieces of a force balance. ``fn(x,
    rows)`` evaluates the function of the given rows at x; each row stops when |f| <= tol_f or
    its bracket is narrower than tol_x, and only rows still searching are evaluated again."""
    lo, hi, f_lo, f_hi = (np.array(v, float) for v in (lo, hi, f_lo, f_hi))
    out = hi.copy()
    rows = np.arange(len(lo))
    side = np.zeros(len(lo), np.int8)
    tol_f, tol_x = np.broadcast_to(tol_f, lo.shape), np.broadcast_to(tol_x, lo.shape)
    for _ in range(MAX_ITER):
        if not len(rows):
            break
        with np.errstate(divide="ignore", invalid="ignore"):
            x = (lo * f_hi - hi * f_lo) / (f_hi - f_lo)
        x = np.where((lo < x) & (x < hi), x, 0.5 * (lo + hi))
        f = fn(x, rows)
        out[rows] = x
        done = (np.abs(f) <= tol_f) | (hi - lo <= tol_x)
        below = f < 0
        f_hi = np.where(below & (side == -1), f_hi * 0.5, f_hi)
        f_lo = np.where(~below & (side == 1), f_lo * 0.5, f_lo)
        lo, f_lo = np.where(below, x, lo), np.where(below, f, f_lo)
        hi, f_hi = np.where(below, hi, x), np.where(below, f_hi, f)
        side = np.where(below, -1, 1).astype(np.int8)
        keep = ~done
        rows, lo, hi, f_lo, f_hi, side, tol_f, tol_x = (
            v[keep] for v in (rows, lo, hi, f_lo, f_hi, side, tol_f, tol_x))
    return out
