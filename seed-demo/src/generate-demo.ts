/**
 * Generates the invented demo scenario (see scenario.ts and the package README): manifests in
 * the project's manifest format, one curve file per test written as it is simulated, a grade
 * catalog, a truth table of the exact per-test properties of the laws the curves came from,
 * the deliberately bad inputs, and `demo-manifest.json` describing it all.
 *
 * Reproducible: everything random comes from the seeded generator of random.ts — the scenario
 * plan from one stream, each test's curve from its own stream (seed, test number) — and nothing
 * reads the clock, so the same options give byte-identical files.
 */
import { existsSync, mkdirSync, readdirSync, rmSync, writeFileSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { CsvFileWriter } from './csv-writer.ts';
import type { Cell } from './csv-writer.ts';
import { AsciiBuffer } from './ascii-buffer.ts';
import { FOREIGN_COLUMN_MAP, IN_MM, formatCurveCsv } from './curve-format.ts';
import { dayOf, isoOf, yearOf } from './dates.ts';
import { Rng, mixSeed } from './random.ts';
import { CERTIFICATES, DRIFT, FABRICATOR, MILLS, SPECIAL_SHARES, SUMMARY_ONLY_SHARE, WINDOW_END, WINDOW_START, catalogJson, gradeDef } from './scenario.ts';
import type { CurveLayout, GradeDef, MillDef } from './scenario.ts';
import { simulateTest } from './simulate-test.ts';
import type { SimulatedTest } from './simulate-test.ts';
import { METRIC_HEADER, writeProblemFiles } from './problem-files.ts';
import type { ExpectedRejection } from './problem-files.ts';

export interface DemoOptions {
  outDir: string;
  /** number of good test records (curve and summary-only), default 2000 */
  tests?: number;
  seed?: number;
  /** points per curve, default 1500 */
  pointsPerCurve?: number;
}

export interface DemoManifestEntry {
  /** relative to the demo folder, `/`-separated */
  path: string;
  /** column map for the manifest's curve files, relative to the demo folder, or null */
  map: string | null;
  /** `problems`: every record but the ones counted as accepted is expected to be rejected */
  role: 'data' | 'problems';
}

export interface DemoCounts {
  tests: number;
  curveTests: number;
  summaryOnly: number;
  /** curve tests that also carry certificate values (CERTIFICATES in scenario.ts) */
  certificates: number;
  curveFiles: number;
  bySupplier: Record<string, number>;
  byGrade: Record<string, number>;
  byLayout: Record<CurveLayout, number>;
  unloadReload: number;
  /** tests of the drifting supplier and grade within the drift period */
  drifting: number;
  manifests: number;
  problemRows: number;
  problemRowsAccepted: number;
  expectedRejections: number;
}

export interface DemoManifest {
  /** the demo folder; in demo-manifest.json written as "." (all paths are relative to it) */
  outDir: string;
  fabricator: string;
  seed: number;
  pointsPerCurve: number;
  window: { from: string; to: string };
  manifests: DemoManifestEntry[];
  catalog: string;
  /** per-test exact properties of the generating laws (CSV) */
  truth: string;
  expectedRejections: ExpectedRejection[];
  driftingSupplier: string;
  driftingGrade: string;
  driftFrom: string;
  counts: DemoCounts;
}

interface Planned {
  mill: MillDef;
  grade: GradeDef;
  day: number;
  heat: string;
  heatEffect: number;
  product: 'plate' | 'bar';
  nominalMm: number;
  channel: 'std' | 'imperial' | 'foreign';
  summary: boolean;
  layout: CurveLayout;
  loop: boolean;
  orientation: string;
}

const TRUTH_HEADER = [
  'lab',
  'test_id',
  'supplier',
  'grade',
  'heat',
  'tested_on',
  'manifest',
  'curve',
  'layout',
  'law',
  'modulus_gpa',
  'reh_mpa',
  'rel_mpa',
  'rel_min_mpa',
  'rp02_mpa',
  'rt05_mpa',
  'rm_mpa',
  'ag_pct',
  'agt_pct',
  'a_pct',
  'ype_pct',
  'yield_mpa',
  'yield_definition',
  'n_law',
  'k_mpa',
  'eps0',
  'eps_plateau_end',
  'sigma0_mpa',
  'm',
  'q_mpa',
  'b',
  'area_mm2',
  'gauge_length_mm',
  'loop_at_strain',
  'extensometer_removed_at_strain',
  'yield_shift_mpa',
] as const;

const IMPERIAL_HEADER = METRIC_HEADER.map((h) => h.replace('[mm2]', '[in2]').replace('[mm]', '[in]'));

const fx = (x: number | null | undefined, d: number): string => (x === null || x === undefined || !Number.isFinite(x) ? '' : x.toFixed(d));
const slug = (s: string): string => s.toLowerCase().replace(/[^a-z0-9]+/g, '-').replace(/^-|-$/g, '');
const roundTo = (x: number, step: number): number => Math.round(x / step) * step;

/** Yield of a test's truth per the grade's definition. */
function truthYield(sim: SimulatedTest, grade: GradeDef): number {
  const t = sim.curve.truth;
  switch (grade.yieldDefinition) {
    case 'reh':
      return t.rehMpa ?? t.rp02Mpa;
    case 'rel':
      return t.relMpa ?? t.rp02Mpa;
    case 'rt0.5':
      return t.rt05Mpa;
    case 'rp0.2':
      return t.rp02Mpa;
  }
}

/** Plans the tests of the scenario: who, what, when, from which heat, in which layout. */
function plan(total: number, rng: Rng): Planned[] {
  const start = dayOf(WINDOW_START);
  const end = dayOf(WINDOW_END);
  const cells: { mill: MillDef; grade: GradeDef; n: number }[] = [];
  for (const mill of MILLS) for (const g of mill.grades) cells.push({ mill, grade: gradeDef(g.grade), n: Math.round(total * g.share) });
  const diff = total - cells.reduce((a, c) => a + c.n, 0);
  cells.reduce((a, c) => (c.n > a.n ? c : a), cells[0]).n += diff;
  const out: Planned[] = [];
  for (const mill of MILLS) {
    const mine: Planned[] = [];
    let heatNo = 0;
    for (const cell of cells.filter((c) => c.mill === mill)) {
      const sizes: number[] = [];
      for (let left = cell.n; left > 0; ) {
        const s = Math.min(left, rng.int(1, 5));
        sizes.push(s);
        left -= s;
      }
      const heatDays = sizes.map(() => rng.int(start, end - 7)).sort((a, b) => a - b);
      sizes.forEach((size, h) => {
        heatNo++;
        const hd = heatDays[h];
        const product: 'plate' | 'bar' = rng.chance(cell.grade.barShare) ? 'bar' : 'plate';
        const nominalMm = product === 'bar' ? rng.pick(cell.grade.barDiameterMm) : rng.pick(cell.grade.plateThicknessMm);
        const heat = `${mill.code[0]}${String(yearOf(hd)).slice(2)}-${String(1000 + heatNo * 7).padStart(4, '0')}`;
        const heatEffect = cell.grade.covHeat * rng.normal();
        for (let k = 0; k < size; k++) {
          const day = Math.min(end, hd + rng.int(0, 10));
          const summary = rng.chance(SUMMARY_ONLY_SHARE[yearOf(day)] ?? 0);
          let channel: Planned['channel'] = 'std';
          if (!summary && mill.imperial && rng.chance(mill.imperial.share)) channel = 'imperial';
          else if (!summary && mill.foreign && rng.chance(mill.foreign.share)) channel = 'foreign';
          let layout: CurveLayout = mill.forceUnit === 'N' ? 'n-mm' : 'kn-mm';
          let loop = false;
          if (channel === 'imperial') layout = 'lbf-in';
          else if (channel === 'foreign') layout = 'foreign';
          else {
            const u = rng.next();
            const s = SPECIAL_SHARES;
            if (u < s.stressStrain) layout = 'stress-strain';
            else if (u < s.stressStrain + s.crossheadOnly) layout = 'crosshead-only';
            else if (u < s.stressStrain + s.crossheadOnly + s.extensometerRemoved) layout = 'extensometer-removed';
            else loop = rng.chance(s.unloadReload);
          }
          const orientation = product === 'bar' ? 'longitudinal' : rng.chance(0.7) ? 'transverse' : 'longitudinal';
          mine.push({ mill, grade: cell.grade, day, heat, heatEffect, product, nominalMm, channel, summary, layout, loop, orientation });
        }
      });
    }
    mine.sort((a, b) => a.day - b.day);
    out.push(...mine);
  }
  return out;
}

interface Geometry {
  shape: 'round' | 'flat';
  /** manifest cells in the manifest's length unit */
  diameter: string | null;
  thickness: string | null;
  width: string | null;
  gauge: string;
  areaMm2: number;
  gaugeLengthMm: number;
  parallelLengthMm: number;
}

function geometry(p: Planned, rng: Rng): Geometry {
  if (p.channel === 'imperial') {
    if (p.product === 'bar') {
      const d = roundTo(0.5 * (1 + 0.001 * rng.normal()), 0.001);
      const dMm = d * IN_MM;
      return { shape: 'round', diameter: d.toFixed(3), thickness: null, width: null, gauge: '2.000', areaMm2: (Math.PI * dMm * dMm) / 4, gaugeLengthMm: 2 * IN_MM, parallelLengthMm: 2.25 * IN_MM };
    }
    const t = roundTo(rng.pick([0.375, 0.5, 0.625, 0.75]) * (1 + 0.003 * rng.normal()), 0.001);
    const w = roundTo(rng.pick([1.0, 1.5]) * (1 + 0.002 * rng.normal()), 0.001);
    return { shape: 'flat', diameter: null, thickness: t.toFixed(3), width: w.toFixed(3), gauge: '2.000', areaMm2: t * w * IN_MM * IN_MM, gaugeLengthMm: 2 * IN_MM, parallelLengthMm: 2.5 * IN_MM };
  }
  if (p.product === 'bar') {
    const d = roundTo(p.nominalMm * (1 + 0.001 * rng.normal()), 0.01);
    const l0 = 5 * p.nominalMm;
    return { shape: 'round', diameter: d.toFixed(2), thickness: null, width: null, gauge: String(l0), areaMm2: (Math.PI * d * d) / 4, gaugeLengthMm: l0, parallelLengthMm: l0 + d };
  }
  const t = roundTo(p.nominalMm * (1 + 0.003 * rng.normal()), 0.01);
  const w = roundTo(rng.pick([20, 25, 30]) * (1 + 0.002 * rng.normal()), 0.01);
  const s0 = t * w;
  const l0 = Math.max(20, roundTo(5.65 * Math.sqrt(s0), 5));
  return { shape: 'flat', diameter: null, thickness: t.toFixed(2), width: w.toFixed(2), gauge: String(l0), areaMm2: s0, gaugeLengthMm: l0, parallelLengthMm: l0 + 1.5 * Math.sqrt(s0) };
}

/** Removes what an earlier run wrote; refuses a non-empty folder that is not a demo folder. */
function prepareOutDir(outDir: string): void {
  if (existsSync(outDir)) {
    const entries = readdirSync(outDir);
    if (entries.length > 0 && !entries.includes('demo-manifest.json')) {
      throw Object.assign(new Error(`${outDir} is not empty and holds no demo-manifest.json; refusing to write into it`), { code: 'out_dir_not_empty' });
    }
    for (const e of [...MILLS.map((m) => m.key), 'problems', 'catalog.json', 'truth.csv', 'escaped-curve.csv', 'demo-manifest.json']) {
      rmSync(join(outDir, e), { recursive: true, force: true });
    }
  }
  mkdirSync(outDir, { recursive: true });
}

export function generateDemo(opts: DemoOptions): DemoManifest {
  const outDir = resolve(opts.outDir);
  const total = Math.max(1, Math.floor(opts.tests ?? 2000));
  const seed = (opts.seed ?? 20230101) >>> 0;
  const points = Math.max(50, Math.floor(opts.pointsPerCurve ?? 1500));
  prepareOutDir(outDir);
  const master = new Rng(seed);
  const planned = plan(total, master);

  const writers = new Map<string, CsvFileWriter>();
  const entries: DemoManifestEntry[] = [];
  const manifestFor = (p: Planned): { rel: string; curveDir: string; writer: CsvFileWriter } => {
    let name: string;
    let curveDir = 'curves';
    if (p.channel === 'imperial') name = `manifest-${slug(p.mill.imperial!.lab)}-imperial.csv`;
    else if (p.channel === 'foreign') {
      name = `manifest-${slug(p.mill.foreign!.lab)}.csv`;
      curveDir = `curves-${slug(p.mill.foreign!.lab)}`;
    } else name = `manifest-${yearOf(p.day)}.csv`;
    const rel = `${p.mill.key}/${name}`;
    let writer = writers.get(rel);
    if (!writer) {
      mkdirSync(join(outDir, p.mill.key, curveDir), { recursive: true });
      writer = new CsvFileWriter(join(outDir, rel), p.channel === 'imperial' ? IMPERIAL_HEADER : METRIC_HEADER);
      writers.set(rel, writer);
      let map: string | null = null;
      if (p.channel === 'foreign') {
        map = `${p.mill.key}/${slug(p.mill.foreign!.lab)}.map.json`;
        writeFileSync(join(outDir, map), JSON.stringify(FOREIGN_COLUMN_MAP, null, 2) + '\n');
      }
      entries.push({ path: rel, map, role: 'data' });
    }
    return { rel, curveDir, writer };
  };

  const truth = new CsvFileWriter(join(outDir, 'truth.csv'), TRUTH_HEADER);
  const counts: DemoCounts = {
    tests: 0,
    curveTests: 0,
    summaryOnly: 0,
    certificates: 0,
    curveFiles: 0,
    bySupplier: {},
    byGrade: {},
    byLayout: { 'kn-mm': 0, 'n-mm': 0, 'lbf-in': 0, 'stress-strain': 0, 'crosshead-only': 0, 'extensometer-removed': 0, foreign: 0 },
    unloadReload: 0,
    drifting: 0,
    manifests: 0,
    problemRows: 0,
    problemRowsAccepted: 0,
    expectedRejections: 0,
  };
  const seqByLab = new Map<string, number>();
  const curveBuffer = new AsciiBuffer();
  const driftStart = dayOf(DRIFT.from);
  const windowEnd = dayOf(WINDOW_END);

  planned.forEach((p, index) => {
    const rng = new Rng(mixSeed(seed, index + 1));
    const lab = p.channel === 'imperial' ? p.mill.imperial!.lab : p.channel === 'foreign' ? p.mill.foreign!.lab : p.mill.lab;
    const code = p.channel === 'foreign' ? p.mill.foreign!.code : p.channel === 'imperial' ? `${p.mill.code}W` : p.mill.code;
    const seq = (seqByLab.get(lab) ?? 0) + 1;
    seqByLab.set(lab, seq);
    const testId = `${code}-${String(yearOf(p.day)).slice(2)}-${String(seq).padStart(5, '0')}`;
    const g = p.grade;
    const geo = geometry(p, rng);
    const strength = g.strengthMeanMpa * (1 + p.mill.strengthOffset) * (1 + p.heatEffect) * (1 + g.covWithin * rng.normal());
    let yieldShift = 0;
    if (p.mill.name === DRIFT.supplier && g.label === DRIFT.grade && p.day >= driftStart) {
      const sdTotal = g.strengthMeanMpa * Math.hypot(g.covHeat, g.covWithin);
      yieldShift = DRIFT.yieldShiftSd * sdTotal * ((p.day - driftStart) / (windowEnd - driftStart));
      counts.drifting++;
    }
    const sim = simulateTest(
      g,
      strength,
      yieldShift,
      DRIFT.tensileFraction * yieldShift,
      { areaMm2: geo.areaMm2, gaugeLengthMm: geo.gaugeLengthMm, parallelLengthMm: geo.parallelLengthMm },
      { withSignal: !p.summary, points, loop: p.loop, removeExtensometer: p.layout === 'extensometer-removed' },
      rng,
    );
    const m = manifestFor(p);
    const t = sim.curve.truth;
    const yieldTruth = truthYield(sim, g);
    let curveRel: string | null = null;
    if (sim.signal) {
      curveRel = `${m.curveDir}/${testId}.csv`;
      const comments = [
        `${FABRICATOR} demo record (invented data)`,
        `test ${testId}, lab ${lab}, ${g.label} from ${p.mill.name}`,
        geo.shape === 'round'
          ? `round specimen d=${geo.diameter} ${p.channel === 'imperial' ? 'in' : 'mm'}, L0=${geo.gauge} ${p.channel === 'imperial' ? 'in' : 'mm'}`
          : `flat specimen ${geo.thickness} x ${geo.width} ${p.channel === 'imperial' ? 'in' : 'mm'}, L0=${geo.gauge} ${p.channel === 'imperial' ? 'in' : 'mm'}`,
      ];
      if (p.layout === 'extensometer-removed') comments.push('extensometer removed before fracture');
      writeFileSync(
        join(outDir, p.mill.key, curveRel),
        formatCurveCsv(sim.signal, p.layout, { testId, comments, areaMm2: geo.areaMm2, gaugeLengthMm: geo.gaugeLengthMm, labName: lab, testedOn: isoOf(p.day) }, curveBuffer),
      );
      counts.curveFiles++;
      counts.curveTests++;
      counts.byLayout[p.layout]++;
      if (p.loop) counts.unloadReload++;
    } else counts.summaryOnly++;
    // the mill's own certificate beside some curves, from a stream of its own (scenario.ts CERTIFICATES)
    const certRng = new Rng(mixSeed(seed ^ CERTIFICATES.stream, index + 1));
    const certificate = sim.signal !== null && p.day >= dayOf(CERTIFICATES.from) && certRng.chance(CERTIFICATES.share);
    if (certificate) counts.certificates++;
    const cert = (x: number, bias = 0) => x * (1 + CERTIFICATES.scatter * certRng.normal()) + bias;
    const given = p.summary || certificate;
    const values = p.summary
      ? { y: Math.round(yieldTruth), rm: Math.round(t.rmMpa), ag: roundTo(t.agPct, 0.5).toFixed(1), a: roundTo(t.aPct, 0.5).toFixed(1) }
      : certificate
        ? {
            y: Math.round(cert(yieldTruth, CERTIFICATES.yieldBiasMpa[p.mill.key] ?? 0)),
            rm: Math.round(cert(t.rmMpa)),
            ag: roundTo(cert(t.agPct), 0.5).toFixed(1),
            a: roundTo(cert(t.aPct), 0.5).toFixed(1),
          }
        : null;
    const row: Cell[] = [
      testId,
      lab,
      g.label,
      p.mill.name,
      p.heat,
      isoOf(p.day),
      geo.shape,
      geo.diameter,
      geo.thickness,
      geo.width,
      null,
      geo.gauge,
      p.orientation,
      rng.int(18, 24),
      curveRel,
      values?.y ?? null,
      given ? g.yieldDefinition : null,
      values?.rm ?? null,
      values?.ag ?? null,
      values?.a ?? null,
    ];
    m.writer.write(row);
    const law = sim.draw.law;
    truth.write([
      lab,
      testId,
      p.mill.name,
      g.label,
      p.heat,
      isoOf(p.day),
      m.rel,
      curveRel === null ? null : `${p.mill.key}/${curveRel}`,
      p.summary ? 'summary' : p.layout,
      law.kind,
      fx(law.modulusMpa / 1000, 3),
      fx(t.rehMpa, 3),
      fx(t.relMpa, 3),
      fx(t.relMinMpa, 3),
      fx(t.rp02Mpa, 3),
      fx(t.rt05Mpa, 3),
      fx(t.rmMpa, 3),
      fx(t.agPct, 4),
      fx(t.agtPct, 4),
      fx(t.aPct, 4),
      fx(t.ypePct, 4),
      fx(yieldTruth, 3),
      g.yieldDefinition,
      law.kind === 'plateau-swift' ? fx(law.n, 5) : law.kind === 'ramberg-osgood' ? fx(1 / law.m, 5) : null,
      law.kind === 'plateau-swift' ? fx(law.kMpa, 3) : null,
      law.kind === 'plateau-swift' ? fx(law.eps0, 6) : null,
      law.kind === 'plateau-swift' ? fx(law.epsPlateauEnd, 6) : null,
      law.kind === 'plateau-swift' ? null : fx(law.sigma0Mpa, 3),
      law.kind === 'ramberg-osgood' ? fx(law.m, 5) : null,
      law.kind === 'voce' ? fx(law.qMpa, 3) : null,
      law.kind === 'voce' ? fx(law.b, 5) : null,
      fx(geo.areaMm2, 4),
      fx(geo.gaugeLengthMm, 3),
      fx(sim.loopAtStrain, 6),
      fx(sim.extensometerRemovedAtStrain, 6),
      fx(yieldShift, 3),
    ]);
    counts.tests++;
    counts.bySupplier[p.mill.name] = (counts.bySupplier[p.mill.name] ?? 0) + 1;
    counts.byGrade[g.label] = (counts.byGrade[g.label] ?? 0) + 1;
  });
  for (const w of writers.values()) w.close();
  truth.close();

  const problems = writeProblemFiles(outDir, points, new Rng(mixSeed(seed, 0)));
  for (const p of problems.manifests) entries.push({ path: p, map: null, role: 'problems' });
  entries.sort((a, b) => (a.role === b.role ? (a.path < b.path ? -1 : a.path > b.path ? 1 : 0) : a.role === 'data' ? -1 : 1));
  counts.manifests = entries.length;
  counts.problemRows = problems.rows;
  counts.problemRowsAccepted = problems.accepted;
  counts.expectedRejections = problems.expected.length;

  writeFileSync(join(outDir, 'catalog.json'), JSON.stringify(catalogJson(), null, 2) + '\n');
  const manifest: DemoManifest = {
    outDir: '.',
    fabricator: FABRICATOR,
    seed,
    pointsPerCurve: points,
    window: { from: WINDOW_START, to: WINDOW_END },
    manifests: entries,
    catalog: 'catalog.json',
    truth: 'truth.csv',
    expectedRejections: problems.expected,
    driftingSupplier: DRIFT.supplier,
    driftingGrade: DRIFT.grade,
    driftFrom: DRIFT.from,
    counts,
  };
  writeFileSync(join(outDir, 'demo-manifest.json'), JSON.stringify(manifest, null, 2) + '\n');
  return { ...manifest, outDir };
}

