/**
 * The files `fractile init` writes: a manifest with one curve test and one summary-only test, the
 * example curve file, a column map for a semicolon dialect, a grade catalog and the fractile.json
 * naming them. The scenario (Harrowgate Fabrication, suppliers Corlen Steel and Vasby Rolling,
 * grade HF-S355) is invented. Every file follows docs/input-formats.md.
 */

/**
 * An example engineering curve of a round bar (d = 10 mm, L0 = 50 mm): linear to 380 MPa with
 * E = 205 GPa, then plastic strain ep with s = 380 + 160·(1 − exp(−ep/0.04)) MPa up to
 * ep = 0.16, then a falling branch and the drop at fracture. Force = s·π·d²/4, extension = e·L0, at a constant
 * extension rate of 0.05 mm/s. Invented values, only to show the format.
 */
export function exampleCurve(): string {
  const area = (Math.PI * 10 * 10) / 4;
  const e0 = 380 / 205000;
  const rows: string[] = ['# example curve: round bar d = 10 mm, L0 = 50 mm (invented values)', 'time[s],force[kN],extension[mm]'];
  const push = (strain: number, stress: number) => {
    const ext = strain * 50;
    rows.push(`${(ext / 0.05).toFixed(3)},${((stress * area) / 1000).toFixed(4)},${ext.toFixed(6)}`);
  };
  for (let i = 0; i <= 60; i++) push((e0 * i) / 60, (380 * i) / 60);
  for (let i = 1; i <= 40; i++) {
    const ep = (0.16 * i) / 40;
    push(e0 + ep + (160 * (1 - Math.exp(-ep / 0.04))) / 205000, 380 + 160 * (1 - Math.exp(-ep / 0.04)));
  }
  const top = 380 + 160 * (1 - Math.exp(-4));
  for (let i = 1; i <= 8; i++) push(e0 + 0.16 + 0.005 * i, top * (1 - 0.02 * i * i * 0.25));
  // fracture: the force drops to a few percent within the last step
  push(e0 + 0.2005, top * 0.03);
  return rows.join('\n') + '\n';
}

export const STARTER_MANIFEST = [
  '# one row per test; units in brackets in the header; see docs/input-formats.md',
  'test_id,lab,grade,supplier,heat,tested_on,shape,diameter[mm],gauge_length[mm],orientation,temperature[C],curve,yield_definition,yield[MPa],tensile[MPa],uniform_elongation[%],elongation[%]',
  'HF-0001,Harrowgate,HF-S355,Corlen Steel,H24-118,2026-03-02,round,10,50,L,21,curves/HF-0001.csv,,,,,',
  'HF-0002,Harrowgate,HF-S355,Vasby Rolling,H24-311,2026-03-03,,,,L,21,,rp0.2,391,528,14.2,27.5',
  '',
].join('\n');

export const STARTER_MAP = `${JSON.stringify(
  {
    description: 'curve files with semicolons and decimal commas, a title line above the header (use with: fractile ingest MANIFEST --map maps/semicolon.json)',
    delimiter: ';',
    decimal: ',',
    header_row: 2,
    data_row: 3,
    comment_prefix: '#',
    channels: { time: { column: 'Zeit', unit: 's' }, force: { column: 'Kraft', unit: 'kN' }, extension: { column: 'Weg', unit: 'mm' } },
  },
  null,
  2,
)}\n`;

export const STARTER_CATALOG = `${JSON.stringify(
  {
    $comment: 'grade catalog: yield definition, reduction settings and specification limits per grade (docs/input-formats.md)',
    grades: {
      'HF-S355': {
        family: 'steel',
        yield_definition: 'rp0.2',
        spec: { yield_min_mpa: 355, tensile_min_mpa: 470, tensile_max_mpa: 630, yt_max: 0.87, elongation_min_pct: 20 },
        properties: { yield_mpa: { prior_v: 0.07 } },
      },
    },
  },
  null,
  2,
)}\n`;

export const STARTER_PROJECT = `${JSON.stringify({ database: 'db', catalog: 'catalog.json', manifests: ['manifest.csv'], out: 'fractile-out' }, null, 2)}\n`;

/** Relative path → content, in the order they are written. */
export function starterFiles(): [string, string][] {
  return [
    ['fractile.json', STARTER_PROJECT],
    ['manifest.csv', STARTER_MANIFEST],
    ['curves/HF-0001.csv', exampleCurve()],
    ['catalog.json', STARTER_CATALOG],
    ['maps/semicolon.json', STARTER_MAP],
  ];
}
