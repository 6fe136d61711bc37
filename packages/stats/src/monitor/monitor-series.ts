/**
 * Monitoring of one series (one group × property, tests in time order):
 *  1. structure — on the baseline (the first 100 tests), heats tested for a
 *     between-heat variance component; heat means charted when it is real, every test otherwise
 *     (chart-structure.ts);
 *  2. self-starting standardization — each point judged against the points before it only
 *     (self-starting.ts, Hawkins 1987), so the designed in-control run lengths hold although the
 *     mean and SD are estimated;
 *  3. on the standardized scores U: two one-sided tabular CUSUMs (cusum.ts), designed for a shift
 *     of `designShiftSd` SDs of one test (k = half that shift in SDs of a point) with h from the
 *     in-control ARL in tests (cusum-design.ts); a Shewhart limit on each point; an EWMA; the
 *     moving range of the points;
 *  4. PELT change points in the mean of heat means, with the shift's interval, each dated when
 *     it would have been found (change-point-detection.ts);
 *  5. rolling capability of individual tests against the grade minimum (capability.ts);
 *  6. alerts, each with the date it would have rung (alerts.ts).
 * A point enters the running estimates unless the CUSUM or the Shewhart limit signals on it.
 * Defaults (stated): in-control ARL 1500 tests per direction for the CUSUM and 5000 for the
 * Shewhart limit; design shift 1 SD; EWMA λ = 0.1, L = 2.814 (Lucas & Saccucci 1990), asymptotic
 * limits; 5 points before charting starts; heat-effect level 0.05; capability over 50 tests
 * (from 20 on), alarm above 5 % of tests below the minimum; change points: penalty 2·ln n,
 * minimum segment 5, 199 bootstrap resamples; alert episodes ≤ 5 points apart joined.
 * Units: values, limits, shifts in the property's units; U, CUSUM in SD of a point.
 * Degenerate input: an empty series or a non-finite value gives status 'degenerate' with error
 * values and no chart (one error per non-finite point, so the caller can drop or fix them).
 * O(n) per series apart from PELT (O(n) expected) and the dating of each change found.
 */
import type { MonitorError, MonitorOptions, SeriesPoint } from './types.ts';
import type { Alert } from './alerts.ts';
import type { CapabilityPoint } from './capability.ts';
import type { ChangePoint } from './change-point-uncertainty.ts';
import { selectBaseline } from './baseline.ts';
import { chartStructure, type ChartStructure } from './chart-structure.ts';
import { chartPoints, type ChartPointInput } from './heat-subgroups.ts';
import { createSelfStarting, limitFactor, selfStartingScore } from './self-starting.ts';
import { cusumDecisionInterval, shewhartLimit } from './cusum-design.ts';
import { DEFAULT_EWMA, ewmaHalfWidth } from './ewma.ts';
import { MR_D4 } from './moving-range.ts';
import { DEFAULT_MIN_SEGMENT, peltMeanChange } from './change-points.ts';
import { describeChangePoints } from './change-point-uncertainty.ts';
import { changeDetectionIndices, excludesZero } from './change-point-detection.ts';
import { rollingCapability } from './capability.ts';
import { DEFAULT_ALERT_MERGE_GAP, extremeIndex, flagEpisodes } from './alerts.ts';

export const DEFAULT_ARL0_TESTS = 1500;
export const DEFAULT_SHEWHART_ARL0_TESTS = 5000;
export const DEFAULT_DESIGN_SHIFT_SD = 1;
export const DEFAULT_WARMUP = 5;
export const DEFAULT_CAPABILITY_WINDOW = 50;
export const DEFAULT_CAPABILITY_MIN_TESTS = 20;
/** Default share of tests below the minimum that raises the capability alert: 5 %, the fractile of a characteristic value (EN 1990 Annex D). */
export const DEFAULT_MAX_FRACTION_BELOW = 0.05;

