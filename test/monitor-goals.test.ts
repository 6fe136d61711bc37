// The drift goals, measured by seeded simulation through the monitor stage's own analysis (chart
// structure, self-starting charts, alert filtering toward the specification limits): in control
// with every parameter estimated from the data, at most one false alert per series per 500
// tests and direction; a 1.5 SD step in individual tests (no heat effect) detected within a
// median of 7 tests, a 1 SD step within 15, and with a between-heat SD of half the within-heat
// SD a 1.5 total-SD step within 12; an alert dated before the true shift counts as a false alarm.
// Invented series (drift-simulation.ts): one test a day, heats of 4, grade limits 3 SD from the
// mean. `npm run bench:drift` prints the same figures on more series.
import { describe, expect, it } from 'vitest';
import { detectionDelay, falseAlertRate, stepIndex, type DriftScenario } from '../packages/pipeline/src/monitor/drift-simulation.ts';

const IN_CONTROL: DriftScenario = { tests: 500, heatSize: 4, heatRatio: 0, stepSd: 0, stepAt: 0, marginSd: 3 };
const STEP: DriftScenario = { tests: 300, heatSize: 4, heatRatio: 0, stepSd: -1.5, stepAt: 150, marginSd: 3 };
const SERIES = 120;

describe('in control, parameters estimated: false alerts per series per 500 tests, per direction', () => {
  for (const heatRatio of [0, 0.5]) {
    it(`between-heat SD ${heatRatio} × within-heat SD: at most 1 downward and 1 upward`, () => {
      const r = falseAlertRate({ ...IN_CONTROL, heatRatio }, SERIES, 424_000 + 1000 * heatRatio);
      console.log(`in control, heat ratio ${heatRatio}: ${r.down.toFixed(2)} ± ${r.downSe.toFixed(2)} down, ${r.up.toFixed(2)} ± ${r.upSe.toFixed(2)} up per 500 tests; heat means charted in ${(100 * r.heatMeansShare).toFixed(0)} %`);
      // the goal with room for sampling error: the upper 3-SE bound stays under one
      expect(r.down + 3 * r.downSe).toBeLessThan(1);
      expect(r.up + 3 * r.upSe).toBeLessThan(1);
      if (heatRatio === 0) expect(r.heatMeansShare).toBeLessThan(0.15);
      else expect(r.heatMeansShare).toBeGreaterThan(0.6);
    });
  }
});

describe('tests to detect a downward step (median over seeded series)', () => {
  const cases: [string, DriftScenario, number][] = [
    ['1.5 SD, no heat effect', STEP, 7],
    ['1 SD, no heat effect', { ...STEP, stepSd: -1 }, 15],
    ['1.5 total SD, between-heat SD half the within-heat SD', { ...STEP, heatRatio: 0.5 }, 12],
  ];
  for (const [name, s, goal] of cases) {
    it(`${name}: median within ${goal} tests; alerts before the shift counted as false alarms`, () => {
      const r = detectionDelay(s, SERIES, 515_000 + goal);
      const before = stepIndex(s);
      const falsePer500 = (r.falseBefore / (SERIES * before)) * 500;
      console.log(`${name}: median ${r.median} tests (quartiles ${r.q1}–${r.q3}), undetected ${r.undetected}, false alarms before the shift ${r.falseBefore} (${falsePer500.toFixed(2)} per 500 tests), first rule ${JSON.stringify(r.firstRule)}`);
      expect(r.median).toBeLessThanOrEqual(goal);
      expect(r.undetected).toBe(0);
      // what rang before the shift is a false alarm, and rings no more often than in control
      expect(falsePer500).toBeLessThan(1);
      expect(r.after).toBeGreaterThan(0);
    });
  }
});
