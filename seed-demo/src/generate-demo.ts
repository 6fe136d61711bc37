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
import type { ExpectedRejection, ManifestRow } from './problem-files.ts';

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
/** A row of the truth table, keyed by its columns: TRUTH_HEADER is the one spec of names and order. */
type TruthRow = Record<(typeof TRUTH_HEADER)[number], Cell>;

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

type SpecimenSize = Pick<Geometry, 'areaMm2' | 'gaugeLengthMm' | 'parallelLengthMm'>;
const roundSpecimen = (diameter: string, gauge: string, size: SpecimenSize): Geometry => ({ shape: 'round', diameter, thickness: null, width: null, gauge, ...size });
const flatSpecimen = (thickness: string, width: string, gauge: string, size: SpecimenSize): Geometry => ({ shape: 'flat', diameter: null, thickness, width, gauge, ...size });

function geometry(p: Planned, rng: Rng): Geometry {
  if (p.channel === 'imperial') {
    if (p.product === 'bar') {
      const d = roundTo(0.5 * (1 + 0.001 * rng.normal()), 0.001);
      const dMm = d * IN_MM;
      return roundSpecimen(d.toFixed(3), '2.000', { areaMm2: (Math.PI * dMm * dMm) / 4, gaugeLengthMm: 2 * IN_MM, parallelLengthMm: 2.25 * IN_MM });
    }
    const t = roundTo(rng.pick([0.375, 0.5, 0.625, 0.75]) * (1 + 0.003 * rng.normal()), 0.001);
    const w = roundTo(rng.pick([1.0, 1.5]) * (1 + 0.002 * rng.normal()), 0.001);
    return flatSpecimen(t.toFixed(3), w.toFixed(3), '2.000', { areaMm2: t * w * IN_MM * IN_MM, gaugeLengthMm: 2 * IN_MM, parallelLengthMm: 2.5 * IN_MM });
  }
  if (p.product === 'bar') {
    const d = roundTo(p.nominalMm * (1 + 0.001 * rng.normal()), 0.01);
    const l0 = 5 * p.nominalMm;
    return roundSpecimen(d.toFixed(2), String(l0), { areaMm2: (Math.PI * d * d) / 4, gaugeLengthMm: l0, parallelLengthMm: l0 + d });
  }
  const t = roundTo(p.nominalMm * (1 + 0.003 * rng.normal()), 0.01);
  const w = roundTo(rng.pick([20, 25, 30]) * (1 + 0.002 * rng.normal()), 0.01);
  const s0 = t * w;
  const l0 = Math.max(20, roundTo(5.65 * Math.sqrt(s0), 5));
  return flatSpecimen(t.toFixed(2), w.toFixed(2), String(l0), { areaMm2: s0, gaugeLengthMm: l0, parallelLengthMm: l0 + 1.5 * Math.sqrt(s0) });
}

/** The test's lab (per its channel), and its id: the lab's code, the year and the lab's running number. */
function identify(p: Planned, seqByLab: Map<string, number>): { lab: string; testId: string } {
  const lab = p.channel === 'imperial' ? p.mill.imperial!.lab : p.channel === 'foreign' ? p.mill.foreign!.lab : p.mill.lab;
  const code = p.channel === 'foreign' ? p.mill.foreign!.code : p.channel === 'imperial' ? `${p.mill.code}W` : p.mill.code;
  const seq = (seqByLab.get(lab) ?? 0) + 1;
  seqByLab.set(lab, seq);
  return { lab, testId: `${code}-${String(yearOf(p.day)).slice(2)}-${String(seq).padStart(5, '0')}` };
}

/**
 * The yield shift of the drifting supplier and grade (scenario.ts DRIFT): growing linearly from
 * 0 at the drift start to `yieldShiftSd` total standard deviations at the window end; null for a
 * test outside the drift.
 */
function driftShift(p: Planned, driftStart: number, windowEnd: number): number | null {
  const g = p.grade;
  if (p.mill.name !== DRIFT.supplier || g.label !== DRIFT.grade || p.day < driftStart) return null;
  const sdTotal = g.strengthMeanMpa * Math.hypot(g.covHeat, g.covWithin);
  return DRIFT.yieldShiftSd * sdTotal * ((p.day - driftStart) / (windowEnd - driftStart));
}

