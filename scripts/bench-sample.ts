/**
 * Benchmark of the sample stage's computations and of planning: the distribution models (fits,
 * asymptotic covariance, normal-score correlation, a 500-replicate bootstrap) of 20,000 tests in
 * 20 groups; the curve model of 2,000 Swift-law curves on a 301-point grid and 10,000 random
 * curves drawn from it; the planning table (10, 20, 50 added tests, 2,000 replicates) of the
 * headline rule on 300 values. Prints the time of each step and the peak RSS.
 */
import { seededRandom } from '@fractile/curves/testing';
import { aggregateRows, distributionModels } from '@fractile/pipeline';
import { fitCurveModel, fitLognormal, planSampleSize, sampleCurves } from '@fractile/stats';
import { normal, peakRssMb, syntheticRows, time } from './bench-util.ts';

const n = Number(process.argv.find((a) => a.startsWith('--tests='))?.slice(8) ?? 20_000);
const groups = Number(process.argv.find((a) => a.startsWith('--groups='))?.slice(9) ?? 20);
console.log(`bench:sample — distribution models of ${n} tests in ${groups} groups; curve model of 2,000 curves; planning on 300 values`);
const rows = syntheticRows(n, groups);
const agg = aggregateRows(rows, { by: ['grade', 'supplier'], catalog: null, properties: ['yield_mpa', 'rm_mpa', 'ag_pct', 'n_value'] });
await time('distribution models, bootstrap 500', () => distributionModels(agg, rows, { by: ['grade', 'supplier'], properties: ['yield_mpa', 'rm_mpa', 'ag_pct', 'n_value'], bootstrap: 500, seed: 1 }));

const grid = Array.from({ length: 301 }, (_, i) => i / 1000);
const z = normal(seededRandom(3));
const curves = Array.from({ length: 2000 }, (_, i) => {
  const k = 780 * Math.exp(0.05 * z());
  const m = 0.16 + 0.02 * z();
  const e0 = 0.006;
  const u = m - e0 + 0.008 * z();
  return { id: String(i), stress_mpa: grid.map((e) => (e <= u ? k * Math.pow(e0 + e, m) : null)), uniform_plastic_strain: u };
});
const { value: model } = await time('curve model, 2,000 curves', () => fitCurveModel(grid, curves));
if ('code' in model) throw new Error(model.message);
await time('10,000 random curves', () => sampleCurves(model, grid, 10_000, 1));

const values = Array.from({ length: 300 }, () => 420 * Math.exp(0.05 * z()));
await time('planning, lowest-model rule, 2,000 replicates', () => planSampleSize(values, 'lowest-model', { coverage: 0.95, confidence: 0.75 }, fitLognormal(values)!, { added: [10, 20, 50] }));
console.log(`peak RSS ${peakRssMb().toFixed(0)} MB`);
