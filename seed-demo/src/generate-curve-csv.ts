/**
 * One curve file's text for a specimen of a demo grade, for callers that want a single curve
 * (tests, benchmarks): the law drawn from the grade's population at the given strength,
 * simulated and written in the chosen layout (default kN/mm).
 */
import { formatCurveCsv } from './curve-format.ts';
import { Rng } from './random.ts';
import type { CurveLayout } from './scenario.ts';
import { gradeDef } from './scenario.ts';
import { simulateTest } from './simulate-test.ts';
import type { CurveTruth } from './engineering-curve.ts';
import type { HardeningLaw } from './hardening-laws.ts';

export interface CurveCsvOptions {
  grade: string;
  /** defining stress of the population model (ReL or σ0), MPa; default the grade's mean */
  strengthMpa?: number;
  areaMm2: number;
  gaugeLengthMm: number;
  points?: number;
  seed?: number;
  layout?: CurveLayout;
  loop?: boolean;
  testId?: string;
}

export function generateCurveCsv(opts: CurveCsvOptions): { text: string; truth: CurveTruth; law: HardeningLaw } {
  const g = gradeDef(opts.grade);
  const rng = new Rng(opts.seed ?? 1);
  const layout = opts.layout ?? 'kn-mm';
  const sim = simulateTest(
    g,
    opts.strengthMpa ?? g.strengthMeanMpa,
    0,
    0,
    { areaMm2: opts.areaMm2, gaugeLengthMm: opts.gaugeLengthMm, parallelLengthMm: opts.gaugeLengthMm + 1.5 * Math.sqrt(opts.areaMm2) },
    { withSignal: true, points: opts.points ?? 1500, loop: opts.loop ?? false, removeExtensometer: layout === 'extensometer-removed' },
    rng,
  );
  const text = formatCurveCsv(sim.signal!, layout, {
    testId: opts.testId ?? 'CURVE-1',
    comments: ['single demo curve (invented data)'],
    areaMm2: opts.areaMm2,
    gaugeLengthMm: opts.gaugeLengthMm,
    labName: 'demo',
    testedOn: '2024-01-01',
  }).toString('utf8');
  return { text, truth: sim.curve.truth, law: sim.draw.law };
}
