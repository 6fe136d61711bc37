/**
 * Monitoring of one series (one group × property, in time order): individuals and MR chart,
 * EWMA and tabular CUSUM on values standardized by the baseline (z = (x − x̄₀)/σ̂₀ with
 * σ̂₀ = MR̄₀/1.128), PELT change points in the mean with shift intervals, rolling capability
 * against the grade minimum, and alerts. Each piece names its source in its own file.
 * Defaults (stated): baseline = first 30 points (all if fewer); EWMA λ = 0.1, L = 2.814 with
 * asymptotic limits (Lucas & Saccucci 1990, ARL0 ≈ 500, ARL 10.3 at 1σ); CUSUM k = 0.5, h = 5 (Montgomery,
 * ARL0 ≈ 465); alert episodes of one rule ≤ 5 points apart joined; change points: penalty 2·ln n, minimum segment 5, 199 bootstrap resamples;
 * rolling window 30 (capability from 10 points on); capability alert below Cpk 1.33 (common
 * practice).
 * Units: values, limits, shifts in the property's units; z, EWMA, CUSUM and margins in SD.
 * Input must already be in time order (see orderSeriesPoints).
 * Degenerate input: an empty series, or a baseline with no spread, gives status 'degenerate',
 * an error value and no chart points (capability and change points are still computed where
 * they can be); a non-finite value gives status 'degenerate', one error per such point and
 * nothing else, so the caller drops or fixes those points. O(n) per series apart from PELT (O(n) expected, O(n²) worst case) and the
 * bootstrap (O(B·n) per change point).
 */
import type { MonitorError, MonitorOptions, SeriesPoint } from './types.ts';
import type { Alert } from './alerts.ts';
import type { CapabilityPoint } from './capability.ts';
import type { ChangePoint } from './change-point-uncertainty.ts';
import { baselineStats, individualsLimits, movingRanges, selectBaseline, DEFAULT_BASELINE_N } from './individuals-chart.ts';
import { DEFAULT_EWMA, ewmaChart } from './ewma.ts';
import { DEFAULT_CUSUM, cusumChart } from './cusum.ts';
import { DEFAULT_MIN_SEGMENT, peltMeanChange } from './change-points.ts';
import { describeChangePoints } from './change-point-uncertainty.ts';
import { rollingCapability } from './capability.ts';
import { DEFAULT_ALERT_MERGE_GAP, extremeIndex, flagEpisodes } from './alerts.ts';

export interface ChartPoint {
  index: number;
  date: string;
  testId: string;
  value: number;
  mr: number | null;
  /** Standardized value, SD. */
  z: number;
  /** EWMA of z, SD. */
  ewma: number;
  cusumHigh: number;
  cusumLow: number;
  outIndividuals: boolean;
  outMr: boolean;
  outEwma: boolean;
  outCusum: boolean;
}

export interface SeriesMonitor {
  status: 'ok' | 'degenerate';
  errors: MonitorError[];
  baseline: { n: number; start: number; end: number; mean: number; sd: number; mrBar: number; sigma: number; sigmaSource: string };
  /** Property units. */
  individuals: { center: number; ucl: number; lcl: number; mrUcl: number };
  /** On the standardized scale (SD); arrays per point for 'exact' limits. */
  ewmaLimits: { ucl: number[]; lcl: number[] } | { ucl: number; lcl: number };
  ewma: { lambda: number; L: number; limits: 'asymptotic' | 'exact' };
  cusum: { k: number; h: number };
  cusumH: number;
  points: ChartPoint[];
  alerts: Alert[];
  changePoints: ChangePoint[];
  changePointSettings: { penalty: number; minSegment: number; sigma: number; method: 'pelt-normal-mean' };
  capability: CapabilityPoint[];
}