export interface ChartPoint {
  index: number;
  date: string;
  /** Test id, or `heat <code>` for a heat mean. */
  label: string;
  size: number;
  value: number;
  /** Running centre and SD of the prediction (null before charting starts), property units. */
  centre: number | null;
  scale: number | null;
  /** Shewhart limits for this point, property units. */
  lcl: number | null;
  ucl: number | null;
  /** Standardized score, SD. */
  u: number | null;
  /** EWMA and its limits, property units (centre + scale × EWMA of U). */
  ewma: number | null;
  ewmaLcl: number | null;
  ewmaUcl: number | null;
  cusumHigh: number;
  cusumLow: number;
  mr: number | null;
  mrUcl: number | null;
  /** Whether the point entered the running estimates. */
  included: boolean;
}

export interface ChartDesign {
  k: number;
  h: number;
  shewhart_z: number;
  arl0_tests: number;
  shewhart_arl0_tests: number;
  design_shift_sd: number;
  tests_per_point: number;
  ewma: { lambda: number; L: number; limits: 'asymptotic' | 'exact' };
  warmup: number;
  /** 'designed' from the ARL targets, or 'given' k and h. */
  cusum_source: 'designed' | 'given';
}

export interface SeriesChangePoint extends ChangePoint {
  /** Date it would have been found (null when its interval covers zero). */
  detected_on: string | null;
}

export interface SeriesMonitor {
  status: 'ok' | 'degenerate';
  errors: MonitorError[];
  structure: ChartStructure | null;
  design: ChartDesign | null;
  points: ChartPoint[];
  alerts: Alert[];
  changePoints: SeriesChangePoint[];
  changePointSettings: { penalty: number; minSegment: number; sigma: number; method: 'pelt-normal-mean' };
  capability: CapabilityPoint[];
  capabilitySettings: { window: number; min_tests: number; max_fraction_below: number; lower_spec: number } | null;
}

function design(structure: ChartStructure, opts: MonitorOptions): ChartDesign {
  const arl0 = opts.arl0Tests ?? DEFAULT_ARL0_TESTS;
  const shewhartArl0 = opts.shewhartArl0Tests ?? DEFAULT_SHEWHART_ARL0_TESTS;
  const shift = opts.designShiftSd ?? DEFAULT_DESIGN_SHIFT_SD;
  const perPoint = structure.tests_per_point;
  const ratio = structure.point_sd > 0 ? structure.test_sd / structure.point_sd : 1;
  const k = opts.cusum?.k ?? (shift * ratio) / 2;
  const h = opts.cusum?.h ?? cusumDecisionInterval(k, arl0 / perPoint);
  const ew = opts.ewma ?? DEFAULT_EWMA;
  return {
    k,
    h,
    shewhart_z: shewhartLimit(shewhartArl0 / perPoint),
    arl0_tests: arl0,
    shewhart_arl0_tests: shewhartArl0,
    design_shift_sd: shift,
    tests_per_point: perPoint,
    ewma: { lambda: ew.lambda, L: ew.L, limits: opts.ewmaLimits ?? 'asymptotic' },
    warmup: opts.warmup ?? DEFAULT_WARMUP,
    cusum_source: opts.cusum ? 'given' : 'designed',
  };
}

interface Charted {
  points: ChartPoint[];
  /** Shewhart and EWMA flags, CUSUM flags and run lengths, per point. */
  below: Uint8Array;
  above: Uint8Array;
  ewmaLow: Uint8Array;
  ewmaHigh: Uint8Array;
  cusumLow: Uint8Array;
  cusumHigh: Uint8Array;
  nLow: Int32Array;
  nHigh: Int32Array;
  mrOut: Uint8Array;
}

