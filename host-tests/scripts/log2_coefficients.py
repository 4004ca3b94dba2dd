#!/usr/bin/env python3
"""Coefficients of the f32 log2 in src/float/log2.rs.

log2 m = t * P(t^2) with t = (m - 1)/(m + 1) and m in [sqrt(1/2), sqrt(2)), so |t| <= 0.1716.
P approximates 2*atanh(t)/(t*ln 2) = (2/ln 2)(1 + t^2/3 + t^4/5 + ...) (Abramowitz & Stegun
4.1.27) on u = t^2 in [0, 0.02944]; mpmath's chebyfit gives the near-minimax polynomial
(interpolation at Chebyshev nodes) and its error. Run: python3 log2_coefficients.py (needs mpmath).
"""
import mpmath as mp

mp.mp.dps = 40
TMAX = (mp.sqrt(2) - 1) / (mp.sqrt(2) + 1)


def target(u):
    if u == 0:
        return 2 / mp.log(2)
    s = mp.sqrt(u)
    return 2 * mp.atanh(s) / (s * mp.log(2))


poly, err = mp.chebyfit(target, [0, TMAX**2], 3, error=True)
c5, c3, c1 = poly
print(f"C1 = {mp.nstr(c1, 12)}")
print(f"C3 = {mp.nstr(c3, 12)}")
print(f"C5 = {mp.nstr(c5, 12)}")
print(f"error of P: {mp.nstr(err, 4)}; of log2 (times |t| <= {mp.nstr(TMAX, 4)}): {mp.nstr(err * TMAX, 4)}")
