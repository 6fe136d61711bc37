/**
 * Hardening-law fits by nonlinear least squares (Levenberg–Marquardt with bounds,
 * levenberg-marquardt.ts, on the analytical gradients of the laws), each started from a
 * closed-form estimate:
 *
 * - Hollomon σt = K·εt^n (true stress on total true strain), start from the log–log line;
 * - Swift σt = K·(ε0 + εp)^n (true plastic strain), start from the log–log line on εp and
 *   ε0 = (σ_first/K)^(1/n); ε0 is kept positive (at least EPS0_MIN), and ends on that bound where
 *   the data ask for less (typical after a Lüders plateau);
 * - Voce σt = σ0 + Q·(1 − exp(−b·εp)), start σ0 = first stress, Q = rise, 1/b = εp at 63 % of Q;
 * - Ramberg–Osgood e = σ/E + 0.002·(σ/σ0)^m (engineering, fitted as strain on stress), σ0
 *   started from the 0.2 % offset, m from the last point. A given E (the test's measured modulus)
 *   is held and only σ0 and m are fitted, as the design curves' idealization does; without one,
 *   E is fitted too, started from the first tenth of the points. Held because the strain
 *   residuals of the whole curve hardly depend on E where the curve does not follow the law
 *   (plateau, Hollomon hardening): there the three-parameter optimum has E of 20–70 GPa on a
 *   steel (measured on generated curves, SciPy's curve_fit ends at the same point).
 *
 * The laws are those of their original papers (Hollomon 1945, Swift 1952, Voce 1948,
 * Ramberg & Osgood 1943; years from memory), as stated in any mechanics-of-materials text.
 *
 * In: strain (mm/mm) and stress (MPa) arrays of equal length; points with non-positive stress (or
 * non-positive strain for Hollomon, negative plastic strain for Swift/Voce) are skipped.
 * Out: parameters, the root-mean-square stress residual (MPa; for Ramberg–Osgood after solving
 * the law for stress at each strain) and the number of points; null with fewer than 5 points or
 * when the fit does not converge to finite values.
 */
import { leastSquares, type ModelWithGradient } from './levenberg-marquardt.ts';
import type { HollomonParams, LawFit, RambergOsgoodParams, SwiftParams, VoceParams } from './types.ts';

function pick(x: ArrayLike<number>, y: ArrayLike<number>, keep: (x: number, y: number) => boolean): [Float64Array, Float64Array] {
  let n = 0;
  for (let i = 0; i < x.length; i++) if (Number.isFinite(x[i]) && Number.isFinite(y[i]) && keep(x[i], y[i])) n++;
  const xs = new Float64Array(n), ys = new Float64Array(n);
  for (let i = 0, k = 0; i < x.length; i++) if (Number.isFinite(x[i]) && Number.isFinite(y[i]) && keep(x[i], y[i])) { xs[k] = x[i]; ys[k] = y[i]; k++; }
  return [xs, ys];
}

function logLogLine(x: ArrayLike<number>, y: ArrayLike<number>): { n: number; k: number } | null {
  let m = 0, sx = 0, sy = 0, sxx = 0, sxy = 0;
  for (let i = 0; i < x.length; i++) {
    if (!(x[i] > 0) || !(y[i] > 0)) continue;
    const lx = Math.log(x[i]), ly = Math.log(y[i]);
    m++; sx += lx; sy += ly; sxx += lx * lx; sxy += lx * ly;
  }
  if (m < 2) return null;
  const v = sxx - (sx * sx) / m;
  if (!(v > 0)) return null;
  const n = (sxy - (sx * sy) / m) / v;
  return { n, k: Math.exp((sy - n * sx) / m) };
}

/** Lower bound of the Swift pre-strain ε0 (the law needs ε0 > 0). */
const EPS0_MIN = 1e-9;

export const evalHollomon = (p: HollomonParams, eps: number): number => p.k_mpa * Math.pow(eps, p.n);
export const evalSwift = (p: SwiftParams, epsP: number): number => p.k_mpa * Math.pow(p.eps0 + epsP, p.n);
export const evalVoce = (p: VoceParams, epsP: number): number => p.sigma0_mpa + p.q_mpa * (1 - Math.exp(-p.b * epsP));
/** Engineering strain at a stress under Ramberg–Osgood. */
export const evalRambergOsgood = (p: RambergOsgoodParams, stressMpa: number): number =>
  stressMpa / p.e_mpa + 0.002 * Math.pow(Math.max(0, stressMpa) / p.sigma0_mpa, p.m);