/** Steps 2–3: the self-starting scores and the charts on them. */
function chart(inputs: readonly ChartPointInput[], unit: ChartStructure['unit'], d: ChartDesign): Charted {
  const n = inputs.length;
  const ss = createSelfStarting(unit, d.warmup);
  const out: Charted = {
    points: new Array(n),
    below: new Uint8Array(n),
    above: new Uint8Array(n),
    ewmaLow: new Uint8Array(n),
    ewmaHigh: new Uint8Array(n),
    cusumLow: new Uint8Array(n),
    cusumHigh: new Uint8Array(n),
    nLow: new Int32Array(n),
    nHigh: new Int32Array(n),
    mrOut: new Uint8Array(n),
  };
  let cp = 0;
  let cm = 0;
  let np = 0;
  let nm = 0;
  let w = 0;
  let charted = 0;
  let mrSum = 0;
  let mrCount = 0;
  const ewmaP = { lambda: d.ewma.lambda, L: d.ewma.L };
  const factor = limitFactor(d.shewhart_z);
  for (let i = 0; i < n; i++) {
    const p = inputs[i];
    const pred = ss.predict(p.size, p.heat);
    const mr = i > 0 ? Math.abs(p.value - inputs[i - 1].value) : null;
    const mrUcl = mrCount > 0 ? (MR_D4 * mrSum) / mrCount : null;
    const point: ChartPoint = {
      index: i, date: p.date, label: p.label, size: p.size, value: p.value,
      centre: null, scale: null, lcl: null, ucl: null, u: null, ewma: null, ewmaLcl: null, ewmaUcl: null,
      cusumHigh: 0, cusumLow: 0, mr, mrUcl, included: true,
    };
    let signal = false;
    if (pred) {
      const u = selfStartingScore(p.value, pred);
      charted++;
      cp = Math.max(0, u - d.k + cp);
      cm = Math.max(0, -u - d.k + cm);
      np = cp > 0 ? np + 1 : 0;
      nm = cm > 0 ? nm + 1 : 0;
      w = d.ewma.lambda * u + (1 - d.ewma.lambda) * w;
      const hw = ewmaHalfWidth(ewmaP, charted, d.ewma.limits);
      out.below[i] = u < -d.shewhart_z ? 1 : 0;
      out.above[i] = u > d.shewhart_z ? 1 : 0;
      out.cusumHigh[i] = cp > d.h ? 1 : 0;
      out.cusumLow[i] = cm > d.h ? 1 : 0;
      out.ewmaHigh[i] = w > hw ? 1 : 0;
      out.ewmaLow[i] = w < -hw ? 1 : 0;
      out.nHigh[i] = np;
      out.nLow[i] = nm;
      signal = out.below[i] + out.above[i] + out.cusumHigh[i] + out.cusumLow[i] > 0;
      Object.assign(point, {
        centre: pred.centre,
        scale: pred.scale,
        lcl: pred.centre - pred.scale * factor(pred.df),
        ucl: pred.centre + pred.scale * factor(pred.df),
        u,
        ewma: pred.centre + pred.scale * w,
        ewmaLcl: pred.centre - pred.scale * hw,
        ewmaUcl: pred.centre + pred.scale * hw,
        cusumHigh: cp,
        cusumLow: cm,
      });
    }
    if (mr !== null && mrUcl !== null && mr > mrUcl) out.mrOut[i] = 1;
    if (!signal) {
      ss.add(p.value, p.size, p.ss, p.heat);
      if (mr !== null && i > 0 && out.points[i - 1].included) {
        mrSum += mr;
        mrCount++;
      }
    }
    point.included = !signal;
    out.points[i] = point;
  }
  return out;
}

const emptyMonitor = (errors: MonitorError[], minSegment: number): SeriesMonitor => ({
  status: 'degenerate',
  errors,
  structure: null,
  design: null,
  points: [],
  alerts: [],
  changePoints: [],
  changePointSettings: { penalty: 0, minSegment, sigma: 0, method: 'pelt-normal-mean' },
  capability: [],
  capabilitySettings: null,
});

