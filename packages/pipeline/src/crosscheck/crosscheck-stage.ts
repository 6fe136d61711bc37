/**
 * Curve versus certificate: where a test has both a curve and certificate (summary) values, the
 * certificate's yield (by its own definition: Rp0.2, Rt0.5, ReH or ReL), tensile strength, uniform
 * elongation and elongation after fracture are compared with the values reduced from the curve,
 * per supplier and property: the paired differences certificate − curve (stats
 * paired-differences.ts: mean with its 95 % t interval, SD, Bland–Altman limits of agreement,
 * mean relative difference). A supplier whose interval excludes zero reports systematically
 * higher (or lower) values than its curves give. The population rules apply (excluded tests and
 * withheld values are left out, population.ts). Not stored: computed from the per-test rows.
 */
import { certificateValuesBesideCurves, type CertificateValues, type Store } from '@fractile/store';
import { pairedDifferences, type PairedDifferences } from '@fractile/stats';
import type { PopulationOptions } from '../population.ts';
import { loadProperties, type PropertyFilter, type PropertyRow } from '../properties.ts';

/** The curve property a certificate value is compared with. */
export type CheckedProperty = 'yield_mpa' | 'rm_mpa' | 'ag_pct' | 'a_pct';

export interface CrossCheckRow extends PairedDifferences {
  supplier: string;
  /** the property compared (yield by the certificate's definition) */
  property: CheckedProperty;
  /** the curve value it is compared with, e.g. `rp02_mpa` for a yield given as Rp0.2 */
  curve_key: string;
  unit: 'MPa' | '%';
  /** true when the interval of the mean difference excludes zero */
  systematic: boolean;
}

export interface CrossCheckPair {
  lab: string;
  test_id: string;
  supplier: string;
  grade: string;
  property: CheckedProperty;
  curve_key: string;
  certificate: number;
  curve: number;
  difference: number;
}

export interface CrossCheckResult {
  /** tests with both a curve and certificate values (after the population rules) */
  tests: number;
  rows: CrossCheckRow[];
  pairs: CrossCheckPair[];
}

const YIELD_KEY: Record<string, keyof PropertyRow> = { 'rp0.2': 'rp02_mpa', 'rt0.5': 'rt05_mpa', reh: 'reh_mpa', rel: 'rel_mpa' };

/** The (property, curve key, certificate value, curve value) of one test, where both exist. */
function comparisons(c: CertificateValues, p: PropertyRow): { property: CheckedProperty; curve_key: string; certificate: number; curve: number }[] {
  const out: { property: CheckedProperty; curve_key: string; certificate: number; curve: number }[] = [];
  const add = (property: CheckedProperty, curveKey: keyof PropertyRow, given: number | null) => {
    const curve = p[curveKey];
    if (given !== null && typeof curve === 'number' && Number.isFinite(curve)) out.push({ property, curve_key: String(curveKey), certificate: given, curve });
  };
  if (c.yield_definition && YIELD_KEY[c.yield_definition]) add('yield_mpa', YIELD_KEY[c.yield_definition], c.yield_mpa);
  add('rm_mpa', 'rm_mpa', c.tensile_mpa);
  add('ag_pct', 'ag_pct', c.uniform_elongation_pct);
  add('a_pct', 'a_pct', c.elongation_pct);
  return out;
}

/** The cross-check on given rows (pure): per supplier and property, in supplier then property order. */
export function crossCheck(certificates: readonly CertificateValues[], rows: readonly PropertyRow[]): CrossCheckResult {
  const byPk = new Map(rows.map((r) => [r.test_pk, r]));
  const pairs: CrossCheckPair[] = [];
  let tests = 0;
  for (const c of certificates) {
    const p = byPk.get(c.test_row_id);
    if (!p || p.failure || p.given) continue;
    const cmp = comparisons(c, p);
    if (cmp.length) tests++;
    for (const x of cmp) pairs.push({ lab: p.lab, test_id: p.test_id, supplier: p.supplier, grade: p.grade, ...x, difference: x.certificate - x.curve });
  }
  const order: CheckedProperty[] = ['yield_mpa', 'rm_mpa', 'ag_pct', 'a_pct'];
  const groups = new Map<string, CrossCheckPair[]>();
  for (const p of pairs) {
    const k = JSON.stringify([p.supplier, order.indexOf(p.property), p.curve_key]);
    if (!groups.has(k)) groups.set(k, []);
    groups.get(k)!.push(p);
  }
  const result: CrossCheckRow[] = [...groups.entries()]
    .sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0))
    .map(([, g]) => {
      const d = pairedDifferences(g.map((x) => x.certificate), g.map((x) => x.curve));
      return { supplier: g[0].supplier, property: g[0].property, curve_key: g[0].curve_key, unit: g[0].property.endsWith('_pct') ? '%' : 'MPa', ...d, systematic: d.ci !== null && (d.ci[0] > 0 || d.ci[1] < 0) };
    });
  return { tests, rows: result, pairs };
}

/** Loads the certificates beside curves and the population's per-test values, and compares them. */
export async function runCrossCheck(store: Store, opts: { filter?: PropertyFilter; population?: PopulationOptions } = {}): Promise<CrossCheckResult> {
  const certificates = await certificateValuesBesideCurves(store.db);
  if (certificates.length === 0) return { tests: 0, rows: [], pairs: [] };
  const rows = await loadProperties(store.db, opts.filter ?? {}, opts.population ?? {});
  return crossCheck(certificates, rows);
}