export function monitorSeries(points: readonly SeriesPoint[], opts: MonitorOptions = {}): SeriesMonitor {
  const n = points.length;
  const values = new Float64Array(n);
  const dates: string[] = new Array(n);
  const ids: string[] = new Array(n);
  const errors: MonitorError[] = [];
  for (let i = 0; i < n; i++) {
    values[i] = points[i].value;
    dates[i] = points[i].date;
    ids[i] = points[i].testId;
    if (!Number.isFinite(points[i].value)) errors.push({ code: 'value-not-finite', message: `test ${points[i].testId}: value is not a finite number`, location: { index: i } });
  }
  const ewmaP = opts.ewma ?? DEFAULT_EWMA;
  const ewmaKind = opts.ewmaLimits ?? 'asymptotic';
  const cusumP = opts.cusum ?? DEFAULT_CUSUM;
  const cpOpts = opts.changePoint ?? {};
  const minSegment = cpOpts.minSegment ?? DEFAULT_MIN_SEGMENT;

  const result: SeriesMonitor = {
    status: 'ok',
    errors,
    baseline: { n: 0, start: 0, end: -1, mean: 0, sd: 0, mrBar: 0, sigma: 0, sigmaSource: 'none' },
    individuals: { center: 0, ucl: 0, lcl: 0, mrUcl: 0 },
    ewmaLimits: { ucl: 0, lcl: 0 },
    ewma: { ...ewmaP, limits: ewmaKind },
    cusum: { ...cusumP },
    cusumH: cusumP.h,
    points: [],
    alerts: [],
    changePoints: [],
    changePointSettings: { penalty: 0, minSegment, sigma: 0, method: 'pelt-normal-mean' },
    capability: [],
  };
  if (errors.length > 0) {
    result.status = 'degenerate';
    return result;
  }

  // Capability and change points do not depend on the baseline.
  const lsl = opts.lowerSpec;
  if (lsl !== undefined && lsl !== null) {
    const w = opts.rollingWindow ?? 30;
    result.capability = rollingCapability(values, dates, lsl, w, opts.rollingMinPoints ?? Math.min(10, w));
  }
  const pelt = peltMeanChange(values, { penalty: cpOpts.penalty, minSegment });
  result.changePointSettings = { penalty: pelt.penalty, minSegment: pelt.minSegment, sigma: pelt.sigma, method: 'pelt-normal-mean' };
  result.changePoints = describeChangePoints(values, dates, ids, pelt.changes, {
    sigma: pelt.sigma,
    level: cpOpts.level,
    bootstrap: cpOpts.bootstrap,
    seed: cpOpts.seed,
    minSegment,
  });

  const range = selectBaseline(points, opts.baseline ?? { firstN: DEFAULT_BASELINE_N });
  if (range === null) {
    result.status = 'degenerate';
    errors.push({ code: n === 0 ? 'series-empty' : 'baseline-empty', message: n === 0 ? 'the series has no points' : 'no point falls inside the baseline date range' });
    return finishAlerts(result, values, ids, dates, opts);
  }
  const b = baselineStats(values, range.start, range.end, opts.sigma);
  result.baseline = { ...b };
  const lim = individualsLimits(b);
  result.individuals = lim;
  if (!(b.sigma > 0)) {
    result.status = 'degenerate';
    errors.push({ code: 'baseline-no-spread', message: `the baseline's ${b.n} point(s) have no spread; charts need a sigma`, location: { index: range.start } });
    return finishAlerts(result, values, ids, dates, opts);
  }

  const z = new Float64Array(n);
  for (let i = 0; i < n; i++) z[i] = (values[i] - b.mean) / b.sigma;
  const ew = ewmaChart(z, ewmaP, ewmaKind);
  const cu = cusumChart(z, cusumP);
  const mr = movingRanges(values);
  result.ewmaLimits =
    ewmaKind === 'asymptotic'
      ? { ucl: ew.halfWidth[0] ?? 0, lcl: -(ew.halfWidth[0] ?? 0) }
      : { ucl: Array.from(ew.halfWidth), lcl: Array.from(ew.halfWidth, (h) => -h) };
  const below = new Uint8Array(n);
  const above = new Uint8Array(n);
  const mrOut = new Uint8Array(n);
  for (let i = 0; i < n; i++) {
    below[i] = values[i] < lim.lcl ? 1 : 0;
    above[i] = values[i] > lim.ucl ? 1 : 0;
    mrOut[i] = mr[i] !== null && (mr[i] as number) > lim.mrUcl ? 1 : 0;
    result.points.push({
      index: i,
      date: dates[i],
      testId: ids[i],
      value: values[i],
      mr: mr[i],
      z: z[i],
      ewma: ew.ewma[i],
      cusumHigh: cu.high[i],
      cusumLow: cu.low[i],
      outIndividuals: below[i] === 1 || above[i] === 1,
      outMr: mrOut[i] === 1,
      outEwma: ew.outHigh[i] === 1 || ew.outLow[i] === 1,
      outCusum: cu.outHigh[i] === 1 || cu.outLow[i] === 1,
    });
  }

  const sigma = b.sigma;
  const alerts = result.alerts;
  const gap = opts.alertMergeGap ?? DEFAULT_ALERT_MERGE_GAP;
  const push = (rule: string, a: number, e: number, magnitudeSd: number, unit: 'sd' | 'property-units', magnitude: number, detail: string, testsFrom = a) => {
    alerts.push({
      rule,
      first_date: dates[a],
      first_index: a,
      last_date: dates[e],
      last_index: e,
      magnitude,
      magnitude_unit: unit,
      magnitude_sd: magnitudeSd,
      tests: ids.slice(testsFrom, e + 1),
      detail,
    });
  };
  for (const [a, e] of flagEpisodes(below, gap)) {
    const i = extremeIndex((q) => z[q], a, e, -1);
    push('individuals-below-lcl', a, e, z[i], 'sd', z[i], 'most extreme (value − centre)/sigma in the episode');
  }
  for (const [a, e] of flagEpisodes(above, gap)) {
    const i = extremeIndex((q) => z[q], a, e, 1);
    push('individuals-above-ucl', a, e, z[i], 'sd', z[i], 'most extreme (value − centre)/sigma in the episode');
  }
  for (const [a, e] of flagEpisodes(mrOut, gap)) {
    const i = extremeIndex((q) => mr[q] ?? 0, a, e, 1);
    const m = (mr[i] ?? 0) / sigma;
    push('mr-above-ucl', a, e, m, 'sd', m, 'largest moving range / sigma in the episode', Math.max(0, a - 1));
  }
  for (const [a, e] of flagEpisodes(ew.outLow, gap)) {
    const i = extremeIndex((q) => ew.ewma[q], a, e, -1);
    push('ewma-low', a, e, ew.ewma[i], 'sd', ew.ewma[i], 'lowest EWMA of z in the episode');
  }
  for (const [a, e] of flagEpisodes(ew.outHigh, gap)) {
    const i = extremeIndex((q) => ew.ewma[q], a, e, 1);
    push('ewma-high', a, e, ew.ewma[i], 'sd', ew.ewma[i], 'highest EWMA of z in the episode');
  }
  // CUSUM: Montgomery's estimate of the new mean at the first signal, k + C/N; the tests
  // involved start where the sum last left zero.
  for (const [a, e] of flagEpisodes(cu.outLow, gap)) {
    const est = -(cusumP.k + cu.low[a] / cu.nLow[a]);
    push('cusum-low', a, e, est, 'sd', est, 'estimated mean of z since the sum left zero (Montgomery: k + C/N)', a - cu.nLow[a] + 1);
  }
  for (const [a, e] of flagEpisodes(cu.outHigh, gap)) {
    const est = cusumP.k + cu.high[a] / cu.nHigh[a];
    push('cusum-high', a, e, est, 'sd', est, 'estimated mean of z since the sum left zero (Montgomery: k + C/N)', a - cu.nHigh[a] + 1);
  }
  return finishAlerts(result, values, ids, dates, opts);
}

