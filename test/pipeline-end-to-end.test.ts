/**
 * The main job end to end on each test database: the invented demo scenario is generated,
 * ingested, reduced, aggregated, turned into design curves and drift results. Checks against
 * things outside the pipeline: the generator's laws (the exact properties it built each curve
 * from, truth.csv), the generator's list of deliberately bad inputs, and the JSON contracts.
 */
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { parse } from 'csv-parse/sync';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ingestManifests } from '@fractile/ingest';
import { driftContract, loadCatalog, loadProperties, runAggregate, runCurves, runDrift, runReduce, type Catalog } from '@fractile/pipeline';
import { generateDemo, type DemoManifest } from '@fractile/seed-demo';
import type { Store } from '@fractile/store';
import { testDatabases } from './support/databases.ts';

const dir = mkdtempSync(join(tmpdir(), 'fractile-e2e-'));
let demo: DemoManifest;
let catalog: Catalog;

beforeAll(() => {
  demo = generateDemo({ outDir: dir, tests: 600, seed: 7, pointsPerCurve: 500 });
  catalog = loadCatalog(join(dir, demo.catalog));
});
afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe.each(testDatabases())('demo scenario end to end on $name', (tdb) => {
  let store: Store;
  beforeAll(async () => {
    store = await tdb.open();
  });
  afterAll(async () => {
    await store?.close();
  });

  it('ingests the scenario and rejects exactly its deliberately bad inputs, by code and location', async () => {
    const manifests = demo.manifests.map((m) => ({ path: join(dir, m.path), map: m.map ? join(dir, m.map) : null }));
    const s = await ingestManifests(store, manifests, {});
    // the generator states which of its files are bad, why, and on which line (null: the whole file)
    const got = s.rejected.map((r) => ({ file: r.file.slice(dir.length + 1), code: r.code, line: r.line }));
    const want = demo.expectedRejections.map((r) => ({ file: r.file, code: r.code, line: r.line }));
    const order = (a: { file: string; code: string; line: number | null }, b: typeof a) => a.file.localeCompare(b.file) || a.code.localeCompare(b.code) || (a.line ?? 0) - (b.line ?? 0);
    got.sort(order);
    want.sort(order);
    expect(got.map((g) => `${g.file}|${g.code}`)).toEqual(want.map((w) => `${w.file}|${w.code}`));
    got.forEach((g, i) => {
      if (want[i].line !== null) expect(g.line, `${g.file} ${g.code}`).toBe(want[i].line);
    });
    expect(s.accepted).toBe(demo.counts.tests + demo.counts.problemRowsAccepted);
    const again = await ingestManifests(store, manifests, {});
    expect(again.accepted).toBe(0);
    expect(again.duplicates).toBe(s.accepted);
  });

  it('reduces every test; the properties agree with the laws the generator used', async () => {
    const r = await runReduce(store, { catalog, codeVersion: 'test', workers: 0 });
    expect(r.failed).toBe(0);
    expect(r.reduced + r.given).toBeGreaterThanOrEqual(demo.counts.tests);
    const rows = await loadProperties(store.db);
    const byId = new Map(rows.map((p) => [`${p.lab}/${p.test_id}`, p]));
    const truth = parse(readFileSync(join(dir, demo.truth), 'utf8'), { columns: true }) as Record<string, string>[];
    // relative tolerances: noise, toe and sampling of a 500-point record (yield within 1 %, ISO 6892-1
    // asks for Rp to a resolution well inside this; E is the noisiest by nature)
    const tol: Record<string, number> = { modulus_gpa: 0.05, rp02_mpa: 0.01, rt05_mpa: 0.01, reh_mpa: 0.01, rel_mpa: 0.015, rm_mpa: 0.01, ag_pct: 0.12, a_pct: 0.02 };
    let compared = 0;
    for (const t of truth) {
      const p = byId.get(`${t.lab}/${t.test_id}`);
      expect(p, `${t.lab}/${t.test_id} reduced`).toBeDefined();
      if (!p || p.given) continue;
      for (const [k, rel] of Object.entries(tol)) {
        if (!t[k] || p[k as keyof typeof p] === null) continue;
        // a crosshead record's slope includes the machine (ISO 6892-1 asks for an extensometer for E)
        if (k === 'modulus_gpa' && p.flags.includes('crosshead_only_modulus')) continue;
        if ((k === 'a_pct' || k === 'ag_pct') && p.flags.includes('extensometer_removed_early')) continue;
        if (k === 'modulus_gpa' && p.flags.includes('elongation_from_crosshead')) continue;
        const want = Number(t[k]);
        // crosshead travel is referred to the parallel length, not L0: a proof offset read on it is
        // only approximate (the issue asks for yield values from the fitted slope, nonetheless)
        const allowed = p.flags.includes('elongation_from_crosshead') && k === 'rp02_mpa' ? 0.03 : rel;
        expect(Math.abs((p[k as keyof typeof p] as number) - want) / want, `${t.test_id} ${k}`).toBeLessThan(allowed);
        compared++;
      }
    }
    expect(compared).toBeGreaterThan(500);
  });

  it('a second reduce computes nothing; a changed grade setting recomputes that grade only', async () => {
    const again = await runReduce(store, { catalog, codeVersion: 'test', workers: 0 });
    expect(again.reduced + again.given + again.failed).toBe(0);
    const grade = demo.driftingGrade;
    const edited: Catalog = { grades: { ...catalog.grades, [grade]: { ...catalog.grades[grade], rp_offset_pct: 0.1 } } };
    const r = await runReduce(store, { catalog: edited, codeVersion: 'test', workers: 0 });
    const rows = await loadProperties(store.db, { grade: [grade] });
    expect(r.reduced + r.given).toBe(rows.length);
    // back to the original catalog: its results are stored already, nothing is recomputed
    const back = await runReduce(store, { catalog, codeVersion: 'test', workers: 0 });
    expect(back.reduced + back.given).toBe(0);
  });

  it('aggregates per grade with the contract keys and reuses stored results for the same inputs', async () => {
    const a = await runAggregate(store, { by: ['grade'], catalog, codeVersion: 'test' });
    expect(a.reused).toBe(false);
    const row = a.stats.find((s) => s.property === 'yield_mpa' && s.group.grade === demo.driftingGrade)!;
    for (const k of ['group', 'property', 'n', 'mean', 'sd', 'cov', 'min', 'max', 'median', 'percentiles', 'fits', 'best_fit', 'characteristic', 'compliance', 'warnings']) expect(row).toHaveProperty(k);
    expect(Object.keys(row.percentiles).sort()).toEqual(['p05', 'p50', 'p95']);
    const methods = new Set(row.characteristic.map((c) => c.method));
    for (const m of ['en1990-v-known', 'en1990-v-unknown', 'tolerance-normal', 'tolerance-lognormal', 'tolerance-weibull', 'order-statistic']) expect(methods.has(m as never)).toBe(true);
    expect(row.compliance?.lower).toBe(catalog.grades[demo.driftingGrade].spec.yield_min_mpa);
    const b = await runAggregate(store, { by: ['grade'], catalog, codeVersion: 'test' });
    expect(b.reused).toBe(true);
    expect(b.stats).toEqual(a.stats);
  });

  it('builds characteristic curves below the median, non-decreasing, with provenance and caution', async () => {
    const c = await runCurves(store, { by: ['grade'], codeVersion: 'test', generatedAt: '2026-01-01T00:00:00Z' });
    expect(c.curves.length).toBe(Object.keys(catalog.grades).length);
    for (const curve of c.curves) {
      for (const k of ['group', 'n', 'plastic_strain', 'median_mpa', 'characteristic_mpa', 'valid_to_plastic_strain', 'extrapolated_from', 'idealized', 'provenance']) expect(curve).toHaveProperty(k);
      for (let i = 0; i < curve.characteristic_mpa.length; i++) {
        expect(curve.characteristic_mpa[i]).toBeLessThanOrEqual(curve.median_mpa[i] + 1e-9);
        if (i > 0) expect(curve.characteristic_mpa[i]).toBeGreaterThanOrEqual(curve.characteristic_mpa[i - 1] - 1e-9);
      }
      expect(curve.provenance.caution).toMatch(/licensed engineer/);
    }
  });

  it('flags the drifting mill of the scenario and follows the drift contract', async () => {
    const d = await runDrift(store, { by: ['supplier', 'grade'], catalog, codeVersion: 'test' });
    const contract = driftContract(d);
    expect(Object.keys(contract).sort()).toEqual(['alerts', 'change_points', 'comparisons']);
    const onDrifting = d.alerts.filter((a) => a.group.supplier === demo.driftingSupplier && a.group.grade === demo.driftingGrade && a.property === 'yield_mpa');
    expect(onDrifting.length).toBeGreaterThan(0);
    // the alarm comes after the drift starts (the generator states when)
    expect(onDrifting.some((a) => a.first_date >= demo.driftFrom)).toBe(true);
    for (const a of d.alerts) {
      for (const k of ['group', 'property', 'rule', 'first_date', 'magnitude', 'tests', 'id', 'detected_on', 'change_date', 'chart', 'state', 'new']) expect(a).toHaveProperty(k);
      // first_date means exactly the date the alert would have rung
      expect(a.first_date).toBe(a.detected_on);
      if (a.change_date !== null) expect(a.change_date <= a.detected_on).toBe(true);
    }
    expect(d.alerts.every((a) => a.state === 'open' && a.new)).toBe(true);
  });

  it('keeps the state of alerts: a rerun reports nothing new, an acknowledgement and a closing stick', async () => {
    const { recordAlertAction, AlertStateError } = await import('@fractile/pipeline');
    const again = await runDrift(store, { by: ['supplier', 'grade'], catalog, codeVersion: 'test' });
    expect(again.reused).toBe(true);
    expect(again.new_alerts).toBe(0);
    expect(again.alerts.some((a) => a.new)).toBe(false);
    const [first, second] = again.alerts;
    await recordAlertAction(store.db, [first.id], 'acknowledge', 'R. Okafor', 'mill asked for its heat records');
    if (second) await recordAlertAction(store.db, [second.id], 'close', 'R. Okafor', null);
    await expect(recordAlertAction(store.db, ['000000000000'], 'close', 'R. Okafor', null)).rejects.toBeInstanceOf(AlertStateError);
    // a later run shows each alert with the state recorded under its id
    const third = await runDrift(store, { by: ['supplier', 'grade'], catalog, codeVersion: 'test' });
    const a = third.alerts.find((x) => x.id === first.id)!;
    expect(a).toMatchObject({ state: 'acknowledged', state_by: 'R. Okafor', state_note: 'mill asked for its heat records', new: false });
    if (second) expect(third.alerts.find((x) => x.id === second.id)?.state).toBe('closed');
    await recordAlertAction(store.db, [first.id], 'reopen', 'J. Marsh', 'came back');
    const fourth = await runDrift(store, { by: ['supplier', 'grade'], catalog, codeVersion: 'test' });
    expect(fourth.alerts.find((x) => x.id === first.id)).toMatchObject({ state: 'open', state_by: 'J. Marsh' });
  });
});