/**
 * Stress at an engineering strain under Ramberg–Osgood: the law solved by Newton steps from above
 * (the strain is a convex increasing function of the stress, and both the elastic line and the
 * plastic term alone bound the stress from above, so the steps fall monotonically onto the root),
 * with bisection as a safeguard. One power per step; once a step is below 1e-9 of the stress the
 * next error is of the order of round-off (quadratic convergence), so that step is the last.
 */
export function rambergOsgoodStress(p: RambergOsgoodParams, strain: number): number {
  if (!(strain > 0)) return strain * p.e_mpa;
  const invE = 1 / p.e_mpa;
  let lo = 0, hi = strain * p.e_mpa;
  let s = Math.min(hi, p.sigma0_mpa * Math.pow(strain / 0.002, 1 / p.m));
  for (let it = 0; it < 100; it++) {
    const pw = 0.002 * Math.pow(s / p.sigma0_mpa, p.m);
    const f = s * invE + pw - strain;
    if (f > 0) hi = s; else lo = s;
    const df = invE + (p.m * pw) / s;
    let next = s - f / df;
    if (!(next > lo && next < hi)) next = (lo + hi) / 2;
    if (Math.abs(next - s) <= 1e-9 * s || f === 0) return next;
    s = next;
  }
  return s;
}

// The laws with their analytical gradients ∂f/∂θ, written for one exponential (and at most one
// logarithm) per point: Hollomon on u = ln ε and Ramberg–Osgood with E held on u = ln σ (the
// logarithms of the data taken once per fit), K·ε^n = K·exp(n·u). Same optimum as the laws in
// their own variables; about half the cost of Math.pow with a logarithm per point.
const hollomonModel: ModelWithGradient = (t, u, g) => {
  const p = Math.exp(t[1] * u);
  g[0] = p; g[1] = t[0] * p * u;
  return t[0] * p;
};
const swiftModel: ModelWithGradient = (t, e, g) => {
  const b = t[1] + e, lb = Math.log(b), p = Math.exp(t[2] * lb);
  g[0] = p; g[1] = (t[0] * t[2] * p) / b; g[2] = t[0] * p * lb;
  return t[0] * p;
};
const voceModel: ModelWithGradient = (t, e, g) => {
  const ex = Math.exp(-t[2] * e);
  g[0] = 1; g[1] = 1 - ex; g[2] = t[1] * e * ex;
  return t[0] + t[1] * (1 - ex);
};
/** strain on stress: e = σ/E + 0.002·(σ/σ0)^m, θ = (E, σ0, m) */
const rambergOsgoodModel: ModelWithGradient = (t, sv, g) => {
  const q = sv / t[1], lq = Math.log(q), p = 0.002 * Math.exp(t[2] * lq);
  g[0] = -sv / (t[0] * t[0]); g[1] = (-p * t[2]) / t[1]; g[2] = p * lq;
  return sv / t[0] + p;
};
/** plastic strain on u = ln σ with E held (the elastic part taken off the data): 0.002·(σ/σ0)^m, θ = (σ0, m) */
function rambergOsgoodPlasticModel(): ModelWithGradient {
  let sigma0 = NaN, lnSigma0 = 0; // ln σ0, recomputed only when σ0 changes
  return (t, u, g) => {
    if (t[0] !== sigma0) { sigma0 = t[0]; lnSigma0 = Math.log(sigma0); }
    const lq = u - lnSigma0, p = 0.002 * Math.exp(t[1] * lq);
    g[0] = (-p * t[1]) / t[0]; g[1] = p * lq;
    return p;
  };
}

function rmse(x: Float64Array, y: Float64Array, f: (x: number) => number): number {
  let s = 0;
  for (let i = 0; i < x.length; i++) { const r = y[i] - f(x[i]); s += r * r; }
  return Math.sqrt(s / x.length);
}

export function fitHollomon(strain: ArrayLike<number>, stressMpa: ArrayLike<number>): LawFit<HollomonParams> | null {
  const [x, y] = pick(strain, stressMpa, (e, s) => e > 0 && s > 0);
  if (x.length < 5) return null;
  const start = logLogLine(x, y);
  if (!start || !(start.n > 0)) return null;
  const u = x.map(Math.log);
  const r = leastSquares(u, y, hollomonModel, [start.k, start.n], [1e-6, 1e-6], [1e7, 2]);
  if (!r) return null;
  const params = { k_mpa: r.theta[0], n: r.theta[1] };
  return { params, rmseMpa: Math.sqrt(r.sse / x.length), points: x.length };
}