/** Draws the test's strength (mill offset, heat effect, within-heat scatter) and simulates it. */
function simulatePlanned(p: Planned, geo: Geometry, yieldShift: number, points: number, rng: Rng): SimulatedTest {
  const g = p.grade;
  const strength = g.strengthMeanMpa * (1 + p.mill.strengthOffset) * (1 + p.heatEffect) * (1 + g.covWithin * rng.normal());
  return simulateTest(
    g,
    strength,
    yieldShift,
    DRIFT.tensileFraction * yieldShift,
    { areaMm2: geo.areaMm2, gaugeLengthMm: geo.gaugeLengthMm, parallelLengthMm: geo.parallelLengthMm },
    { withSignal: !p.summary, points, loop: p.loop, removeExtensometer: p.layout === 'extensometer-removed' },
    rng,
  );
}

interface TestIdentity {
  lab: string;
  testId: string;
  geo: Geometry;
}

/** Writes the test's curve file (in its layout, with its comment lines) under the mill's folder; returns its path there. */
function writeCurveFile(millDir: string, curveRel: string, p: Planned, t: TestIdentity & { sim: SimulatedTest }, buffer: AsciiBuffer): string {
  const { geo, lab, testId } = t;
  const unit = p.channel === 'imperial' ? 'in' : 'mm';
  const comments = [
    `${FABRICATOR} demo record (invented data)`,
    `test ${testId}, lab ${lab}, ${p.grade.label} from ${p.mill.name}`,
    geo.shape === 'round'
      ? `round specimen d=${geo.diameter} ${unit}, L0=${geo.gauge} ${unit}`
      : `flat specimen ${geo.thickness} x ${geo.width} ${unit}, L0=${geo.gauge} ${unit}`,
  ];
  if (p.layout === 'extensometer-removed') comments.push('extensometer removed before fracture');
  const meta = { testId, comments, areaMm2: geo.areaMm2, gaugeLengthMm: geo.gaugeLengthMm, labName: lab, testedOn: isoOf(p.day) };
  writeFileSync(join(millDir, curveRel), formatCurveCsv(t.sim.signal!, p.layout, meta, buffer));
  return curveRel;
}

interface GivenValues {
  /** the mill's certificate accompanies the curve */
  certificate: boolean;
  /** the manifest carries given values (summary-only record or certificate) */
  given: boolean;
  values: { y: number; rm: number; ag: string; a: string } | null;
}

/** The values a summary-only record or a certificate gives: the truth rounded, a certificate's with its scatter and bias. */
function givenValues(p: Planned, sim: SimulatedTest, certRng: Rng): GivenValues {
  const t = sim.curve.truth;
  const yieldTruth = truthYield(sim, p.grade);
  const certificate = sim.signal !== null && p.day >= dayOf(CERTIFICATES.from) && certRng.chance(CERTIFICATES.share);
  const cert = (x: number, bias = 0) => x * (1 + CERTIFICATES.scatter * certRng.normal()) + bias;
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
  return { certificate, given: p.summary || certificate, values };
}

/** The test's manifest row, keyed by the manifest's columns (METRIC_HEADER; the imperial header has the same order). */
function manifestRow(p: Planned, t: TestIdentity, curveRel: string | null, given: GivenValues, temperature: number): ManifestRow {
  const { geo } = t;
  const { values } = given;
  return {
    test_id: t.testId,
    lab: t.lab,
    grade: p.grade.label,
    supplier: p.mill.name,
    heat: p.heat,
    tested_on: isoOf(p.day),
    shape: geo.shape,
    'diameter[mm]': geo.diameter,
    'thickness[mm]': geo.thickness,
    'width[mm]': geo.width,
    'area[mm2]': null,
    'gauge_length[mm]': geo.gauge,
    orientation: p.orientation,
    'temperature[C]': temperature,
    curve: curveRel,
    'yield[MPa]': values?.y ?? null,
    yield_definition: given.given ? p.grade.yieldDefinition : null,
    'tensile[MPa]': values?.rm ?? null,
    'uniform_elongation[%]': values?.ag ?? null,
    'elongation[%]': values?.a ?? null,
  };
}

/** Law parameters of the truth table: each law's own, blank for the others. */
type LawColumn = 'law' | 'modulus_gpa' | 'n_law' | 'k_mpa' | 'eps0' | 'eps_plateau_end' | 'sigma0_mpa' | 'm' | 'q_mpa' | 'b';

