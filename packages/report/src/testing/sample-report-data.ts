/**
 * Invented report input for tests and timing: groups of an imaginary mill's grades and
 * suppliers, test curves from the Swift law σ = K (ε0 + εp)^n with scattered K and n, property
 * values from seeded normal draws, control series with a step shift. Nothing here is real data.
 * Not part of the package's public surface.
 */
import { DESIGN_VALUE_CAUTION } from '../caution.ts';
import type {
  CharacteristicCurve,
  ControlSeries,
  DriftAlert,
  PropertyStats,
  ReportData,
  ReportGroup,
  ReportProperty,
  SampleCurve,
} from '../types.ts';

/** Mulberry32: small seeded generator, so the fixture is the same on every run. */
function seeded(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

function gaussian(random: () => number): number {
  const u = Math.max(random(), 1e-12);
  return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * random());
}

/** Swift law, true stress [MPa] at true plastic strain εp [–]. */
export function swiftStressMpa(kMpa: number, epsilon0: number, n: number, plasticStrain: number): number {
  return kMpa * (epsilon0 + plasticStrain) ** n;
}

export interface SampleOptions {
  groups?: number;
  curvesPerGroup?: number;
  pointsPerCurve?: number;
  properties?: number;
  valuesPerProperty?: number;
  controlCharts?: number;
  /** Supplier label of the first group (to test escaping). */
  firstSupplier?: string;
  seed?: number;
}

const GRADES = ['G355', 'G460', 'G275', 'A6082'];
const SUPPLIERS = ['Northmill', 'Harbor Rolling', 'Eastfield Plate'];
const PROPERTIES: { key: string; mean: number; sd: number; spec: number | null }[] = [
  { key: 'rp02_mpa', mean: 392, sd: 14, spec: 355 },
  { key: 'rm_mpa', mean: 528, sd: 16, spec: 470 },
  { key: 'ag_pct', mean: 15.2, sd: 1.4, spec: null },
  { key: 'n_value', mean: 0.17, sd: 0.012, spec: null },
  { key: 'yt_ratio', mean: 0.74, sd: 0.02, spec: null },
  { key: 'a_pct', mean: 26.5, sd: 2.1, spec: 20 },
  { key: 'modulus_gpa', mean: 206, sd: 3.5, spec: null },
  { key: 'rt05_mpa', mean: 398, sd: 14, spec: null },
  { key: 'agt_pct', mean: 15.5, sd: 1.4, spec: null },
  { key: 'k_mpa', mean: 870, sd: 30, spec: null },
  { key: 'reh_mpa', mean: 405, sd: 15, spec: null },
  { key: 'yield_mpa', mean: 392, sd: 14, spec: 355 },
];

function mean(values: readonly number[]): number {
  return values.reduce((s, v) => s + v, 0) / values.length;
}

function statsOf(group: Record<string, string>, key: string, values: number[], spec: number | null): PropertyStats {
  const sorted = [...values].sort((a, b) => a - b);
  const m = mean(values);
  const sd = Math.sqrt(values.reduce((s, v) => s + (v - m) ** 2, 0) / (values.length - 1));
  const q = (p: number) => sorted[Math.min(sorted.length - 1, Math.max(0, Math.round(p * (sorted.length - 1))))];
  const nBelow = spec === null ? 0 : values.filter((v) => v < spec).length;
  const logs = values.map((v) => Math.log(v));
  const mu = mean(logs);
  const sigma = Math.sqrt(logs.reduce((s, v) => s + (v - mu) ** 2, 0) / (logs.length - 1));
  return {
    group,
    property: key,
    n: values.length,
    mean: m,
    sd,
    cov: sd / m,
    min: sorted[0],
    max: sorted[sorted.length - 1],
    median: q(0.5),
    percentiles: { p05: q(0.05), p50: q(0.5), p95: q(0.95) },
    fits: [
      { model: 'normal', params: { mean: m, sd }, ad: 0.31, p: 0.54 },
      { model: 'lognormal', params: { mu, sigma }, ad: 0.35, p: 0.47 },
    ],
    best_fit: 'normal',
    characteristic: [
      // invented factor for fixture values only; the stats stage computes the real ones
      { method: 'tolerance_normal', coverage: 0.95, confidence: 0.75, value: m - 1.8 * sd, note: null },
      { method: 'en1990_v_unknown', coverage: 0.95, confidence: null, value: m - 1.7 * sd, note: 'EN 1990 Annex D' },
    ],
    compliance:
      spec === null
        ? null
        : { lower: spec, upper: null, n_below: nBelow, n_above: 0, fraction_outside: nBelow / values.length, tail_below: 0.0021, tail_above: null, cpk: (m - spec) / (3 * sd) },
    warnings: values.length < 30 ? ['fewer than 30 values'] : [],
  };
}

