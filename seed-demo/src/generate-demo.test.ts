import { createHash } from 'node:crypto';
import { existsSync, mkdtempSync, readFileSync, readdirSync, rmSync, statSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, relative } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { generateDemo } from './generate-demo.ts';
import type { DemoManifest } from './generate-demo.ts';
import { layoutHeader, FOREIGN_COLUMN_MAP } from './curve-format.ts';
import { lawTrueStress } from './hardening-laws.ts';
import type { HardeningLaw } from './hardening-laws.ts';
import { REJECTION_CODES } from './problem-files.ts';
import type { CurveLayout } from './scenario.ts';

type Row = Record<string, string>;

function readCsv(path: string): Row[] {
  const lines = readFileSync(path, 'utf8').trimEnd().split('\n');
  const header = lines[0].split(',');
  return lines.slice(1).map((l) => {
    const c = l.split(',');
    return Object.fromEntries(header.map((h, i) => [h, c[i] ?? '']));
  });
}

function walk(dir: string): string[] {
  const out: string[] = [];
  for (const e of readdirSync(dir).sort()) {
    const p = join(dir, e);
    if (statSync(p).isDirectory()) out.push(...walk(p));
    else out.push(p);
  }
  return out;
}

function hashes(dir: string): Map<string, string> {
  return new Map(walk(dir).map((p) => [relative(dir, p), createHash('sha256').update(readFileSync(p)).digest('hex')]));
}

/** Data lines of a curve file in our format: [header channels, rows of numbers, first data line number]. */
function readCurve(path: string): { header: string[]; rows: number[][]; firstLine: number } {
  const lines = readFileSync(path, 'utf8').trimEnd().split('\n');
  let i = 0;
  while (lines[i].startsWith('#')) i++;
  return { header: lines[i].split(','), rows: lines.slice(i + 1).map((l) => l.split(',').map(Number)), firstLine: i + 2 };
}

const quantile = (xs: number[], p: number): number => {
  const s = xs.slice().sort((a, b) => a - b);
  const h = (s.length - 1) * p;
  const lo = Math.floor(h);
  return s[lo] + (h - lo) * ((s[Math.min(lo + 1, s.length - 1)] ?? s[lo]) - s[lo]);
};
const mean = (xs: number[]): number => xs.reduce((a, b) => a + b, 0) / xs.length;
const sd = (xs: number[]): number => {
  const m = mean(xs);
  return Math.sqrt(xs.reduce((a, b) => a + (b - m) ** 2, 0) / (xs.length - 1));
};

let root: string;
let dir: string;
let demo: DemoManifest;
let truth: Row[];
const N = 2000;

beforeAll(() => {
  root = mkdtempSync(join(tmpdir(), 'fractile-demo-'));
  dir = join(root, 'demo');
  demo = generateDemo({ outDir: dir, tests: N, seed: 42, pointsPerCurve: 300 });
  truth = readCsv(join(dir, 'truth.csv'));
});

afterAll(() => {
  rmSync(root, { recursive: true, force: true });
});

