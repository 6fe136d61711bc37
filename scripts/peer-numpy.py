"""
A practitioner's vectorised NumPy/SciPy script, the peer of `fractile ingest` + `fractile reduce`
in the benchmark (scripts/bench-peer.ts): it reads a manifest in our format and every curve file
it names (np.loadtxt), and computes per test, the way one would by hand:

- engineering stress and strain from force (N or kN), extension (mm), S0 and L0;
- E by least squares (np.polyfit) over 10-40 % of Rp0.2 on the loading branch, the window
  rescaled on the Rp0.2 that E gives, three times (ISO 6892-1 / ASTM E111 practice); the strain
  origin moved to where the elastic line meets zero stress (toe);
- Rp0.2 (first crossing of the 0.2 % offset line, interpolated), Rt0.5 (total extension 0.5 %),
  Rm (maximum force), Ag (plastic extension at maximum force, %), all ISO 6892-1;
- true stress and strain to maximum force; n and K by ISO 10275 (log-log least squares over
  10-20 % engineering strain, capped at Ag);
- Hollomon, Swift, Voce and Ramberg-Osgood (E held at the measured modulus) fits with
  scipy.optimize.curve_fit on 80 points from Rp0.2 to maximum force (100 points from the start
  for Ramberg-Osgood), started from the log-log line.

Run with Debian's /usr/bin/python3 (NumPy and SciPy):
    /usr/bin/python3 scripts/peer-numpy.py MANIFEST OUT.json
Writes one JSON object {test_id: {modulus_gpa, rp02_mpa, rt05_mpa, rm_mpa, ag_pct, n_value,
k_mpa, fits}} and prints the wall time on stderr.
"""
import csv
import json
import math
import os
import sys
import time
import warnings

import numpy as np
from scipy.optimize import curve_fit

T0 = time.perf_counter()
warnings.simplefilter('ignore')

FORCE_N = {'N': 1.0, 'kN': 1000.0}
LENGTH_MM = {'mm': 1.0}


def read_curve(path):
    """Columns of a curve file by channel name, force in N and extension in mm."""
    with open(path) as f:
        header = None
        for skip, line in enumerate(f, 1):
            if not line.startswith('#'):
                header = line.strip().split(',')
                break
    data = np.loadtxt(path, delimiter=',', comments='#', skiprows=skip, ndmin=2)
    cols = {}
    for k, h in enumerate(header):
        name, unit = h.rstrip(']').split('[')
        scale = FORCE_N.get(unit) if name == 'force' else LENGTH_MM.get(unit) if name == 'extension' else 1.0
        cols[name] = data[:, k] * scale
    return cols


def crossing(g, y, x):
    """First index where g turns non-negative, interpolated linearly in y and x; None if never."""
    i = int(np.argmax(g >= 0))
    if g[i] < 0 or i == 0:
        return None
    t = -g[i - 1] / (g[i] - g[i - 1])
    return y[i - 1] + t * (y[i] - y[i - 1]), x[i - 1] + t * (x[i] - x[i - 1]), i


def modulus(e, s, imax):
    rise = s[:imax + 1]
    first_yield = rise.max()
    E = b = None
    for _ in range(3):
        hi_idx = int(np.argmax(rise >= 0.4 * first_yield))
        w = (rise[:hi_idx + 1] >= 0.1 * first_yield) & (rise[:hi_idx + 1] <= 0.4 * first_yield)
        E, b = np.polyfit(e[:hi_idx + 1][w], s[:hi_idx + 1][w], 1)
        origin = -b / E
        rp = crossing(e[:imax + 1] - origin - s[:imax + 1] / E - 0.002, s, e)
        if rp is None:
            break
        first_yield = rp[0]
    return E, -b / E


def hollomon(x, k, n):
    return k * x ** n


def swift(x, k, e0, n):
    return k * (e0 + x) ** n


def voce(x, s0, q, b):
    return s0 + q * (1 - np.exp(-b * x))


