// Idealized curves and engineering counterparts of characteristic curves; sources beside each check.
import { execFileSync } from 'node:child_process';
import { describe, expect, it } from 'vitest';
import {
  characteristicCurve,
  DEFAULT_DESIGN_OPTIONS,
  engineeringCounterpart,
  fitRambergOsgoodPlastic,
  multilinearBreakpoints,
  rambergOsgoodPlasticStrain,
  type DesignOptions,
} from '../packages/pipeline/src/design/index.ts';
import { grid, lawCurve, normals, PROV, scipyLowerBound } from './design-fixtures.ts';

const opts = (o: Partial<DesignOptions> = {}): DesignOptions => ({ ...DEFAULT_DESIGN_OPTIONS, ...o });

describe('elastic–perfectly plastic and bilinear idealizations', () => {
  // Source: an exactly bilinear population σ = σy + H·εp with σy normal and H fixed: the stress is
  // linear in σy, so the characteristic curve is σy,char + H·εp and its least-squares hardening
  // modulus is H (law, exact); σy,char from scipy.stats.nct (ISO 16269-6).
  const g = grid(0, 0.08, 0.001);
  const H = 1450;
  const ys = normals(101, 24, 365, 18);
  const tests = ys.map((y, i) => lawCurve(`B-${i}`, g, (e) => y + H * e, 0.08, y, 205));
  const c = characteristicCurve({ group: { grade: 'TG-355' }, grid: g, tests }, opts(), PROV);
  const ref = scipyLowerBound(ys, 0.95, 0.75);

  it('EPP yield is the characteristic yield', () => {
    expect(c.characteristic_yield_mpa!).toBeCloseTo(ref.bound, 8);
    expect(c.idealized!.elastic_perfectly_plastic.yield_mpa).toBe(c.characteristic_yield_mpa);
    expect(c.idealized!.elastic_perfectly_plastic.e_mpa).toBe(205_000);
  });

  it('bilinear hardening modulus equals the analytic slope', () => {
    expect(c.idealized!.bilinear.hardening_modulus_mpa).toBeCloseTo(H, 6);
    expect(c.idealized!.bilinear.yield_mpa).toBe(c.characteristic_yield_mpa);
    expect(c.idealized!.bilinear.rmse_mpa).toBeLessThan(1e-6);
    // tangent modulus against total strain: 1/E_t = 1/E + 1/H (series springs, exact)
    expect(c.idealized!.bilinear.tangent_modulus_mpa!).toBeCloseTo(1 / (1 / 205_000 + 1 / H), 6);
  });
});