export function monitorSeries(tests: readonly SeriesPoint[], opts: MonitorOptions = {}): SeriesMonitor {
  const cpOpts = opts.changePoint ?? {};
  const minSegment = cpOpts.minSegment ?? DEFAULT_MIN_SEGMENT;
  const errors: MonitorError[] = [];
  tests.forEach((t, i) => {
    if (!Number.isFinite(t.value)) errors.push({ code: 'value-not-finite', message: `test ${t.testId}: value is not a finite number`, location: { index: i } });
  });
  if (tests.length === 0) errors.push({ code: 'series-empty', message: 'the series has no points' });
  if (errors.length > 0) return emptyMonitor(errors, minSegment);
  const range = selectBaseline(tests, opts.baseline);
  if (range === null) return emptyMonitor([{ code: 'baseline-empty', message: 'no test falls inside the baseline date range' }], minSegment);

  const structure = chartStructure(tests, range, opts.unit ?? 'auto', opts.heatEffectAlpha);
  const d = design(structure, opts);
  const inputs = chartPoints(tests, structure.unit);
  const c = chart(inputs, structure.unit, d);
  const dates = inputs.map((p) => p.date);
  const ids = tests.map((t) => t.testId);
  const membersOf = (a: number, e: number): string[] => {
    const idx: number[] = [];
    for (let i = a; i <= e; i++) idx.push(...inputs[i].members);
    return idx.sort((x, y) => x - y).map((i) => ids[i]);
  };
  const testSd = structure.test_sd;
  const sdOf = (x: number): number | null => (testSd > 0 ? x / testSd : null);

  const alerts: Alert[] = [];
  const gap = opts.alertMergeGap ?? DEFAULT_ALERT_MERGE_GAP;
  const pts = c.points;
  const episodes = (flags: Uint8Array, rule: string, make: (a: number, e: number) => { change: number | null; magnitude: number; detail: string; from?: number }) => {
    for (const [a, e] of flagEpisodes(flags, gap)) {
      const m = make(a, e);
      alerts.push({
        rule,
        detected_on: dates[a],
        change_date: m.change === null ? null : dates[m.change],
        last_date: dates[e],
        magnitude: m.magnitude,
        magnitude_unit: 'property-units',
        magnitude_sd: sdOf(m.magnitude),
        tests: membersOf(m.from ?? m.change ?? a, e),
        detail: m.detail,
      });
    }
  };
  const dev = (q: number) => pts[q].value - (pts[q].centre ?? pts[q].value);
  for (const [flags, rule, dir] of [[c.below, 'individuals-below-lcl', -1], [c.above, 'individuals-above-ucl', 1]] as const) {
    episodes(flags, rule, (a, e) => {
      const i = extremeIndex(dev, a, e, dir);
      return { change: a, magnitude: dev(i), detail: 'most extreme point − running centre in the episode, beyond the Shewhart limit' };
    });
  }
  // CUSUM: Montgomery's estimate of the new mean at the first signal, k + C/N (in SD of a point,
  // here in property units); the shift is estimated to start where the sum last left zero.
  for (const [flags, nRun, rule, dir] of [[c.cusumLow, c.nLow, 'cusum-low', -1], [c.cusumHigh, c.nHigh, 'cusum-high', 1]] as const) {
    episodes(flags, rule, (a) => {
      const sum = dir < 0 ? pts[a].cusumLow : pts[a].cusumHigh;
      const est = dir * (d.k + sum / nRun[a]) * (pts[a].scale ?? 0);
      return { change: a - nRun[a] + 1, magnitude: est, detail: 'estimated shift of the mean since the sum left zero (Montgomery: k + C/N), property units' };
    });
  }
  for (const [flags, rule, dir] of [[c.ewmaLow, 'ewma-low', -1], [c.ewmaHigh, 'ewma-high', 1]] as const) {
    episodes(flags, rule, (a, e) => {
      const i = extremeIndex((q) => (pts[q].ewma ?? 0) - (pts[q].centre ?? 0), a, e, dir);
      return { change: null, magnitude: (pts[i].ewma ?? 0) - (pts[i].centre ?? 0), detail: 'most extreme EWMA − running centre in the episode' };
    });
  }
  episodes(c.mrOut, 'mr-above-ucl', (a, e) => {
    const i = extremeIndex((q) => pts[q].mr ?? 0, a, e, 1);
    return { change: null, magnitude: pts[i].mr ?? 0, detail: 'largest moving range in the episode', from: Math.max(0, a - 1) };
  });

  // Step 4: change points on heat means (tests of a heat share its level, so a change of the
  // mean is a change between heats; tests without a heat stay points of their own), dated by the
  // first test after the change and found by the data up to a heat's last test.
  const heats = structure.unit === 'heat-means' ? inputs : chartPoints(tests, 'heat-means');
  const heatValues = Float64Array.from(heats, (p) => p.value);
  const heatEnds = heats.map((p) => p.date);
  const heatStarts = heats.map((p) => tests[p.members[0]].date);
  const pelt = peltMeanChange(heatValues, { penalty: cpOpts.penalty, minSegment });
  const described = describeChangePoints(heatValues, heatStarts, heats.map((p) => p.label), pelt.changes, {
    sigma: pelt.sigma, level: cpOpts.level, bootstrap: cpOpts.bootstrap, seed: cpOpts.seed, minSegment,
  });
  const detectedAt = changeDetectionIndices(heatValues, heatEnds, described, { factor: cpOpts.alarmPenaltyFactor, minSegment, level: cpOpts.level });
  const changePoints: SeriesChangePoint[] = described.map((cp, j) => ({ ...cp, detected_on: detectedAt[j] === null ? null : heatEnds[detectedAt[j] as number] }));
  const heatMembers = (a: number, e: number): string[] => heats.slice(a, e + 1).flatMap((p) => p.members).sort((x, y) => x - y).map((i) => ids[i]);
  const bounds = [0, ...described.map((x) => x.index), heatValues.length];
  described.forEach((cp, j) => {
    const at = detectedAt[j];
    if (at === null || !excludesZero(cp.ci)) return;
    const end = bounds[j + 2] - 1;
    alerts.push({
      rule: cp.shift < 0 ? 'change-point-down' : 'change-point-up',
      detected_on: heatEnds[at],
      change_date: cp.date,
      last_date: heatEnds[end],
      magnitude: cp.shift,
      magnitude_unit: 'property-units',
      magnitude_sd: sdOf(cp.shift),
      tests: heatMembers(cp.index, end),
      detail: `shift of the mean (after − before), ${Math.round(cp.level * 100)} % CI [${cp.ci[0]}, ${cp.ci[1]}]`,
    });
  });

  // Step 5: capability of individual tests against the minimum.
  let capability: CapabilityPoint[] = [];
  let capabilitySettings: SeriesMonitor['capabilitySettings'] = null;
  const lsl = opts.lowerSpec;
  if (lsl !== undefined && lsl !== null) {
    const window = opts.capabilityWindow ?? DEFAULT_CAPABILITY_WINDOW;
    const minTests = opts.capabilityMinTests ?? Math.min(DEFAULT_CAPABILITY_MIN_TESTS, window);
    const maxBelow = opts.maxFractionBelow ?? DEFAULT_MAX_FRACTION_BELOW;
    const testValues = Float64Array.from(tests, (t) => t.value);
    const testDates = tests.map((t) => t.date);
    capability = rollingCapability(testValues, testDates, lsl, window, minTests);
    capabilitySettings = { window, min_tests: minTests, max_fraction_below: maxBelow, lower_spec: lsl };
    const high = Uint8Array.from(capability, (q) => (q.fraction_below !== null && q.fraction_below > maxBelow ? 1 : 0));
    // a date's tests arrive together: the rule fires on the date, judged on the day's last test
    for (let i = 0; i + 1 < high.length; i++) if (testDates[i + 1] === testDates[i]) high[i] = 0;
    for (const [a, e] of flagEpisodes(high, gap)) {
      const i = extremeIndex((q) => capability[q].fraction_below ?? 0, a, e, 1);
      alerts.push({
        rule: 'capability-below-minimum',
        detected_on: testDates[a],
        change_date: null,
        last_date: testDates[e],
        magnitude: capability[i].fraction_below ?? 0,
        magnitude_unit: 'fraction',
        magnitude_sd: null,
        tests: ids.slice(Math.max(0, a - window + 1), e + 1),
        detail: `largest share of tests below the minimum by the normal model of a ${window}-test window (observed there: ${capability[i].n_below} of ${capability[i].n}), above ${maxBelow}`,
      });
    }
  }
  alerts.sort((x, y) => (x.detected_on < y.detected_on ? -1 : x.detected_on > y.detected_on ? 1 : x.rule < y.rule ? -1 : x.rule > y.rule ? 1 : 0));
  return {
    status: 'ok',
    errors,
    structure,
    design: d,
    points: pts,
    alerts,
    changePoints,
    changePointSettings: { penalty: pelt.penalty, minSegment: pelt.minSegment, sigma: pelt.sigma, method: 'pelt-normal-mean' },
    capability,
    capabilitySettings,
  };
}
