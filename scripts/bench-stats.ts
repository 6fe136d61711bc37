/**
 * Benchmark of the aggregate stage's computation: 100,000 tests × 12 properties in 200 groups
 * (grade × supplier), every statistic, fit, characteristic value and correlation. Prints the time
 * of each step. Target: under 5 s on a two-core machine.
 */
import { aggregateRows, NUMERIC_PROPERTIES } from '@fractile/pipeline';
import { peakRssMb, syntheticRows, time } from './bench-util.ts';

const n = Number(process.argv.find((a) => a.startsWith('--tests='))?.slice(8) ?? 100_000);
const groups = Number(process.argv.find((a) => a.startsWith('--groups='))?.slice(9) ?? 200);
console.log(`bench:stats — ${n} tests × ${NUMERIC_PROPERTIES.length} properties in ${groups} groups`);
const { value: rows } = await time('generate rows', () => syntheticRows(n, groups));
const { value: r, seconds } = await time('aggregate (group + summarize + correlate)', () => aggregateRows(rows, { by: ['grade', 'supplier'], catalog: null }));
for (const [k, v] of Object.entries(r.timings)) console.log(`  ${k.padEnd(46)} ${(v / 1000).toFixed(3)} s`);
console.log(`rows: ${r.stats.length} group × property summaries, ${r.correlations.length} correlation matrices`);
console.log(`total aggregate: ${seconds.toFixed(2)} s (target < 5 s); peak RSS ${peakRssMb().toFixed(0)} MB`);
