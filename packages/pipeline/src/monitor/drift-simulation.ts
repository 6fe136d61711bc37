/**
 * Seeded simulation of one supplier's series, to measure the drift alarms as a user meets them
 * (through `analyzeDrift`, alert filtering included): false alerts in control, tests to detect
 * a step, and whether each alert's `detected_on` falls on or after the true shift.
 * Model: yield = 400 MPa + heat effect + test scatter + step, one test a day; heats of
 * `heatSize` consecutive tests; heat effect N(0, σ_b²) and scatter N(0, σ_w²) with
 * σ_b/σ_w = `heatRatio` and σ_b² + σ_w² = 12² MPa² (one test's SD, 12 MPa); from test `stepAt` on
 * (moved back to the start of its heat: a shift comes with a heat) the mean moves by `stepSd`
 * test SDs. The grade's minimum lies `marginSd` SDs below 400 MPa and its maximum as far above.
 * Invented data; the generator is the monitor's seeded Mersenne Twister.
 */
import { createMonitorRandom } from '@fractile/stats';
import type { Catalog } from '../catalog.ts';
import type { PropertyRow } from '../properties.ts';
import { analyzeDrift, type DriftAlertCore } from './stage.ts';

export interface DriftScenario {
  tests: number;
  heatSize: number;
  heatRatio: number;
  stepSd: number;
  stepAt: number;
  marginSd: number;
}

export const SIM_MEAN_MPA = 400;
export const SIM_SD_MPA = 12;
const GRADE = 'SIM-355';
const DAY_MS = 86_400_000;
const START = Date.UTC(2022, 0, 3);

export const DOWNWARD = new Set(['individuals-below-lcl', 'cusum-low', 'change-point-down', 'capability-below-minimum', 'ewma-low']);

export function simulationCatalog(s: DriftScenario): Catalog {
  const spec = { yield_min_mpa: SIM_MEAN_MPA - s.marginSd * SIM_SD_MPA, yield_max_mpa: SIM_MEAN_MPA + s.marginSd * SIM_SD_MPA };
  return { grades: { [GRADE]: { family: 'steel', yield_definition: 'rp0.2', rp_offset_pct: 0.2, rt_total_pct: 0.5, spec } } };
}

/** First shifted test: `stepAt` moved back to the start of its heat. */
export function stepIndex(s: DriftScenario): number {
  return Math.floor(s.stepAt / s.heatSize) * s.heatSize;
}

export function simulatedRows(s: DriftScenario, seed: number): PropertyRow[] {
  const rng = createMonitorRandom(seed);
  const sw = SIM_SD_MPA / Math.sqrt(1 + s.heatRatio * s.heatRatio);
  const sb = sw * s.heatRatio;
  const at = stepIndex(s);
  const rows: PropertyRow[] = [];
  let effect = 0;
  for (let i = 0; i < s.tests; i++) {
    if (i % s.heatSize === 0) effect = sb * rng.normal();
    const y = SIM_MEAN_MPA + effect + sw * rng.normal() + (i >= at ? s.stepSd * SIM_SD_MPA : 0);
    rows.push({
      lab: 'sim', test_id: `S${seed}-${i}`, grade: GRADE, supplier: `Mill ${seed}`, heat: `H${seed}-${Math.floor(i / s.heatSize)}`,
      tested_on: new Date(START + i * DAY_MS).toISOString().slice(0, 10),
      modulus_gpa: null, rp02_mpa: y, rt05_mpa: null, reh_mpa: null, rel_mpa: null, ype_pct: null, rm_mpa: null, ag_pct: null, agt_pct: null,
      a_pct: null, yt_ratio: null, n_value: null, k_mpa: null, yield_mpa: y, yield_definition: 'rp0.2', shape_class: 'continuous', flags: [],
      given: false, failure: null, orientation: null, temperature_c: null, shape: 'round', test_pk: i + 1, settings_hash: 'sim',
    });
  }
  return rows;
}

/** The alerts of one simulated series and whether it was charted by heat means. */
export function simulateAlerts(s: DriftScenario, seed: number, rows = simulatedRows(s, seed)): { alerts: DriftAlertCore[]; heatMeans: boolean } {
  const r = analyzeDrift(rows, { by: ['supplier', 'grade'], properties: ['yield_mpa'], catalog: simulationCatalog(s), monitor: { changePoint: { bootstrap: 0 } } });
  return { alerts: r.alerts, heatMeans: r.series[0]?.monitor.structure?.unit === 'heat-means' };
}

export interface FalseAlertRate {
  series: number;
  testsPerSeries: number;
  /** Mean alerts per series per 500 tests, by direction, and its standard error. */
  down: number;
  downSe: number;
  up: number;
  upSe: number;
  byRule: Record<string, number>;
  heatMeansShare: number;
}