/** Alerts that do not need the baseline: change points and capability; then time order. */
function finishAlerts(result: SeriesMonitor, values: Float64Array, ids: string[], dates: string[], opts: MonitorOptions): SeriesMonitor {
  const sigma = result.baseline.sigma > 0 ? result.baseline.sigma : result.changePointSettings.sigma;
  const bounds = [0, ...result.changePoints.map((c) => c.index), values.length];
  result.changePoints.forEach((c, j) => {
    const end = bounds[j + 2] - 1;
    result.alerts.push({
      rule: c.shift < 0 ? 'change-point-down' : 'change-point-up',
      first_date: c.date,
      first_index: c.index,
      last_date: dates[end],
      last_index: end,
      magnitude: c.shift,
      magnitude_unit: 'property-units',
      magnitude_sd: sigma > 0 ? c.shift / sigma : 0,
      tests: ids.slice(c.index, end + 1),
      detail: `shift of the mean (after − before), ${Math.round(c.level * 100)} % CI [${c.ci[0]}, ${c.ci[1]}]`,
    });
  });
  const minCpk = opts.minCpk ?? 1.33;
  const cap = result.capability;
  if (cap.length > 0) {
    const low = new Uint8Array(cap.length);
    for (let i = 0; i < cap.length; i++) {
      const c = cap[i].cpk ?? cap[i].ppk;
      low[i] = c !== null && c < minCpk ? 1 : 0;
    }
    const window = opts.rollingWindow ?? 30;
    for (const [a, e] of flagEpisodes(low, opts.alertMergeGap ?? DEFAULT_ALERT_MERGE_GAP)) {
      const i = extremeIndex((q) => cap[q].margin_sd ?? Infinity, a, e, -1);
      const m = cap[i].margin_sd ?? 0;
      result.alerts.push({
        rule: 'capability-margin',
        first_date: dates[a],
        first_index: a,
        last_date: dates[e],
        last_index: e,
        magnitude: m,
        magnitude_unit: 'sd',
        magnitude_sd: m,
        tests: ids.slice(Math.max(0, a - window + 1), e + 1),
        detail: `smallest rolling margin (mean − minimum)/SD while Cpk < ${minCpk}`,
      });
    }
  }
  result.alerts.sort((x, y) => x.first_index - y.first_index || (x.rule < y.rule ? -1 : x.rule > y.rule ? 1 : 0));
  return result;
}