def reduce_test(cols, area, l0):
    s = cols['force'] / area
    e = cols['extension'] / l0
    imax = int(np.argmax(s))
    rm = s[imax]
    E, origin = modulus(e, s, imax)
    e = e - origin
    rp = crossing(e[:imax + 1] - s[:imax + 1] / E - 0.002, s, e)
    rt = crossing(e[:imax + 1] - 0.005, s, e)
    ag = 100 * (e[imax] - rm / E)
    et = np.log1p(e[:imax + 1])
    st = s[:imax + 1] * (1 + e[:imax + 1])
    ep = et - st / E
    eng = e[:imax + 1]
    win = (eng >= 0.10) & (eng <= min(0.20, ag / 100)) & (et > 0)
    n_value = k_mpa = None
    if win.sum() >= 5:
        n_value, lk = np.polyfit(np.log(et[win]), np.log(st[win]), 1)
        k_mpa = math.exp(lk)
    fits = {}
    start = rp[2] if rp else 0
    idx = np.unique(np.linspace(start, imax, 80).round().astype(int))
    x_t, x_p, y = et[idx], np.maximum(ep[idx], 0), st[idx]
    n0, lk0 = np.polyfit(np.log(x_t), np.log(y), 1)
    try:
        p, _ = curve_fit(hollomon, x_t, y, p0=[math.exp(lk0), n0])
        fits['hollomon'] = {'k_mpa': p[0], 'n': p[1]}
    except RuntimeError:
        fits['hollomon'] = None
    try:
        e00 = max(1e-6, (y[0] / math.exp(lk0)) ** (1 / n0) - x_p[0])
        p, _ = curve_fit(swift, x_p, y, p0=[math.exp(lk0), e00, n0], bounds=([1e-6, 1e-9, 1e-6], [1e7, 1, 2]))
        fits['swift'] = {'k_mpa': p[0], 'eps0': p[1], 'n': p[2]}
    except RuntimeError:
        fits['swift'] = None
    try:
        q0 = y.max() - y[0]
        p, _ = curve_fit(voce, x_p, y, p0=[y[0], q0, 1 / max(x_p[np.argmax(y >= y[0] + 0.632 * q0)], 1e-4)])
        fits['voce'] = {'sigma0_mpa': p[0], 'q_mpa': p[1], 'b': p[2]}
    except RuntimeError:
        fits['voce'] = None
    ro = np.unique(np.linspace(0, imax, 100).round().astype(int))
    ro = ro[(s[ro] > 0) & (e[ro] > 0)]
    sr, er = s[ro], e[ro] - s[ro] / E
    try:
        sig0 = rp[0] if rp else rm
        p, _ = curve_fit(lambda v, s0, m: 0.002 * (v / s0) ** m, sr, er, p0=[sig0, 10])
        fits['ramberg_osgood'] = {'e_mpa': E, 'sigma0_mpa': p[0], 'm': p[1]}
    except RuntimeError:
        fits['ramberg_osgood'] = None
    return {
        'modulus_gpa': E / 1000, 'rp02_mpa': rp[0] if rp else None, 'rt05_mpa': rt[0] if rt else None, 'rm_mpa': rm, 'ag_pct': ag,
        'n_value': n_value, 'k_mpa': k_mpa, 'fits': fits,
    }


def number(v):
    return float(v) if v not in (None, '') else None


def main():
    manifest, out = sys.argv[1], sys.argv[2]
    root = os.path.dirname(os.path.abspath(manifest))
    results = {}
    with open(manifest, newline='') as f:
        for row in csv.DictReader(f):
            if not row.get('curve'):
                continue
            shape = row['shape']
            if shape == 'round':
                area = math.pi * number(row['diameter[mm]']) ** 2 / 4
            elif shape == 'flat':
                area = number(row['thickness[mm]']) * number(row['width[mm]'])
            else:
                area = number(row['area[mm2]'])
            cols = read_curve(os.path.join(root, row['curve']))
            try:
                results[row['test_id']] = reduce_test(cols, area, number(row['gauge_length[mm]']))
            except (ValueError, TypeError, IndexError, np.linalg.LinAlgError) as err:
                results[row['test_id']] = {'error': str(err)}
    with open(out, 'w') as f:
        json.dump(results, f, default=float)
    sys.stderr.write(f'peer: {len(results)} tests in {time.perf_counter() - T0:.2f} s (after interpreter start)\n')


main()