/** In-control false alerts of `series` seeded series (seeds seed, seed + 1, …). */
export function falseAlertRate(s: DriftScenario, series: number, seed: number): FalseAlertRate {
  const down: number[] = [];
  const up: number[] = [];
  const byRule: Record<string, number> = {};
  let heat = 0;
  const per500 = 500 / s.tests;
  for (let r = 0; r < series; r++) {
    const { alerts, heatMeans } = simulateAlerts({ ...s, stepSd: 0 }, seed + r);
    if (heatMeans) heat++;
    let d = 0;
    for (const a of alerts) {
      byRule[a.rule] = (byRule[a.rule] ?? 0) + 1;
      if (DOWNWARD.has(a.rule)) d++;
    }
    down.push(d * per500);
    up.push((alerts.length - d) * per500);
  }
  const meanSe = (x: number[]) => {
    const m = x.reduce((a, b) => a + b, 0) / x.length;
    const v = x.reduce((a, b) => a + (b - m) ** 2, 0) / Math.max(1, x.length - 1);
    return [m, Math.sqrt(v / x.length)];
  };
  const [dm, ds] = meanSe(down);
  const [um, us] = meanSe(up);
  return { series, testsPerSeries: s.tests, down: dm, downSe: ds, up: um, upSe: us, byRule, heatMeansShare: heat / series };
}

export interface Detection {
  series: number;
  /** Tests from the first shifted one to the detecting one (Infinity: not detected), ascending. */
  delays: number[];
  median: number;
  q1: number;
  q3: number;
  undetected: number;
  /** Alerts in the shift's direction dated before the shift: false alarms. */
  falseBefore: number;
  /** Alerts in the shift's direction dated on or after it. */
  after: number;
  /** Rule of the first alert on or after the shift, counted. */
  firstRule: Record<string, number>;
  heatMeansShare: number;
  /** Median of (detected_on − change_date) in days over the first alerts that estimate a change date. */
  medianChangeLeadDays: number | null;
}

const at = (sorted: number[], q: number) => sorted[Math.min(sorted.length - 1, Math.floor(q * sorted.length))];

/** Tests to detect a downward step (stepSd < 0) in `series` seeded series. */
export function detectionDelay(s: DriftScenario, series: number, seed: number): Detection {
  const first = stepIndex(s);
  const shiftDate = new Date(START + first * DAY_MS).toISOString().slice(0, 10);
  const delays: number[] = [];
  const firstRule: Record<string, number> = {};
  const leads: number[] = [];
  let falseBefore = 0;
  let after = 0;
  let heat = 0;
  for (let r = 0; r < series; r++) {
    const { alerts, heatMeans } = simulateAlerts(s, seed + r);
    if (heatMeans) heat++;
    const down = alerts.filter((a) => DOWNWARD.has(a.rule)).sort((a, b) => (a.detected_on < b.detected_on ? -1 : a.detected_on > b.detected_on ? 1 : 0));
    const late = down.filter((a) => a.detected_on >= shiftDate);
    falseBefore += down.length - late.length;
    after += late.length;
    const hit = late[0];
    if (!hit) {
      delays.push(Infinity);
      continue;
    }
    firstRule[hit.rule] = (firstRule[hit.rule] ?? 0) + 1;
    // one test a day: tests from the first shifted one up to the detection date
    delays.push(Math.round((Date.parse(hit.detected_on) - Date.parse(shiftDate)) / DAY_MS) + 1);
    if (hit.change_date) leads.push(Math.round((Date.parse(hit.detected_on) - Date.parse(hit.change_date)) / DAY_MS));
  }
  delays.sort((a, b) => a - b);
  leads.sort((a, b) => a - b);
  return {
    series, delays, median: at(delays, 0.5), q1: at(delays, 0.25), q3: at(delays, 0.75),
    undetected: delays.filter((d) => !Number.isFinite(d)).length, falseBefore, after, firstRule, heatMeansShare: heat / series,
    medianChangeLeadDays: leads.length ? at(leads, 0.5) : null,
  };
}

/**
 * What a user running drift every week would have seen in control: the analysis is run on the
 * data up to each seventh day, and every alert id any of those runs reported is counted once.
 * Alerts per series per 500 tests, both directions together.
 */
export function weeklyFalseAlerts(s: DriftScenario, series: number, seed: number): { perSeriesPer500: number; finalPer500: number } {
  let seen = 0;
  let final = 0;
  for (let r = 0; r < series; r++) {
    const rows = simulatedRows({ ...s, stepSd: 0 }, seed + r);
    const ids = new Set<string>();
    for (let t = 7; t <= rows.length; t += 7) for (const a of simulateAlerts(s, seed + r, rows.slice(0, t)).alerts) ids.add(a.id);
    const last = simulateAlerts(s, seed + r, rows).alerts;
    for (const a of last) ids.add(a.id);
    final += last.length;
    seen += ids.size;
  }
  const k = 500 / s.tests / series;
  return { perSeriesPer500: seen * k, finalPer500: final * k };
}
