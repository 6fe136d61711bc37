/**
 * Writes packages/stats/src/weibull-factor-table.ts: the exact Weibull tolerance factors t(n, p, γ)
 * (Thoman, Bain & Antle; see weibull-tolerance-factor.ts) from WEIBULL_TABLE_SAMPLES simulated
 * pivots per n, each n with its own fixed seed (pivotSeed), so the table is reproducible bit for
 * bit. Run:  node --import tsx scripts/generate-weibull-factors.ts [--check]
 * With --check it recomputes the table and reports whether the shipped file is identical.
 */
import { readFileSync, writeFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { pivotFactor, WEIBULL_TABLE_SAMPLES } from '../packages/stats/src/weibull-tolerance-factor.ts';
import { simulateWeibullPivots } from '../packages/stats/src/weibull-pivot.ts';

const out = fileURLToPath(new URL('../packages/stats/src/weibull-factor-table.ts', import.meta.url));
const DENSE_TO = 200;
const SIZES = [...Array.from({ length: DENSE_TO - 2 }, (_, i) => i + 3), 220, 250, 300, 350, 400, 500, 600, 700, 800, 1000, 1200, 1500, 2000, 3000, 5000, 10000];
const LEVELS: [number, number][] = [];
for (const p of [0.9, 0.95, 0.99]) for (const g of [0.75, 0.9, 0.95, 0.99]) LEVELS.push([p, g]);

const t0 = performance.now();
const rows: number[][] = [];
for (const n of SIZES) {
  const piv = simulateWeibullPivots(n, WEIBULL_TABLE_SAMPLES);
  rows.push(LEVELS.map(([p, g]) => pivotFactor(piv, p, g)));
  if (n % 50 === 0 || n > DENSE_TO) process.stderr.write(`n = ${n}: ${((performance.now() - t0) / 1000).toFixed(0)} s\n`);
}
const text = `/**
 * Exact one-sided Weibull tolerance factors t(n, p, γ) for L = λ̂·exp(−t/k̂), written by
 * scripts/generate-weibull-factors.ts (do not edit by hand): the ⌈γM⌉-th smallest of M = ${WEIBULL_TABLE_SAMPLES}
 * simulated pivots (Z₁ − w)/Z₂, w = ln(−ln p), per n with seed pivotSeed(n) (weibull-pivot.ts).
 * Rows follow \`n\` (every n from 3 to ${DENSE_TO}, then sparser); columns follow \`levels\` ([p, γ]).
 */
import type { WeibullFactorTable } from './weibull-tolerance-factor.ts';

export const WEIBULL_FACTOR_TABLE: WeibullFactorTable = {
  samples: ${WEIBULL_TABLE_SAMPLES},
  denseTo: ${DENSE_TO},
  levels: ${JSON.stringify(LEVELS)},
  n: ${JSON.stringify(SIZES)},
  t: [
${rows.map((r, i) => `    [${r.map((v) => Number(v.toPrecision(7))).join(', ')}], // n = ${SIZES[i]}`).join('\n')}
  ],
};
`;
if (process.argv.includes('--check')) {
  const same = readFileSync(out, 'utf8') === text;
  process.stdout.write(same ? 'table reproduced exactly\n' : 'table differs from the shipped file\n');
  process.exitCode = same ? 0 : 1;
} else {
  writeFileSync(out, text);
  process.stderr.write(`wrote ${out} (${SIZES.length} sizes × ${LEVELS.length} levels) in ${((performance.now() - t0) / 1000).toFixed(0)} s\n`);
}
