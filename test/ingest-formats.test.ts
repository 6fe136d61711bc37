/**
 * What ingest stores for good input: canonical units (NIST SP 811 factors: 1 in = 25.4 mm,
 * 1 lbf = 4.4482216152605 N, 1 ksi = 6.894757293168 MPa, all exact by definition), S0 from the
 * shape (ISO 6892-1: round π·d²/4, flat a·b, or the area given), column maps for other dialects,
 * summary-only records, and geometry required only where the curve needs it.
 */
import { mkdirSync, mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { ingestManifests } from '@fractile/ingest';
import { iterateCurrentTests, listTests } from '@fractile/store';
import type { CurrentTest, Store } from '@fractile/store';
import { testDatabases } from './support/databases.ts';

function fixture(files: Record<string, string | Buffer>): string {
  const dir = mkdtempSync(path.join(tmpdir(), 'fractile-formats-'));
  for (const [rel, content] of Object.entries(files)) {
    mkdirSync(path.dirname(path.join(dir, rel)), { recursive: true });
    writeFileSync(path.join(dir, rel), content);
  }
  return dir;
}

async function all(store: Store): Promise<Map<string, CurrentTest>> {
  const out = new Map<string, CurrentTest>();
  for await (const batch of iterateCurrentTests(store.db, { batchSize: 3 })) for (const t of batch) out.set(t.testId, t);
  return out;
}

const points = (n: number, f: (i: number) => string[]) => Array.from({ length: n }, (_, i) => f(i).join(','));

/** Two extra lines above the header, a unit line below it, semicolons and decimal commas. */
function semicolonFile(): string {
  const rows = Array.from({ length: 30 }, (_, i) => `${i},5;${i},25;21,0;0,${String(i).padStart(2, '0')}`);
  return ['Prüfprotokoll; Probe M1', 'Datum; 01.03.2024', 'Zeit_s;Last;Temp;Dehnweg', 's;kN;C;mm', ...rows, '# Ende'].join('\n') + '\n';
}

describe.each(testDatabases())('ingest formats on $name', (tdb) => {
  let store: Store;
  beforeEach(async () => {
    store = await tdb.open();
  });
  afterEach(async () => {
    await store.close();
  });

  it('converts manifest and curve units exactly and takes S0 from each shape', async () => {
    const d = fixture({
      'm.csv': [
        'test_id,lab,grade,supplier,heat,tested_on,shape,diameter[in],thickness[mm],width[mm],area[in2],gauge_length[in],orientation,temperature[F],curve',
        'R1,LabA,G1,Acme,H-7,2024-01-15,round,0.5,,,,2,L,212,c/r1.csv',
        'F1,LabA,G1,Acme,,2024-01-16,flat,,3,12.5,,2,T,68,c/f1.csv',
        'A1,LabA,G1,Acme,,2024-01-17,area,,,,0.2,2,,,c/a1.csv',
      ].join('\n') + '\n',
      'c/r1.csv': 'time[s],force[lbf],extension[in]\n' + points(25, (i) => [String(i), String(100 * i), String(0.001 * i)]).join('\n') + '\n',
      'c/f1.csv': 'time[ms],force[kip],extension[mm],crosshead[in]\n' + points(25, (i) => [String(10 * i), String(0.1 * i), String(0.01 * i), String(0.002 * i)]).join('\n') + '\n',
      'c/a1.csv': 'time[min],stress[ksi],strain[%]\n' + points(25, (i) => [String(i), String(2 * i), String(0.05 * i)]).join('\n') + '\n',
    });
    const r = await ingestManifests(store, [{ path: path.join(d, 'm.csv') }]);
    expect(r.rejected).toEqual([]);
    expect(r.accepted).toBe(3);
    const t = await all(store);
    const r1 = t.get('R1')!;
    // NIST SP 811: 1 in = 25.4 mm exactly; S0 = π d²/4 (ISO 6892-1)
    expect(r1.diameterMm).toBe(0.5 * 25.4);
    expect(r1.areaMm2).toBeCloseTo((Math.PI * 12.7 * 12.7) / 4, 12);
    expect(r1.gaugeLengthMm).toBe(2 * 25.4);
    expect(r1.temperatureC).toBeCloseTo(100, 12); // 212 °F = 100 °C
    expect(r1.heat).toBe('H-7');
    expect(r1.orientation).toBe('L');
    expect(r1.curve!.forceN![10]).toBeCloseTo(1000 * 4.4482216152605, 9); // NIST SP 811: 1 lbf = 4.4482216152605 N
    expect(r1.curve!.extensionMm![10]).toBeCloseTo(0.01 * 25.4, 14);
    expect(r1.curve!.stressMpa).toBeNull();
    const f1 = t.get('F1')!;
    expect(f1.areaMm2).toBe(3 * 12.5); // flat: a·b
    expect(f1.temperatureC).toBeCloseTo(20, 12); // 68 °F = 20 °C
    expect(f1.curve!.timeS![3]).toBeCloseTo(0.03, 15);
    expect(f1.curve!.forceN![10]).toBeCloseTo(1.0 * 1000 * 4.4482216152605, 8); // 1 kip = 1000 lbf
    expect(f1.curve!.crossheadMm![10]).toBeCloseTo(0.02 * 25.4, 14);
    const a1 = t.get('A1')!;
    expect(a1.areaMm2).toBeCloseTo(0.2 * 25.4 * 25.4, 12); // area given in in²
    expect(a1.curve!.timeS![2]).toBe(120);
    expect(a1.curve!.stressMpa![10]).toBeCloseTo(20 * 6.894757293168, 10); // 1 ksi = 6.894757293168 MPa
    expect(a1.curve!.strain![10]).toBeCloseTo(0.005, 15); // % → mm/mm
    expect(a1.curve!.forceN).toBeNull();
    expect(a1.curve!.nPoints).toBe(25);
    expect(a1.curve!.sourceSha256).toMatch(/^[0-9a-f]{64}$/);
  });

  it('reads other dialects through a column map: semicolon, decimal comma, extra header lines, names and indexes', async () => {
    const d = fixture({
      'm.csv': 'test_id,grade,supplier,tested_on,shape,diameter[mm],gauge_length[mm],curve\nM1,G2,Acme,2024-03-01,round,8,40,raw/m1.txt\n',
      'map.json': JSON.stringify({ delimiter: ';', decimal: ',', header_row: 3, data_row: 5, comment_prefix: '#', channels: { time: { column: 'Zeit_s', unit: 's' }, force: { column: 'Last', unit: 'kN' }, extension: { column: 4, unit: 'mm' } } }),
      'raw/m1.txt': semicolonFile(),
      'tab.json': JSON.stringify({ delimiter: '\t', header_row: 0, channels: { stress: { column: 2, unit: 'psi' }, strain: { column: 1, unit: 'in/in' } } }),
      'm2.csv': 'test_id,grade,supplier,tested_on,curve\nM2,G2,Acme,2024-03-02,raw/m2.tsv\n',
      'raw/m2.tsv': points(22, (i) => [String(0.001 * i), String(1000 * i)]).map((l) => l.replace(',', '\t')).join('\n') + '\n',
    });
    const r = await ingestManifests(store, [
      { path: path.join(d, 'm.csv'), map: path.join(d, 'map.json') },
      { path: path.join(d, 'm2.csv'), map: path.join(d, 'tab.json') },
    ]);
    expect(r.rejected).toEqual([]);
    const t = await all(store);
    const m1 = t.get('M1')!.curve!;
    expect(m1.nPoints).toBe(30);
    expect(m1.timeS![7]).toBe(7.5);
    expect(m1.forceN![7]).toBe(7250); // 7,25 kN
    expect(m1.extensionMm![7]).toBeCloseTo(0.07, 15);
    expect(m1.crossheadMm).toBeNull();
    const m2 = t.get('M2')!;
    expect(m2.areaMm2).toBeNull(); // stress–strain curve needs no geometry
    expect(m2.curve!.stressMpa![5]).toBeCloseTo(5 * 6.894757293168, 10); // 1000 psi = 1 ksi
    expect(m2.curve!.strain![5]).toBeCloseTo(0.005, 15);
  });

  it('stores summary-only records without geometry, with their yield definition', async () => {
    const d = fixture({
      'm.csv': [
        'test_id,grade,supplier,heat,tested_on,shape,yield[ksi],yield_definition,tensile[MPa],uniform_elongation[%],elongation[%],curve',
        'S1,G3,Old Mill,H1,1998-06-30,,50,ReH,520,14.5,28,',
        'S2,G3,Old Mill,H1,1998-07-01,round,,,505,,31,',
      ].join('\n') + '\n',
    });
    const r = await ingestManifests(store, [{ path: path.join(d, 'm.csv') }]);
    expect(r.rejected).toEqual([]);
    const t = await all(store);
    // 1 ksi = 1000 lbf/in² with 1 lbf = 0.45359237 kg × 9.80665 m/s² and 1 in = 25.4 mm, both exact
    // by definition (NIST SP 811, appendix B): 6.894757293168361 MPa
    expect(t.get('S1')!.summary).toEqual({ yieldMpa: expect.closeTo((50 * 1000 * 0.45359237 * 9.80665) / (25.4 * 25.4), 9), yieldDefinition: 'reh', tensileMpa: 520, uniformElongationPct: 14.5, elongationPct: 28 });
    expect(t.get('S1')!.curve).toBeNull();
    expect(t.get('S2')!.summary).toEqual({ yieldMpa: null, yieldDefinition: null, tensileMpa: 505, uniformElongationPct: null, elongationPct: 31 });
    const listed = await listTests(store.db);
    expect(listed.map((x) => [x.test_id, x.has_curve, x.has_summary])).toEqual([['S1', false, true], ['S2', false, true]]);
  });
});