export function fitSwift(plasticStrain: ArrayLike<number>, stressMpa: ArrayLike<number>): LawFit<SwiftParams> | null {
  const [x, y] = pick(plasticStrain, stressMpa, (e, s) => e >= 0 && s > 0);
  if (x.length < 5) return null;
  const start = logLogLine(x, y);
  if (!start || !(start.n > 0)) return null;
  let iFirst = 0;
  for (let i = 1; i < x.length; i++) if (x[i] < x[iFirst]) iFirst = i;
  const eps0 = Math.min(0.5, Math.max(1e-6, Math.pow(y[iFirst] / start.k, 1 / start.n) - x[iFirst]));
  const r = leastSquares(x, y, swiftModel, [start.k, eps0, start.n], [1e-6, EPS0_MIN, 1e-6], [1e7, 1, 2]);
  if (!r) return null;
  const params = { k_mpa: r.theta[0], eps0: r.theta[1], n: r.theta[2] };
  return { params, rmseMpa: Math.sqrt(r.sse / x.length), points: x.length };
}

export function fitVoce(plasticStrain: ArrayLike<number>, stressMpa: ArrayLike<number>): LawFit<VoceParams> | null {
  const [x, y] = pick(plasticStrain, stressMpa, (e, s) => e >= 0 && s > 0);
  if (x.length < 5) return null;
  let iFirst = 0, yMax = -Infinity, xMax = 0;
  for (let i = 0; i < x.length; i++) { if (x[i] < x[iFirst]) iFirst = i; if (y[i] > yMax) yMax = y[i]; if (x[i] > xMax) xMax = x[i]; }
  const s0 = y[iFirst];
  const q0 = Math.max(yMax - s0, 1e-3 * yMax);
  let x63 = xMax;
  for (let i = 0; i < x.length; i++) if (y[i] >= s0 + 0.632 * q0 && x[i] < x63) x63 = x[i];
  const b0 = 1 / Math.max(x63 - x[iFirst], 1e-4);
  const r = leastSquares(x, y, voceModel, [s0, q0, b0], [1e-6, 0, 1e-6], [1e7, 1e7, 1e6]);
  if (!r) return null;
  const params = { sigma0_mpa: r.theta[0], q_mpa: r.theta[1], b: r.theta[2] };
  return { params, rmseMpa: Math.sqrt(r.sse / x.length), points: x.length };
}

export function fitRambergOsgood(strain: ArrayLike<number>, stressMpa: ArrayLike<number>, heldEMpa?: number | null): LawFit<RambergOsgoodParams> | null {
  const [s, e] = pick(stressMpa, strain, (sv, ev) => sv > 0 && ev > 0);
  if (s.length < 5) return null;
  const held = heldEMpa != null && heldEMpa > 0 ? heldEMpa : null;
  let e0 = held ?? NaN;
  if (!(e0 > 0)) {
    const m = Math.max(2, Math.floor(s.length / 10));
    let num = 0, den = 0;
    for (let i = 0; i < m; i++) { num += s[i] * e[i]; den += e[i] * e[i]; }
    e0 = num / den;
  }
  if (!(e0 > 0)) return null;
  let sig0 = NaN, last = 0;
  for (let i = 0; i < s.length; i++) {
    if (s[i] > s[last]) last = i;
    if (Number.isNaN(sig0) && e[i] - s[i] / e0 >= 0.002) sig0 = s[i];
  }
  if (!(sig0 > 0)) sig0 = s[last];
  const epLast = e[last] - s[last] / e0;
  const m0 = epLast > 0.002 && s[last] > sig0 ? Math.log(epLast / 0.002) / Math.log(s[last] / sig0) : 10;
  const m1 = Math.min(100, Math.max(2, m0));
  let params: RambergOsgoodParams;
  if (held !== null) {
    const u = s.map(Math.log), ep = e.map((ev, i) => ev - s[i] / held);
    const r = leastSquares(u, ep, rambergOsgoodPlasticModel(), [sig0, m1], [1e-3, 1.01], [1e7, 200]);
    if (!r) return null;
    params = { e_mpa: held, sigma0_mpa: r.theta[0], m: r.theta[1] };
  } else {
    const r = leastSquares(s, e, rambergOsgoodModel, [e0, sig0, m1], [1, 1e-3, 1.01], [1e7, 1e7, 200]);
    if (!r) return null;
    params = { e_mpa: r.theta[0], sigma0_mpa: r.theta[1], m: r.theta[2] };
  }
  return { params, rmseMpa: rmse(e, s, (ev) => rambergOsgoodStress(params, ev)), points: s.length };
}
