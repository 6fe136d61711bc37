/**
 * Benchmark of the monitor stage: the time of the drift analysis on 100,000 summary records in
 * 400 supplier × grade series (target: under 5 s), then the drift goals by seeded simulation on
 * more series than the checks use: in-control false alerts per series per 500 tests and
 * direction (parameters estimated), what a user running drift every week would have seen, and
 * the median tests to detect a step. Options: --tests=N --series=N (timing), --sim=N (series per
 * simulated scenario, default 300), --weekly=N (series replayed week by week, default 20).
 */
import { analyzeDrift } from '@fractile/pipeline';
import { detectionDelay, falseAlertRate, stepIndex, weeklyFalseAlerts, type DriftScenario } from '../packages/pipeline/src/monitor/drift-simulation.ts';
import { peakRssMb, syntheticRows, time } from './bench-util.ts';

const arg = (name: string, dflt: number) => Number(process.argv.find((a) => a.startsWith(`--${name}=`))?.slice(name.length + 3) ?? dflt);
const n = arg('tests', 100_000);
const series = arg('series', 400);
const sim = arg('sim', 300);
const weekly = arg('weekly', 20);

console.log(`bench:drift — ${n} records in ${series} supplier × grade series`);
const { value: rows } = await time('generate rows', () => syntheticRows(n, series, 7));
const cpu0 = process.cpuUsage();
const { value: r, seconds } = await time('drift (charts, change points, capability, comparisons)', () =>
  analyzeDrift(rows, { by: ['supplier', 'grade'], properties: ['yield_mpa'], catalog: null }),
);
const cpu = process.cpuUsage(cpu0);
console.log(`series: ${r.series.length}, alerts: ${r.alerts.length}, change points: ${r.change_points.length}, comparisons: ${r.comparisons.length}`);
// one thread: on a quiet machine wall ≈ CPU; on a shared one the CPU time says what the work costs
console.log(`total drift: ${seconds.toFixed(2)} s wall, ${((cpu.user + cpu.system) / 1e6).toFixed(2)} s CPU (target < 5 s); peak RSS ${peakRssMb().toFixed(0)} MB`);

console.log(`\nsimulated goals (${sim} seeded series per scenario; one test a day, heats of 4, limits 3 SD from the mean)`);
const IN_CONTROL: DriftScenario = { tests: 500, heatSize: 4, heatRatio: 0, stepSd: 0, stepAt: 0, marginSd: 3 };
for (const heatRatio of [0, 0.5]) {
  const { value: f } = await time(`in control, between-heat SD ${heatRatio} × within`, () => falseAlertRate({ ...IN_CONTROL, heatRatio }, sim, 900_000 + 1000 * heatRatio));
  console.log(`  false alerts per series per 500 tests: ${f.down.toFixed(2)} ± ${f.downSe.toFixed(2)} down, ${f.up.toFixed(2)} ± ${f.upSe.toFixed(2)} up (goal ≤ 1 each); heat means charted in ${(100 * f.heatMeansShare).toFixed(0)} %; by rule ${JSON.stringify(f.byRule)}`);
}
for (const heatRatio of [0, 0.5]) {
  const { value: w } = await time(`week by week, ${weekly} series, between-heat SD ${heatRatio} × within`, () => weeklyFalseAlerts({ ...IN_CONTROL, heatRatio }, weekly, 950_000 + 1000 * heatRatio));
  console.log(`  alerts seen by a weekly user per series per 500 tests (both directions): ${w.perSeriesPer500.toFixed(2)}; in the final run: ${w.finalPer500.toFixed(2)}`);
}
const STEP: DriftScenario = { tests: 300, heatSize: 4, heatRatio: 0, stepSd: -1.5, stepAt: 150, marginSd: 3 };
const cases: [string, DriftScenario, number][] = [
  ['1.5 SD step, no heat effect', STEP, 7],
  ['1 SD step, no heat effect', { ...STEP, stepSd: -1 }, 15],
  ['1.5 total-SD step, between-heat SD 0.5 × within', { ...STEP, heatRatio: 0.5 }, 12],
];
for (const [name, s, goal] of cases) {
  const { value: d } = await time(name, () => detectionDelay(s, sim, 960_000 + goal));
  const before = (d.falseBefore / (sim * stepIndex(s))) * 500;
  console.log(`  tests to detect: median ${d.median} (goal ≤ ${goal}), quartiles ${d.q1}–${d.q3}, undetected ${d.undetected}; detection − estimated start: median ${d.medianChangeLeadDays} days`);
  console.log(`  alerts before the shift (false alarms): ${d.falseBefore} (${before.toFixed(2)} per 500 tests); on or after it: ${d.after}; first rule ${JSON.stringify(d.firstRule)}`);
}