describe('Ramberg–Osgood parameter set', () => {
  // Source: REFERENCES.md, exact results of the laws: ε = σ/E + 0.002(σ/σ0)^m has Rp0.2 = σ0.
  // A population σ = σ0,i·(εp/0.002)^(1/m) with σ0 normal and m fixed is linear in σ0, so its
  // characteristic curve is the law with σ0,char (scipy.stats.nct) and the same m.
  const m = 9;
  const g = grid(0.002, 0.06, 0.001);
  const s0 = normals(202, 20, 280, 12);
  const tests = s0.map((s, i) => lawCurve(`R-${i}`, g, (e) => s * Math.pow(e / 0.002, 1 / m), 0.06, s, 70));
  const c = characteristicCurve({ group: { grade: 'AL-6X' }, grid: g, tests }, opts(), PROV);
  const ref = scipyLowerBound(s0, 0.95, 0.75);

  it('recovers σ0 = characteristic Rp0.2 and m', () => {
    const ro = c.idealized!.ramberg_osgood!;
    expect(ro.sigma0_mpa).toBeCloseTo(ref.bound, 6);
    expect(ro.m).toBeCloseTo(m, 6);
    expect(ro.e_mpa).toBe(70_000);
    expect(ro.rmse_mpa).toBeLessThan(1e-6);
    // the characteristic curve's stress at εp = 0.002 (its Rp0.2) is σ0 of the set
    expect(c.plastic_strain[0]).toBe(0.002);
    expect(c.characteristic_mpa[0]).toBeCloseTo(ro.sigma0_mpa, 6);
    // and the set, read back at σ0, has a plastic strain of exactly 0.2 %
    expect(rambergOsgoodPlasticStrain(ro.sigma0_mpa, ro.sigma0_mpa, ro.m)).toBe(0.002);
  });

  it('fits a noisy curve as numpy.polyfit does in log–log', () => {
    // Source: numpy.polyfit (least squares) of ln σ on ln(εp/0.002), via /usr/bin/python3.
    const x = grid(0.001, 0.05, 0.001);
    const y = x.map((e, i) => 300 * Math.pow(e / 0.002, 1 / 7) * (1 + 0.01 * Math.sin(3 * i)));
    const ref = JSON.parse(
      execFileSync('/usr/bin/python3', ['-c', 'import json,sys,numpy as np\nd=json.load(sys.stdin)\nu,a=np.polyfit(np.log(np.array(d["x"])/0.002),np.log(d["y"]),1)\nprint(json.dumps([float(u),float(a)]))'], {
        input: JSON.stringify({ x, y }),
        encoding: 'utf8',
      }),
    ) as [number, number];
    const fit = fitRambergOsgoodPlastic(x, y)!;
    expect(fit.m).toBeCloseTo(1 / ref[0], 9);
    expect(fit.sigma0Mpa).toBeCloseTo(Math.exp(ref[1]), 8);
    // σ0 held: the slope through (0, ln σ0) by numpy.linalg.lstsq
    const held = JSON.parse(
      execFileSync(
        '/usr/bin/python3',
        ['-c', 'import json,sys,numpy as np\nd=json.load(sys.stdin)\nX=np.log(np.array(d["x"])/0.002)[:,None]\nu=np.linalg.lstsq(X,np.log(d["y"])-np.log(310.0),rcond=None)[0][0]\nprint(json.dumps(float(u)))'],
        { input: JSON.stringify({ x, y }), encoding: 'utf8' },
      ),
    ) as number;
    const fitHeld = fitRambergOsgoodPlastic(x, y, 310)!;
    expect(fitHeld.sigma0Mpa).toBeCloseTo(310, 9);
    expect(fitHeld.m).toBeCloseTo(1 / held, 9);
  });

  it('takes σ0 from the characteristic curve at εp = 0.002 when the grid starts at 0', () => {
    // Source: REFERENCES.md — Rp0.2 = σ0 for the offset form; the curve's stress at 0.2 %
    // plastic strain is read by linear interpolation between grid points.
    const g0 = grid(0, 0.05, 0.0015);
    const s = normals(203, 15, 280, 12);
    const t0 = s.map((v, i) => lawCurve(`R0-${i}`, g0, (e) => v * Math.pow(0.001 + e, 0.12), 0.05, v * Math.pow(0.001, 0.12), 70));
    const c0 = characteristicCurve({ group: {}, grid: g0, tests: t0 }, opts(), PROV);
    const j = c0.plastic_strain.findIndex((e) => e > 0.002);
    const t = (0.002 - c0.plastic_strain[j - 1]) / (c0.plastic_strain[j] - c0.plastic_strain[j - 1]);
    const rp02 = c0.characteristic_mpa[j - 1] + t * (c0.characteristic_mpa[j] - c0.characteristic_mpa[j - 1]);
    expect(c0.idealized!.ramberg_osgood!.sigma0_mpa).toBeCloseTo(rp02, 9);
  });

  it('returns null without hardening', () => {
    expect(fitRambergOsgoodPlastic([0.001, 0.002, 0.003], [300, 300, 300])).toBeNull();
  });
});

