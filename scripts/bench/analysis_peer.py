"""Peer of scripts/bench/analysis.ts: the same read + segment + S-value work in NumPy.

Reads a CSV export (header line, then time/s, E/V, I/A), finds cycles from potential turning
points with the same hysteresis rule, and integrates Q+ and Q- per cycle by trapezoids split at
zero crossings. Prints one JSON object: elapsed ms (file read to S-values), rows, cycles, last S.
"""
import json
import sys
import time

import numpy as np


def turning_points(e, threshold):
    # Only local extrema can become turning points, so run the hysteresis over those.
    d = np.diff(e)
    nz = np.nonzero(d)[0]
    sgn = np.sign(d[nz])
    change = np.nonzero(sgn[1:] != sgn[:-1])[0]
    cand = np.concatenate(([0], nz[change] + 1, [len(e) - 1]))
    vals = e[cand]
    out = []
    direction = 0
    lo = hi = vals[0]
    lo_i = hi_i = 0
    ext = ext_i = 0
    for k in range(1, len(cand)):
        v = vals[k]
        if direction == 0:
            if v > hi:
                hi, hi_i = v, cand[k]
            if v < lo:
                lo, lo_i = v, cand[k]
            if hi - lo > threshold:
                if hi_i > lo_i:
                    if lo_i > 0:
                        out.append((lo_i, -1))
                    direction, ext, ext_i = 1, hi, hi_i
                else:
                    if hi_i > 0:
                        out.append((hi_i, 1))
                    direction, ext, ext_i = -1, lo, lo_i
        elif direction > 0:
            if v > ext:
                ext, ext_i = v, cand[k]
            elif ext - v > threshold:
                out.append((ext_i, 1))
                direction, ext, ext_i = -1, v, cand[k]
        else:
            if v < ext:
                ext, ext_i = v, cand[k]
            elif v - ext > threshold:
                out.append((ext_i, -1))
                direction, ext, ext_i = 1, v, cand[k]
    return out


def main(path):
    t0 = time.perf_counter()
    data = np.loadtxt(path, delimiter=",", skiprows=1)
    t, e, i = data[:, 0], data[:, 1], data[:, 2]

    # Hysteresis: ten typical steps (median non-zero |dE| over ~10 000 pairs), ≥ 2 mV, ≤ range/4.
    n = len(e)
    stride = max(1, (n - 1) // 10000)
    de = np.abs(e[1::stride] - e[0:-1:stride][: len(e[1::stride])])
    de = np.sort(de[de > 0])
    step = de[len(de) // 2] if len(de) else 0.0
    thr = min(max(10 * step, 0.002), (e.max() - e.min()) / 4)
    tps = turning_points(e, thr)

    outward = tps[0][1]
    bounds = [0]
    saw = False
    for idx, kind in tps:
        if kind == outward:
            saw = True
        elif saw:
            bounds.append(idx)
            saw = False
    if saw:
        bounds.append(n - 1)

    # Trapezoids split at zero crossings, all intervals at once; then summed per cycle.
    a, b = i[:-1], i[1:]
    dt = np.diff(t)
    both_pos = (a >= 0) & (b >= 0)
    both_neg = (a <= 0) & (b <= 0)
    cross = ~(both_pos | both_neg)
    with np.errstate(divide="ignore", invalid="ignore"):
        f = np.where(cross, a / (a - b), 0.0)
    qpos = np.where(both_pos, 0.5 * (a + b) * dt, 0.0)
    qneg = np.where(both_neg, -0.5 * (a + b) * dt, 0.0)
    up = cross & (a > 0)
    dn = cross & (a < 0)
    qpos += np.where(up, 0.5 * a * f * dt, 0.0) + np.where(dn, 0.5 * b * (1 - f) * dt, 0.0)
    qneg += np.where(up, -0.5 * b * (1 - f) * dt, 0.0) + np.where(dn, -0.5 * a * f * dt, 0.0)
    cpos = np.concatenate(([0.0], np.cumsum(qpos)))
    cneg = np.concatenate(([0.0], np.cumsum(qneg)))
    bnd = np.array(bounds)
    qp = cpos[bnd[1:]] - cpos[bnd[:-1]]
    qn = cneg[bnd[1:]] - cneg[bnd[:-1]]
    vmax = np.maximum.reduceat(e, bnd[:-1])
    vmin = np.minimum.reduceat(e, bnd[:-1])
    anodic = np.ptp(vmax) >= np.ptp(vmin)
    s = qp / qn - 1 if anodic else qn / qp - 1
    ms = (time.perf_counter() - t0) * 1000
    print(json.dumps({"ms": ms, "rows": int(n), "cycles": int(len(s)), "lastS": float(s[-1])}))


if __name__ == "__main__":
    main(sys.argv[1])