export function sampleReportData(options: SampleOptions = {}): ReportData {
  const random = seeded(options.seed ?? 20240611);
  const groupCount = options.groups ?? 2;
  const curvesPerGroup = options.curvesPerGroup ?? 12;
  const pointsPerCurve = options.pointsPerCurve ?? 40;
  const propertyCount = Math.min(PROPERTIES.length, options.properties ?? 3);
  const valuesPerProperty = options.valuesPerProperty ?? 40;
  const groups: ReportGroup[] = [];

  for (let g = 0; g < groupCount; g++) {
    const key = {
      grade: GRADES[g % GRADES.length],
      supplier: g === 0 && options.firstSupplier !== undefined ? options.firstSupplier : SUPPLIERS[Math.floor(g / GRADES.length) % SUPPLIERS.length] + (g >= GRADES.length * SUPPLIERS.length ? ` ${g}` : ''),
    };
    const samples: SampleCurve[] = [];
    const validTo = 0.14;
    for (let c = 0; c < curvesPerGroup; c++) {
      const k = 880 + 30 * gaussian(random) + 20 * g;
      const n = 0.17 + 0.012 * gaussian(random);
      const end = validTo * (0.85 + 0.3 * random());
      const strain: number[] = [];
      const stress: number[] = [];
      for (let i = 0; i < pointsPerCurve; i++) {
        const ep = (end * i) / (pointsPerCurve - 1);
        strain.push(ep);
        stress.push(swiftStressMpa(k, 0.008, n, ep));
      }
      samples.push({ test_id: `T${g + 1}-${String(c + 1).padStart(3, '0')}`, plastic_strain: strain, stress_mpa: stress });
    }
    const grid = Array.from({ length: 61 }, (_, i) => (0.2 * i) / 60);
    const curve: CharacteristicCurve = {
      group: key,
      n: curvesPerGroup,
      plastic_strain: grid,
      median_mpa: grid.map((ep) => swiftStressMpa(880 + 20 * g, 0.008, 0.17, ep)),
      characteristic_mpa: grid.map((ep) => swiftStressMpa(830 + 20 * g, 0.008, 0.165, ep)),
      valid_to_plastic_strain: validTo,
      extrapolated_from: validTo,
      extrapolation: { law: 'swift' },
      idealized: {
        elastic_perfectly_plastic: { e_mpa: 206000, yield_mpa: 355 },
        bilinear: { e_mpa: 206000, yield_mpa: 355, hardening_modulus_mpa: 1480.5, tangent_modulus_mpa: 1469.9, rmse_mpa: 6.1 },
        multilinear: { plastic_strain: grid.slice(0, 12), stress_mpa: grid.slice(0, 12).map((ep) => swiftStressMpa(830, 0.008, 0.165, ep)), extrapolated: grid.slice(0, 12).map((ep) => ep > validTo) },
        ramberg_osgood: null,
      },
      provenance: {
        group: key,
        n_tests: curvesPerGroup,
        test_ids_sha256: 'c0ffee'.repeat(10) + 'c0ff',
        settings_hash: 'f00dfeed',
        generated_at: '2026-01-15T10:00:00.000Z',
        settings: { grid_points: 61, fractile: 0.05, confidence: 0.75 },
        code_version: '0.1.0',
        caution: DESIGN_VALUE_CAUTION,
      },
    };
    const properties: ReportProperty[] = PROPERTIES.slice(0, propertyCount).map((p) => {
      const values = Array.from({ length: valuesPerProperty }, () => p.mean + p.sd * gaussian(random));
      return { stats: statsOf(key, p.key, values, p.spec), values, headline_method: 'tolerance_normal' };
    });
    groups.push({ key, curves: curve, sample_curves: samples, properties });
  }

  const series: ControlSeries[] = [];
  const alerts: DriftAlert[] = [];
  const chartCount = options.controlCharts ?? 2;
  for (let s = 0; s < chartCount; s++) {
    const group = groups[s % groups.length].key;
    const property = s % 2 === 0 ? 'rp02_mpa' : 'rm_mpa';
    const base = property === 'rp02_mpa' ? 392 : 528;
    const sigma = 12;
    const lambda = 0.1;
    const L = 2.814;
    const k = 0.5;
    const h = 5.75;
    const half = L * sigma * Math.sqrt(lambda / (2 - lambda));
    let w = base;
    let hi = 0;
    let lo = 0;
    let prev: number | null = null;
    let firstOut = -1;
    const points = Array.from({ length: 60 }, (_, i) => {
      const date = new Date(Date.UTC(2023, 0, 3) + i * 6 * 86_400_000).toISOString().slice(0, 10);
      const value = base + (i >= 42 ? -22 : 0) + sigma * gaussian(random);
      const z = (value - base) / sigma;
      w = lambda * value + (1 - lambda) * w;
      hi = Math.max(0, hi + z - k);
      lo = Math.max(0, lo - z - k);
      if (firstOut < 0 && lo > h) firstOut = i;
      const mr = prev === null ? null : Math.abs(value - prev);
      prev = value;
      return {
        date, value, test_id: `D${s + 1}-${i + 1}`, lab: 'east', center: base, lcl: base - 3.5 * sigma, ucl: base + 3.5 * sigma,
        ewma: w, ewma_lcl: base - half, ewma_ucl: base + half, cusum_high: hi, cusum_low: lo, mr, mr_ucl: 3.267 * 1.128 * sigma,
      };
    });
    series.push({ group, property, points, spec_min: property === 'rp02_mpa' ? 355 : 470, cusum: { k, h }, ewma: { lambda, L }, panels: true, point_label: 'tests', structure_note: 'no heat effect shown' });
    if (firstOut >= 0) {
      alerts.push({
        id: `a1b2c3d4e5f${s}`,
        group,
        property,
        rule: 'cusum-low',
        first_date: points[firstOut].date,
        detected_on: points[firstOut].date,
        change_date: points[42].date,
        magnitude: -22,
        magnitude_unit: 'property-units',
        chart: 'tests',
        state: s === 0 ? 'acknowledged' : 'open',
        state_by: s === 0 ? 'R. Okafor' : null,
        state_note: s === 0 ? 'mill informed, certificates requested' : null,
        new: s !== 0,
        tests: points.slice(firstOut).filter((_, i) => i < 3).map((p) => ({ lab: p.lab, test_id: p.test_id })),
      });
    }
  }
  const box = (n: number, mean: number, sd: number) => ({ n, mean, q1: mean - 0.674 * sd, median: mean + 0.3, q3: mean + 0.674 * sd, whisker_low: mean - 2.5 * sd, whisker_high: mean + 2.6 * sd });
  const summaries = { Northmill: box(120, 401.2, 12.1), 'Harbor Rolling': box(95, 392.8, 14.3), Eastfield: box(60, 399.5, 10.2) };

  return {
    meta: {
      title: 'Tensile population report — Example Works',
      generated_at: '2024-06-11T08:30:00Z',
      code_version: '0.1.0+fixture',
      database: { engine: 'pglite', target: 'fractile-data' },
      settings_hashes: { reduce: '3f1c9a7e52', stats: '8b20d4c611' },
      catalog: {
        source: 'grades.json',
        hash: '9e107d9d372bb6826bd81d3542a419d6',
        grades: [
          { grade: 'G355', family: 'steel', yield_definition: 'rp0.2', spec: { yield_min_mpa: 355, tensile_min_mpa: 470, tensile_max_mpa: 630 } },
          { grade: 'G460', family: 'steel', yield_definition: 'rp0.2', spec: { yield_min_mpa: 460 } },
        ],
      },
      counts: { tests: 1234, curves: 1100, summary_only: 134, rejected: 3, failed: 2, flagged: 5 },
    },
    groups,
    drift: {
      result: {
        alerts,
        change_points: series.slice(0, 1).map((s) => ({ group: s.group, property: s.property, date: s.points[42].date, shift: -21.6, ci: [-28.9, -14.2] })),
        comparisons: [
          {
            grade: 'G355', property: 'rp02_mpa', test: 'welch-anova', statistic: 11.9, df: [2, 161.2], p: 1.6e-5, summaries,
            pairwise: [
              { a: 'Northmill', b: 'Harbor Rolling', method: 'games-howell', difference: 8.4, ci: [3.9, 12.9], level: 0.95, p: 3e-5 },
              { a: 'Northmill', b: 'Eastfield', method: 'games-howell', difference: 1.7, ci: [-2.3, 5.7], level: 0.95, p: 0.57 },
              { a: 'Harbor Rolling', b: 'Eastfield', method: 'games-howell', difference: -6.7, ci: [-11.6, -1.8], level: 0.95, p: 0.004 },
            ],
          },
          {
            grade: 'G355', property: 'rp02_mpa', test: 'kruskal-wallis', statistic: 21.4, df: [2], p: 2.3e-5, summaries,
            pairwise: [{ a: 'Northmill', b: 'Harbor Rolling', method: 'dunn-holm', p: 1e-5, p_adjusted: 3e-5 }],
          },
        ],
      },
      series,
      new_alerts: 1,
    },
    quality: {
      rejections: [
        { file: 'batch-07/manifest.csv', line: 18, column: 4, code: 'bad_date', message: 'tested_on "2023-13-01" is not an ISO 8601 date' },
        { file: 'batch-07/curves/T-0099.csv', line: 1, column: 2, code: 'unknown_unit', message: 'unit "kgf" of force is not known' },
        { file: 'batch-09/manifest.csv', line: null, column: null, code: 'duplicate_test', message: 'test_id T-0417 appears twice in lab default' },
      ],
      failed: [
        { lab: 'east', test_id: 'T-0311', code: 'no_elastic_part', message: 'no linear part found for the modulus fit' },
        { lab: 'east', test_id: 'T-0315', code: 'too_few_points', message: 'curve has 7 points, at least 20 needed' },
      ],
      flagged: [
        { lab: 'east', test_id: 'T-0201', flags: ['modulus_out_of_range'] },
        { lab: 'default', test_id: 'T-0440', flags: ['break_outside_gauge', 'noisy_signal'] },
      ],
    },
  };
}
