/**
 * Benchmark of the monitor stage's computation: 100,000 summary records in 400 supplier × grade
 * series, yield and tensile strength each through the charts, change points and capability, and
 * suppliers compared within each grade. Target: under 5 s.
 */
import { analyzeDrift } from '@fractile/pipeline';
import { peakRssMb, syntheticRows, time } from './bench-util.ts';

const n = Number(process.argv.find((a) => a.startsWith('--tests='))?.slice(8) ?? 100_000);
const series = Number(process.argv.find((a) => a.startsWith('--series='))?.slice(9) ?? 400);
console.log(`bench:drift — ${n} records in ${series} supplier × grade series`);
const { value: rows } = await time('generate rows', () => syntheticRows(n, series, 7));
const { value: r, seconds } = await time('drift (charts, change points, capability, comparisons)', () =>
  analyzeDrift(rows, { by: ['supplier', 'grade'], properties: ['yield_mpa'], catalog: null }),
);
console.log(`series: ${r.series.length}, alerts: ${r.alerts.length}, change points: ${r.change_points.length}, comparisons: ${r.comparisons.length}`);
console.log(`total drift: ${seconds.toFixed(2)} s (target < 5 s); peak RSS ${peakRssMb().toFixed(0)} MB`);
