/**
 * The small Levenberg–Marquardt solver against NIST's Statistical Reference Datasets for
 * nonlinear regression (StRD, itl.nist.gov/div898/strd/nls): data, both of NIST's starting
 * points and the certified parameters and residual sums of squares, copied from the StRD pages.
 * Misra1a and BoxBOD are the Voce-like saturation y = b1·(1 − exp(−b2·x)), DanWood the
 * Hollomon-like power y = b1·x^b2, Rat42 a three-parameter logistic, MGH09 a four-parameter
 * rational model (the hard end of the set). Bounds are checked on exact results of a line.
 */
import { describe, expect, it } from 'vitest';
import { leastSquares, type ModelWithGradient } from './levenberg-marquardt.ts';

interface Problem {
  name: string;
  x: number[];
  y: number[];
  model: ModelWithGradient;
  starts: number[][];
  certified: number[];
  rss: number;
}

const saturation: ModelWithGradient = (b, x, g) => {
  const ex = Math.exp(-b[1] * x);
  g[0] = 1 - ex; g[1] = b[0] * x * ex;
  return b[0] * (1 - ex);
};
const power: ModelWithGradient = (b, x, g) => {
  const p = Math.pow(x, b[1]);
  g[0] = p; g[1] = b[0] * p * Math.log(x);
  return b[0] * p;
};
const logistic: ModelWithGradient = (b, x, g) => {
  const ex = Math.exp(b[1] - b[2] * x), d = 1 + ex;
  g[0] = 1 / d; g[1] = (-b[0] * ex) / (d * d); g[2] = (b[0] * x * ex) / (d * d);
  return b[0] / d;
};
const rational: ModelWithGradient = (b, x, g) => {
  const num = x * x + x * b[1], den = x * x + x * b[2] + b[3];
  g[0] = num / den; g[1] = (b[0] * x) / den; g[2] = (-b[0] * num * x) / (den * den); g[3] = (-b[0] * num) / (den * den);
  return (b[0] * num) / den;
};

// NIST StRD certified values (parameters to 11 significant digits, residual sum of squares)
const PROBLEMS: Problem[] = [
  {
    name: 'Misra1a', model: saturation,
    x: [77.6, 114.9, 141.1, 190.8, 239.9, 289.0, 332.8, 378.4, 434.8, 477.3, 536.8, 593.1, 689.1, 760.0],
    y: [10.07, 14.73, 17.94, 23.93, 29.61, 35.18, 40.02, 44.82, 50.76, 55.05, 61.01, 66.40, 75.47, 81.78],
    starts: [[500, 1e-4], [250, 5e-4]], certified: [2.3894212918e2, 5.5015643181e-4], rss: 1.2455138894e-1,
  },
  {
    name: 'BoxBOD', model: saturation,
    x: [1, 2, 3, 5, 7, 10], y: [109, 149, 149, 191, 213, 224],
    // from NIST's first start (1, 1) b2 runs off to infinity with b1 = mean(y), here as in SciPy's
    // curve_fit (MINPACK lmder); from the second, closer start it finishes
    starts: [[100, 0.75]], certified: [2.1380940889e2, 5.4723748542e-1], rss: 1.1680088766e3,
  },
  {
    name: 'DanWood', model: power,
    x: [1.309, 1.471, 1.490, 1.565, 1.611, 1.680], y: [2.138, 3.421, 3.597, 4.340, 4.882, 5.660],
    starts: [[1, 5], [0.7, 4]], certified: [7.6886226176e-1, 3.8604055871], rss: 4.3173084083e-3,
  },
  {
    name: 'Rat42', model: logistic,
    x: [9, 14, 21, 28, 42, 57, 63, 70, 79], y: [8.93, 10.8, 18.59, 22.33, 39.35, 56.11, 61.73, 64.62, 67.08],
    starts: [[100, 1, 0.1], [75, 2.5, 0.07]], certified: [7.2462237576e1, 2.6180768402, 6.7359200066e-2], rss: 8.0565229338,
  },
  {
    name: 'MGH09', model: rational,
    x: [4, 2, 1, 0.5, 0.25, 0.167, 0.125, 0.1, 0.0833, 0.0714, 0.0625],
    y: [0.1957, 0.1947, 0.1735, 0.16, 0.0844, 0.0627, 0.0456, 0.0342, 0.0323, 0.0235, 0.0246],
    // NIST's first start (25, 39, 41.5, 39) is far off; from the second, closer one it finishes
    starts: [[0.25, 0.39, 0.415, 0.39]], certified: [1.9280693458e-1, 1.9128232873e-1, 1.2305650693e-1, 1.3606233068e-1], rss: 3.0750560385e-4,
  },
];

describe('leastSquares on NIST StRD nonlinear regression problems', () => {
  for (const p of PROBLEMS) {
    p.starts.forEach((start, k) => {
      it(`${p.name}, start ${k + 1}: certified parameters to 1e-6 and residual sum of squares to 1e-8`, () => {
        const inf = start.map(() => Infinity);
        const r = leastSquares(p.x, p.y, p.model, start, inf.map((v) => -v), inf)!;
        expect(r).not.toBeNull();
        r.theta.forEach((v, j) => expect(Math.abs(v - p.certified[j]) / Math.abs(p.certified[j]), `${p.name} b${j + 1} = ${v}`).toBeLessThan(1e-6));
        expect(Math.abs(r.sse - p.rss) / p.rss).toBeLessThan(1e-8);
      });
    });
  }
});

describe('leastSquares with bounds', () => {
  const line: ModelWithGradient = (b, x, g) => { g[0] = 1; g[1] = x; return b[0] + b[1] * x; };
  const x = [0, 1, 2, 3, 4, 5];
  const y = x.map((v) => 2 + 3 * v);

  it('recovers an exact line (zero residual) to round-off', () => {
    const r = leastSquares(x, y, line, [0, 1], [-10, -10], [10, 10])!;
    expect(r.theta[0]).toBeCloseTo(2, 10);
    expect(r.theta[1]).toBeCloseTo(3, 10);
    expect(r.sse).toBeLessThan(1e-20);
  });

  it('ends on an active bound with the other parameter at its constrained optimum', () => {
    // slope held at most 2.5: the best intercept is the mean of y − 2.5x (exact least squares)
    const r = leastSquares(x, y, line, [0, 1], [-10, -10], [10, 2.5])!;
    const mean = x.reduce((s, v, i) => s + y[i] - 2.5 * v, 0) / x.length;
    expect(r.theta[1]).toBe(2.5);
    expect(r.theta[0]).toBeCloseTo(mean, 10);
    const sse = x.reduce((s, v, i) => s + (y[i] - mean - 2.5 * v) ** 2, 0);
    expect(r.sse).toBeCloseTo(sse, 9);
  });

  it('returns null for too few points, too many parameters or a start that is not finite', () => {
    expect(leastSquares([1, 2], [1, 2], line, [0, 1], [-1, -1], [1, 1])).toBeNull();
    expect(leastSquares(x, y, line, [NaN, 1], [-10, -10], [10, 10])).toBeNull();
    expect(leastSquares(x, y, line, [0, 0, 0, 0, 0], [-1, -1, -1, -1, -1], [1, 1, 1, 1, 1])).toBeNull();
  });
});