describe('multilinear idealization', () => {
  // Source: exact — a curve that is piecewise linear with N − 1 segments is reproduced with zero
  // error by exactly its own N breakpoints (optimal segmentation by dynamic programming).
  it('finds the true breakpoints of a piecewise-linear curve', () => {
    const x = grid(0, 0.1, 0.001);
    const knots = [0, 0.012, 0.037, 0.07, 0.1];
    const ys = [350, 380, 410, 425, 432];
    const y = x.map((e) => {
      let j = 0;
      while (j < knots.length - 2 && e > knots[j + 1]) j++;
      return ys[j] + ((ys[j + 1] - ys[j]) * (e - knots[j])) / (knots[j + 1] - knots[j]);
    });
    const { indices } = multilinearBreakpoints(x, y, 5);
    expect(indices.map((i) => x[i])).toEqual(knots);
  });

  it('matches an exhaustive search of all breakpoint sets on a small curve', () => {
    // Source: exhaustive enumeration of every choice of interior breakpoints (the definition of
    // the optimum), against the dynamic programme.
    const x = grid(0, 0.011, 0.001);
    const y = x.map((e) => 320 + 2000 * Math.sqrt(e) + 30 * Math.sin(900 * e));
    const sse = (idx: number[]) => {
      let s = 0;
      for (let k = 0; k + 1 < idx.length; k++) {
        const [a, b] = [idx[k], idx[k + 1]];
        for (let i = a; i <= b; i++) {
          const f = y[a] + ((y[b] - y[a]) * (x[i] - x[a])) / (x[b] - x[a]);
          s += (y[i] - f) ** 2;
        }
      }
      return s;
    };
    for (const nPts of [3, 4, 5]) {
      let best = Infinity;
      const rec = (start: number, left: number, acc: number[]) => {
        if (left === 0) {
          best = Math.min(best, sse([0, ...acc, x.length - 1]));
          return;
        }
        for (let i = start; i < x.length - 1; i++) rec(i + 1, left - 1, [...acc, i]);
      };
      rec(1, nPts - 2, []);
      const { indices } = multilinearBreakpoints(x, y, nPts);
      expect(indices.length).toBe(nPts);
      expect(sse(indices)).toBeCloseTo(best, 6);
    }
  });

  it('has N points on the characteristic curve, first and last included', () => {
    const g = grid(0, 0.12, 0.001);
    const ks = normals(303, 15, 780, 30);
    const tests = ks.map((k, i) => lawCurve(`ML-${i}`, g, (e) => k * Math.pow(0.005 + e, 0.2), 0.12, k * Math.pow(0.005, 0.2)));
    const c = characteristicCurve({ group: { grade: 'TG-420' }, grid: g, tests }, opts({ multilinearPoints: 7 }), PROV);
    const ml = c.idealized!.multilinear;
    expect(ml.plastic_strain.length).toBe(7);
    expect(ml.plastic_strain[0]).toBe(c.plastic_strain[0]);
    expect(ml.plastic_strain[6]).toBe(c.plastic_strain[c.plastic_strain.length - 1]);
    ml.plastic_strain.forEach((e, i) => expect(ml.stress_mpa[i]).toBe(c.characteristic_mpa[c.plastic_strain.indexOf(e)]));
    // more points never fit worse (nested optimum): the largest gap to the curve shrinks
    const gap = (n: number) => {
      const { indices } = multilinearBreakpoints(c.plastic_strain, c.characteristic_mpa, n);
      let worst = 0;
      for (let s = 0; s + 1 < indices.length; s++) {
        const [a, b] = [indices[s], indices[s + 1]];
        for (let i = a; i <= b; i++) {
          const t = (c.plastic_strain[i] - c.plastic_strain[a]) / (c.plastic_strain[b] - c.plastic_strain[a]);
          worst = Math.max(worst, Math.abs(c.characteristic_mpa[i] - (c.characteristic_mpa[a] + t * (c.characteristic_mpa[b] - c.characteristic_mpa[a]))));
        }
      }
      return worst;
    };
    expect(gap(12)).toBeLessThan(gap(4));
  });
});

describe('engineering counterparts', () => {
  it('invert σ_t = σ_e(1 + e), ε_t = ln(1 + e)', () => {
    // Source: REFERENCES.md, exact results of the laws: σ_e = 400 MPa at e = 0.10 gives
    // σ_t = 440 MPa, ε_t = 0.09531; with ε_p = ε_t − σ_t/E.
    const E = 200_000;
    const epsP = Math.log(1.1) - 440 / E;
    const eng = engineeringCounterpart([epsP], [440], E)!;
    expect(eng.strain[0]).toBeCloseTo(0.1, 12);
    expect(eng.stress_mpa[0]).toBeCloseTo(400, 9);
    expect(engineeringCounterpart([0.01], [400], null)).toBeNull();
  });

  it('accompany the median and the characteristic curve', () => {
    const g = grid(0, 0.1, 0.002);
    const ks = normals(404, 12, 780, 30);
    const tests = ks.map((k, i) => lawCurve(`E-${i}`, g, (e) => k * Math.pow(0.005 + e, 0.2), 0.1, k * Math.pow(0.005, 0.2), 210));
    const c = characteristicCurve({ group: { grade: 'TG-420' }, grid: g, tests }, opts(), PROV);
    const eng = c.engineering!;
    expect(eng.characteristic.strain.length).toBe(c.plastic_strain.length);
    c.plastic_strain.forEach((e, i) => {
      const et = e + c.characteristic_mpa[i] / 210_000;
      expect(eng.characteristic.strain[i]).toBeCloseTo(Math.exp(et) - 1, 12);
      expect(eng.characteristic.stress_mpa[i] * (1 + eng.characteristic.strain[i])).toBeCloseTo(c.characteristic_mpa[i], 8);
      expect(eng.median.stress_mpa[i] * (1 + eng.median.strain[i])).toBeCloseTo(c.median_mpa[i], 8);
    });
  });
});