describe('demo scenario generator', () => {
  it('is reproducible: same seed, byte-identical files (SHA-256); another seed differs', () => {
    const a = generateDemo({ outDir: join(root, 'a'), tests: 120, seed: 9, pointsPerCurve: 200 });
    generateDemo({ outDir: join(root, 'b'), tests: 120, seed: 9, pointsPerCurve: 200 });
    generateDemo({ outDir: join(root, 'c'), tests: 120, seed: 10, pointsPerCurve: 200 });
    const ha = hashes(join(root, 'a'));
    const hb = hashes(join(root, 'b'));
    const hc = hashes(join(root, 'c'));
    expect(ha.size).toBeGreaterThan(a.counts.curveFiles);
    expect([...hb.entries()]).toEqual([...ha.entries()]);
    const sameTruth = ha.get('truth.csv') === hc.get('truth.csv');
    expect(sameTruth).toBe(false);
    // a second run into the same folder replaces the first
    generateDemo({ outDir: join(root, 'a'), tests: 120, seed: 9, pointsPerCurve: 200 });
    expect([...hashes(join(root, 'a')).entries()]).toEqual([...ha.entries()]);
  });

  it('refuses to write into a non-empty folder that is not a demo folder', () => {
    expect(() => generateDemo({ outDir: join(root, 'a', 'quarrowdale'), tests: 5 })).toThrow(/not empty/);
  });

  it('writes the counts it reports, with 10–15 % summary-only records', () => {
    expect(demo.counts.tests).toBe(N);
    expect(truth.length).toBe(N);
    let rows = 0;
    let summary = 0;
    let curves = 0;
    for (const m of demo.manifests.filter((e) => e.role === 'data')) {
      const mdir = join(dir, m.path, '..');
      for (const r of readCsv(join(dir, m.path))) {
        rows++;
        if (r.curve === '') {
          summary++;
          expect(Number(r['yield[MPa]'])).toBeGreaterThan(0);
          expect(['rp0.2', 'rt0.5', 'reh', 'rel']).toContain(r.yield_definition);
          expect(Number(r['tensile[MPa]'])).toBeGreaterThan(Number(r['yield[MPa]']));
          expect(Number(r['elongation[%]'])).toBeGreaterThan(Number(r['uniform_elongation[%]']));
        } else {
          curves++;
          expect(existsSync(join(mdir, r.curve))).toBe(true);
          expect(r.curve.startsWith('curves')).toBe(true);
        }
      }
    }
    expect(rows).toBe(N);
    expect(summary).toBe(demo.counts.summaryOnly);
    expect(curves).toBe(demo.counts.curveTests);
    expect(summary / N).toBeGreaterThan(0.1);
    expect(summary / N).toBeLessThan(0.15);
    expect(Object.keys(demo.counts.bySupplier)).toHaveLength(4);
    expect(Object.keys(demo.counts.byGrade)).toHaveLength(3);
    for (const layout of Object.keys(demo.counts.byLayout) as CurveLayout[]) expect(demo.counts.byLayout[layout]).toBeGreaterThan(0);
    expect(demo.counts.unloadReload).toBeGreaterThan(0);
    const written = JSON.parse(readFileSync(join(dir, 'demo-manifest.json'), 'utf8')) as DemoManifest;
    expect(written.outDir).toBe('.');
    expect(written.counts).toEqual(demo.counts);
    expect(written.driftingSupplier).toBe(demo.driftingSupplier);
  });

  it('writes every curve header as its layout declares, inch geometry with lbf/in curves', () => {
    for (const t of truth) {
      if (t.curve === '') continue;
      const layout = t.layout as CurveLayout;
      const text = readFileSync(join(dir, t.curve), 'utf8');
      const lines = text.split('\n', 8);
      if (layout === 'foreign') {
        expect(lines[FOREIGN_COLUMN_MAP.header_row - 1].split(FOREIGN_COLUMN_MAP.delimiter)).toEqual(layoutHeader('foreign'));
        expect(lines[3]).toMatch(/^\d+,\d{3};-?\d+,\d{3};-?\d+,\d{4};-?\d+,\d{4}$/);
      } else {
        const header = lines.find((l) => !l.startsWith('#'))!;
        expect(header.split(',')).toEqual(layoutHeader(layout));
      }
    }
    // the foreign dialect's map names its columns
    const map = JSON.parse(readFileSync(join(dir, demo.manifests.find((m) => m.map)!.map!), 'utf8')) as typeof FOREIGN_COLUMN_MAP;
    expect(map).toEqual(FOREIGN_COLUMN_MAP);
    const header = layoutHeader('foreign');
    for (const ch of Object.values(map.channels)) {
      if (typeof ch.column === 'number') expect(ch.column).toBeLessThanOrEqual(header.length);
      else expect(header).toContain(ch.column);
    }
    // inch manifest: inch geometry that matches the specimen area the curve was simulated with
    const imp = demo.manifests.find((m) => m.path.includes('imperial'))!;
    const rows = readCsv(join(dir, imp.path));
    expect(Object.keys(rows[0])).toContain('gauge_length[in]');
    const byId = new Map(truth.map((t) => [t.test_id, t]));
    for (const r of rows) {
      const t = byId.get(r.test_id)!;
      expect(t.layout).toBe('lbf-in');
      const areaIn2 = r.shape === 'round' ? (Math.PI * Number(r['diameter[in]']) ** 2) / 4 : Number(r['thickness[in]']) * Number(r['width[in]']);
      expect(areaIn2 * 25.4 * 25.4).toBeCloseTo(Number(t.area_mm2), 2);
      expect(Number(r['gauge_length[in]']) * 25.4).toBeCloseTo(Number(t.gauge_length_mm), 6);
    }
    // about a tenth of the inch-lab mill's curves come in lbf/in
    const millCurves = truth.filter((t) => t.supplier === 'Quarrowdale Steel' && t.curve !== '').length;
    expect(rows.length / millCurves).toBeGreaterThan(0.05);
    expect(rows.length / millCurves).toBeLessThan(0.15);
  });

  it('keeps time strictly rising and force near Rm·S0 at its maximum in every kN/mm and N/mm curve', () => {
    let checked = 0;
    for (const t of truth) {
      if (t.layout !== 'kn-mm' && t.layout !== 'n-mm') continue;
      const { rows } = readCurve(join(dir, t.curve));
      const scale = t.layout === 'kn-mm' ? 1000 : 1;
      let fMax = 0;
      let backwards = 0;
      for (let i = 1; i < rows.length; i++) if (!(rows[i][0] > rows[i - 1][0])) backwards++;
      expect(backwards).toBe(0);
      for (const r of rows) fMax = Math.max(fMax, r[1] * scale);
      // maximum of the noisy force within 0.6 % of the law's Rm·S0 (noise sd ≤ 0.12 % of Fmax)
      expect(fMax / (Number(t.rm_mpa) * Number(t.area_mm2))).toBeCloseTo(1, 2);
      expect(rows.length).toBeGreaterThanOrEqual(300);
      if (t.law === 'plateau-swift') {
        // the upper yield point is recorded, not missed between samples
        const E = Number(t.modulus_gpa) * 1000;
        const eUpTo = Number(t.reh_mpa) / E + 0.003;
        let fUpper = 0;
        for (const r of rows) if (r[2] / Number(t.gauge_length_mm) < eUpTo) fUpper = Math.max(fUpper, r[1] * scale);
        expect(fUpper / (Number(t.reh_mpa) * Number(t.area_mm2))).toBeCloseTo(1, 2);
      }
      checked++;
    }
    expect(checked).toBeGreaterThan(1000);
  });

  it('gives curves consistent with the law they came from up to Ag (true stress σe(1+e) against the law)', () => {
    // the sources: σt = σe(1 + e), εt = ln(1 + e), εp = εt − σt/E (REFERENCES.md, exact results of
    // the laws); the laws as stated in hardening-laws.ts, with the parameters of truth.csv
    const perLaw = new Map<string, number[]>();
    for (const t of truth) {
      if ((t.layout !== 'kn-mm' && t.layout !== 'n-mm') || t.loop_at_strain !== '') continue;
      const forceScale = t.layout === 'kn-mm' ? 1000 : 1;
      const kind = t.law as HardeningLaw['kind'];
      const errs = perLaw.get(kind) ?? [];
      if (errs.length > 4000) continue;
      const E = Number(t.modulus_gpa) * 1000;
      let law: HardeningLaw;
      let eFrom: number;
      if (kind === 'plateau-swift') {
        law = { kind, modulusMpa: E, rehMpa: Number(t.reh_mpa), relMpa: Number(t.rel_mpa), ludersStrain: Number(t.ype_pct) / 100, serrationAmplitude: 0, kMpa: Number(t.k_mpa), n: Number(t.n_law), eps0: Number(t.eps0), epsPlateauEnd: Number(t.eps_plateau_end) };
        eFrom = Number(t.reh_mpa) / E + Number(t.ype_pct) / 100 + 0.01;
      } else if (kind === 'ramberg-osgood') {
        law = { kind, modulusMpa: E, sigma0Mpa: Number(t.sigma0_mpa), m: Number(t.m) };
        eFrom = Number(t.rp02_mpa) / E + 0.01;
      } else {
        law = { kind, modulusMpa: E, sigma0Mpa: Number(t.sigma0_mpa), qMpa: Number(t.q_mpa), b: Number(t.b) };
        eFrom = Number(t.rp02_mpa) / E + 0.005;
      }
      const eTo = 0.95 * (Number(t.agt_pct) / 100);
      const S0 = Number(t.area_mm2);
      const L0 = Number(t.gauge_length_mm);
      for (const r of readCurve(join(dir, t.curve)).rows) {
        const e = r[2] / L0;
        if (e < eFrom || e > eTo) continue;
        const sigE = (r[1] * forceScale) / S0;
        const sigT = sigE * (1 + e);
        const epsP = Math.log1p(e) - sigT / E;
        errs.push(sigT / lawTrueStress(law, epsP) - 1);
      }
      perLaw.set(kind, errs);
    }
    expect([...perLaw.keys()].sort()).toEqual(['plateau-swift', 'ramberg-osgood', 'voce']);
    for (const [, errs] of perLaw) {
      expect(errs.length).toBeGreaterThan(1000);
      // noise: force sd ≤ 0.12 % of Fmax; extension 0.3 µm plus a seating offset of a few µm
      expect(Math.abs(mean(errs))).toBeLessThan(0.002);
      expect(Math.sqrt(mean(errs.map((x) => x * x)))).toBeLessThan(0.004);
    }
  });

  it('has realistic populations: Ag per grade and a yield plateau only on the plateau grade', () => {
    const byGrade = (g: string, k: string): number[] => truth.filter((t) => t.grade === g).map((t) => Number(t[k]));
    // invented target ranges of the scenario (README): Ag ≈ 15–21 %, 5–8 %, 8–10 %
    expect(mean(byGrade('FX-360P', 'ag_pct'))).toBeGreaterThan(15);
    expect(mean(byGrade('FX-360P', 'ag_pct'))).toBeLessThan(21.5);
    expect(mean(byGrade('FX-690Q', 'ag_pct'))).toBeGreaterThan(5);
    expect(mean(byGrade('FX-690Q', 'ag_pct'))).toBeLessThan(8);
    expect(mean(byGrade('FX-270A', 'ag_pct'))).toBeGreaterThan(7.5);
    expect(mean(byGrade('FX-270A', 'ag_pct'))).toBeLessThan(10);
    const ype = byGrade('FX-360P', 'ype_pct');
    expect(Math.min(...ype)).toBeGreaterThanOrEqual(1);
    expect(Math.max(...ype)).toBeLessThanOrEqual(2.6);
    expect(truth.filter((t) => t.grade !== 'FX-360P' && t.reh_mpa !== '')).toHaveLength(0);
    // yield CoV within 4–6 % for a mill without drift (common practice for mill populations)
    const q = truth.filter((t) => t.grade === 'FX-360P' && t.supplier === 'Quarrowdale Steel').map((t) => Number(t.yield_mpa));
    expect(sd(q) / mean(q)).toBeGreaterThan(0.035);
    expect(sd(q) / mean(q)).toBeLessThan(0.065);
    // one mill stronger, one weaker
    const m = (s: string): number => mean(truth.filter((t) => t.grade === 'FX-360P' && t.supplier === s && t.tested_on < demo.driftFrom).map((t) => Number(t.yield_mpa)));
    expect(m('Quarrowdale Steel')).toBeGreaterThan(m('Marrisford Rolling'));
    expect(m('Eskerholm Plate & Bar')).toBeLessThan(m('Marrisford Rolling'));
  });

  it('sets the catalog minima below the 5 % quantiles of every non-drifting population', () => {
    const catalog = JSON.parse(readFileSync(join(dir, demo.catalog), 'utf8')) as {
      grades: Record<string, { yield_definition: string; spec: Record<string, number | null> }>;
    };
    expect(catalog.grades['FX-360P'].yield_definition).toBe('reh');
    expect(catalog.grades['FX-690Q'].yield_definition).toBe('rp0.2');
    const groups = new Map<string, Row[]>();
    for (const t of truth) {
      if (t.supplier === demo.driftingSupplier && t.grade === demo.driftingGrade && t.tested_on >= demo.driftFrom) continue;
      const k = `${t.grade}|${t.supplier}`;
      groups.set(k, [...(groups.get(k) ?? []), t]);
    }
    expect(groups.size).toBe(7);
    for (const [k, rows] of groups) {
      const spec = catalog.grades[k.split('|')[0]].spec;
      const y = rows.map((r) => Number(r.yield_mpa));
      const rm = rows.map((r) => Number(r.rm_mpa));
      expect(quantile(y, 0.05)).toBeGreaterThan(spec.yield_min_mpa!);
      expect(quantile(rm, 0.05)).toBeGreaterThan(spec.tensile_min_mpa!);
      if (spec.tensile_max_mpa !== null) expect(quantile(rm, 0.95)).toBeLessThan(spec.tensile_max_mpa!);
      expect(quantile(rows.map((r) => Number(r.a_pct)), 0.05)).toBeGreaterThan(spec.elongation_min_pct!);
      if (spec.yt_max !== null) expect(quantile(rows.map((r) => Number(r.yield_mpa) / Number(r.rm_mpa)), 0.95)).toBeLessThan(spec.yt_max!);
    }
  });

  it('drifts the named mill down by about 1σ on average over its last year, approaching the minimum', () => {
    const cell = truth.filter((t) => t.supplier === demo.driftingSupplier && t.grade === demo.driftingGrade);
    const before = cell.filter((t) => t.tested_on < demo.driftFrom);
    const after = cell.filter((t) => t.tested_on >= demo.driftFrom);
    const lastQuarter = after.filter((t) => t.tested_on >= '2025-10-01');
    const y = (rows: Row[]): number[] => rows.map((r) => Number(r.yield_mpa));
    const s = sd(y(before));
    // a linear ramp to −2σ over the year: the year's mean shift is −1σ, the last quarter's −1.75σ
    const shift = (mean(y(after)) - mean(y(before))) / s;
    expect(shift).toBeLessThan(-0.6);
    expect(shift).toBeGreaterThan(-1.5);
    expect((mean(y(lastQuarter)) - mean(y(before))) / s).toBeLessThan(-1.2);
    // tensile moves about half as much (in MPa)
    const rm = (rows: Row[]): number[] => rows.map((r) => Number(r.rm_mpa));
    const ratio = (mean(rm(after)) - mean(rm(before))) / (mean(y(after)) - mean(y(before)));
    expect(ratio).toBeGreaterThan(0.2);
    expect(ratio).toBeLessThan(0.8);
    // approaching but mostly above the minimum
    const min = 360;
    expect(after.filter((r) => Number(r.yield_mpa) < min).length / after.length).toBeLessThan(0.15);
    expect(mean(y(lastQuarter)) - min).toBeLessThan(1.6 * s);
    // the other populations do not move
    for (const sup of ['Quarrowdale Steel', 'Eskerholm Plate & Bar']) {
      const c = truth.filter((t) => t.supplier === sup && t.grade === demo.driftingGrade);
      const b = y(c.filter((t) => t.tested_on < demo.driftFrom));
      const a = y(c.filter((t) => t.tested_on >= demo.driftFrom));
      expect(Math.abs(mean(a) - mean(b)) / sd(b)).toBeLessThan(0.5);
    }
  });

  it('writes each deliberately bad input with its expected rejection', () => {
    const codes = new Set(demo.expectedRejections.map((r) => r.code));
    expect([...codes].sort()).toEqual([...REJECTION_CODES].sort());
    for (const r of demo.expectedRejections) {
      const file = join(dir, r.file);
      expect(existsSync(file), r.file).toBe(true);
      const raw = readFileSync(file);
      const lines = raw.toString('utf8').split('\n');
      const at = r.line === null ? '' : lines[r.line - 1];
      switch (r.code) {
        case 'not_utf8':
          expect(() => new TextDecoder('utf-8', { fatal: true }).decode(raw)).toThrow();
          expect(() => new TextDecoder('utf-8', { fatal: true }).decode(Buffer.from(raw.toString('latin1').split('\n')[r.line! - 1], 'latin1'))).toThrow();
          break;
        case 'not_a_number':
          expect(at).toMatch(/ERR|2O\.50/);
          break;
        case 'not_finite':
          expect(at).toMatch(/,(NaN|Infinity)(,|$)/);
          break;
        case 'unknown_unit':
          expect(at).toContain('force[tonf]');
          break;
        case 'missing_channel':
          expect(at).toBe('time[s],force[kN]');
          break;
        case 'curve_too_short': {
          const data = lines.filter((l) => l !== '' && !l.startsWith('#')).length - 1;
          expect(data).toBeLessThan(20);
          break;
        }
        case 'time_not_monotonic':
          expect(Number(at.split(',')[0])).toBeLessThan(Number(lines[r.line! - 2].split(',')[0]));
          break;
        case 'missing_curve_file':
          expect(existsSync(join(dir, 'problems', at.split(',')[14]))).toBe(false);
          break;
        case 'path_escapes_folder':
          expect(at.split(',')[14]).toBe('../escaped-curve.csv');
          expect(existsSync(join(dir, 'escaped-curve.csv'))).toBe(true);
          break;
        case 'nonpositive_dimension':
          expect(at).toMatch(/,(0\.00|-10\.00),/);
          break;
        case 'unknown_shape':
          expect(at.split(',')[6]).toBe('hexagonal');
          break;
        case 'invalid_date':
          expect(at.split(',')[5]).toBe('2024-02-30');
          break;
        case 'missing_value':
          expect(at.split(',')[5]).toBe('');
          break;
        case 'conflict': {
          const prev = lines[r.line! - 2].split(',');
          const cur = at.split(',');
          expect(cur[0]).toBe(prev[0]);
          expect(cur[1]).toBe(prev[1]);
          expect(cur.join(',')).not.toBe(prev.join(','));
          break;
        }
        case 'missing_column':
          expect(at.split(',')).not.toContain('grade');
          break;
      }
    }
    expect(demo.manifests.filter((m) => m.role === 'problems').map((m) => m.path).sort()).toEqual([...new Set(demo.expectedRejections.map((r) => r.manifest))].sort());
  });

  it('unloads along the elastic slope in unload–reload curves and freezes extension after extensometer removal', () => {
    let loops = 0;
    for (const t of truth.filter((x) => x.loop_at_strain !== '').slice(0, 10)) {
      const { rows } = readCurve(join(dir, t.curve));
      let iTop = 0;
      // the loop starts where the extension first runs back (by more than its noise)
      for (let i = 1; i < rows.length && iTop === 0; i++) if (rows[i][2] < rows[i - 1][2] - 0.001) iTop = i - 1;
      expect(rows[iTop][2] / Number(t.gauge_length_mm)).toBeCloseTo(Number(t.loop_at_strain), 2);
      let iLow = iTop;
      for (let i = iTop; i < iTop + 80; i++) if (rows[i][1] < rows[iLow][1]) iLow = i;
      expect(rows[iLow][1] / rows[iTop][1]).toBeLessThan(0.15);
      const scale = t.layout === 'kn-mm' ? 1000 : 1;
      const slope = ((rows[iTop][1] - rows[iLow][1]) * scale) / (rows[iTop][2] - rows[iLow][2]);
      const elastic = (Number(t.modulus_gpa) * 1000 * Number(t.area_mm2)) / Number(t.gauge_length_mm);
      // "unloading from the hardening region follows the initial elastic slope" (REFERENCES.md, common practice)
      expect(slope / elastic).toBeCloseTo(1, 1);
      loops++;
    }
    expect(loops).toBeGreaterThan(0);
    let removed = 0;
    for (const t of truth.filter((x) => x.layout === 'extensometer-removed').slice(0, 10)) {
      const { rows, header } = readCurve(join(dir, t.curve));
      expect(header).toContain('crosshead[mm]');
      const tail = rows.slice(-20);
      expect(new Set(tail.map((r) => r[2])).size).toBe(1);
      expect(new Set(tail.map((r) => r[1])).size).toBeGreaterThan(10);
      expect(tail[19][3]).toBeGreaterThan(tail[0][3]);
      removed++;
    }
    expect(removed).toBeGreaterThan(0);
  });
});
