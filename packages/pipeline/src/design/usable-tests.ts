/**
 * The tests of a group that can enter its curves: a stress per grid point (non-finite values
 * read as absent) and at least one of them present. Left out, each with a warning naming them:
 * a stress count other than the grid's (`grid_mismatch`), no stress at all (`no_curve`); an id
 * seen twice is kept and reported (`duplicate_test`).
 */
import type { TestGridCurve } from './types.ts';

export interface UsableTest {
  id: string;
  /** stress on the grid, `null` where absent (MPa) */
  stress: (number | null)[];
  src: TestGridCurve;
}

/** At most five ids, then how many in all. */
function listIds(ids: readonly string[]): string {
  return ids.slice(0, 5).join(', ') + (ids.length > 5 ? `, … (${ids.length} in all)` : '');
}

export function usableTests(all: readonly TestGridCurve[], gridLength: number): { tests: UsableTest[]; warnings: string[] } {
  const seen = new Set<string>();
  const mismatched: string[] = [];
  const empty: string[] = [];
  const duplicates: string[] = [];
  const tests: UsableTest[] = [];
  for (const t of all) {
    if (t.stress_mpa.length !== gridLength) {
      mismatched.push(t.test_id);
      continue;
    }
    const stress = t.stress_mpa.map((v) => (v !== null && Number.isFinite(v) ? v : null));
    if (!stress.some((v) => v !== null)) {
      empty.push(t.test_id);
      continue;
    }
    if (seen.has(t.test_id)) duplicates.push(t.test_id);
    seen.add(t.test_id);
    tests.push({ id: t.test_id, stress, src: t });
  }
  const warnings: string[] = [];
  if (mismatched.length > 0) warnings.push(`grid_mismatch: ${mismatched.length} test(s) with a stress count other than the ${gridLength} grid points left out: ${listIds(mismatched)}`);
  if (empty.length > 0) warnings.push(`no_curve: ${empty.length} test(s) without stress on the grid left out: ${listIds(empty)}`);
  if (duplicates.length > 0) warnings.push(`duplicate_test: test id(s) appearing more than once: ${listIds(duplicates)}`);
  return { tests, warnings };
}