function lawColumns(law: SimulatedTest['draw']['law']): Pick<TruthRow, LawColumn> {
  return {
    law: law.kind,
    modulus_gpa: fx(law.modulusMpa / 1000, 3),
    n_law: law.kind === 'plateau-swift' ? fx(law.n, 5) : law.kind === 'ramberg-osgood' ? fx(1 / law.m, 5) : null,
    k_mpa: law.kind === 'plateau-swift' ? fx(law.kMpa, 3) : null,
    eps0: law.kind === 'plateau-swift' ? fx(law.eps0, 6) : null,
    eps_plateau_end: law.kind === 'plateau-swift' ? fx(law.epsPlateauEnd, 6) : null,
    sigma0_mpa: law.kind === 'plateau-swift' ? null : fx(law.sigma0Mpa, 3),
    m: law.kind === 'ramberg-osgood' ? fx(law.m, 5) : null,
    q_mpa: law.kind === 'voce' ? fx(law.qMpa, 3) : null,
    b: law.kind === 'voce' ? fx(law.b, 5) : null,
  };
}

/** The test's row of the truth table: the exact properties of the law its curve came from, keyed by TRUTH_HEADER. */
function truthRow(p: Planned, t: TestIdentity & { sim: SimulatedTest }, manifest: string, curveRel: string | null, yieldShift: number): TruthRow {
  const { geo, sim } = t;
  const x = sim.curve.truth;
  return {
    lab: t.lab,
    test_id: t.testId,
    supplier: p.mill.name,
    grade: p.grade.label,
    heat: p.heat,
    tested_on: isoOf(p.day),
    manifest,
    curve: curveRel === null ? null : `${p.mill.key}/${curveRel}`,
    layout: p.summary ? 'summary' : p.layout,
    ...lawColumns(sim.draw.law),
    reh_mpa: fx(x.rehMpa, 3),
    rel_mpa: fx(x.relMpa, 3),
    rel_min_mpa: fx(x.relMinMpa, 3),
    rp02_mpa: fx(x.rp02Mpa, 3),
    rt05_mpa: fx(x.rt05Mpa, 3),
    rm_mpa: fx(x.rmMpa, 3),
    ag_pct: fx(x.agPct, 4),
    agt_pct: fx(x.agtPct, 4),
    a_pct: fx(x.aPct, 4),
    ype_pct: fx(x.ypePct, 4),
    yield_mpa: fx(truthYield(sim, p.grade), 3),
    yield_definition: p.grade.yieldDefinition,
    area_mm2: fx(geo.areaMm2, 4),
    gauge_length_mm: fx(geo.gaugeLengthMm, 3),
    loop_at_strain: fx(sim.loopAtStrain, 6),
    extensometer_removed_at_strain: fx(sim.extensometerRemovedAtStrain, 6),
    yield_shift_mpa: fx(yieldShift, 3),
  };
}

function countTest(counts: DemoCounts, p: Planned, sim: SimulatedTest, certificate: boolean, drifting: boolean): void {
  if (drifting) counts.drifting++;
  if (sim.signal) {
    counts.curveFiles++;
    counts.curveTests++;
    counts.byLayout[p.layout]++;
    if (p.loop) counts.unloadReload++;
  } else counts.summaryOnly++;
  if (certificate) counts.certificates++;
  counts.tests++;
  counts.bySupplier[p.mill.name] = (counts.bySupplier[p.mill.name] ?? 0) + 1;
  counts.byGrade[p.grade.label] = (counts.byGrade[p.grade.label] ?? 0) + 1;
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
    const { lab, testId } = identify(p, seqByLab);
    const geo = geometry(p, rng);
    const yieldShift = driftShift(p, driftStart, windowEnd);
    const sim = simulatePlanned(p, geo, yieldShift ?? 0, points, rng);
    const m = manifestFor(p);
    const curveRel = sim.signal ? writeCurveFile(join(outDir, p.mill.key), `${m.curveDir}/${testId}.csv`, p, { lab, testId, geo, sim }, curveBuffer) : null;
    // the mill's own certificate beside some curves, from a stream of its own (scenario.ts CERTIFICATES)
    const given = givenValues(p, sim, new Rng(mixSeed(seed ^ CERTIFICATES.stream, index + 1)));
    const temperature = rng.int(18, 24);
    const row = manifestRow(p, { lab, testId, geo }, curveRel, given, temperature);
    m.writer.write(METRIC_HEADER.map((k) => row[k]));
    const truthOfTest = truthRow(p, { lab, testId, geo, sim }, m.rel, curveRel, yieldShift ?? 0);
    truth.write(TRUTH_HEADER.map((k) => truthOfTest[k]));
    countTest(counts, p, sim, given.certificate, yieldShift !== null);
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

