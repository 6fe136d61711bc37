/**
 * Prints one plain closing line after the test run, `tests: N passed, N failed, N skipped`, so
 * that a run's outcome reads the same to a person and to a script.
 */
import type { Reporter, TestModule } from 'vitest/node';

export default class SummaryReporter implements Reporter {
  onTestRunEnd(testModules: ReadonlyArray<TestModule>, unhandledErrors: ReadonlyArray<unknown>): void {
    let passed = 0;
    let failed = 0;
    let skipped = 0;
    for (const m of testModules) {
      for (const t of m.children.allTests()) {
        const state = t.result().state;
        if (state === 'passed') passed++;
        else if (state === 'failed') failed++;
        else skipped++;
      }
    }
    // an error outside any test fails the run as well
    failed += unhandledErrors.length;
    process.stdout.write(`\ntests: ${passed} passed, ${failed} failed, ${skipped} skipped\n`);
  }
}
