/**
 * The deliberately bad inputs of the demo: one manifest whose every row but one (the first of a
 * conflicting pair) must be rejected, each for one stated reason, plus a manifest that lacks a
 * required column. The expected rejection (code, file, 1-based line) is returned so that a
 * check can compare it with what the ingest records.
 *
 * Codes are the ingest's stable rejection codes.
 */
import { mkdirSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { CsvFileWriter } from './csv-writer.ts';
import type { Cell } from './csv-writer.ts';
import { formatCurveCsv } from './curve-format.ts';
import { simulateTest } from './simulate-test.ts';
import { gradeDef } from './scenario.ts';
import type { Rng } from './random.ts';

export type RejectionCode =
  | 'missing_column'
  | 'missing_value'
  | 'not_a_number'
  | 'not_finite'
  | 'nonpositive_dimension'
  | 'unknown_unit'
  | 'unknown_shape'
  | 'invalid_date'
  | 'missing_curve_file'
  | 'path_escapes_folder'
  | 'curve_too_short'
  | 'missing_channel'
  | 'time_not_monotonic'
  | 'not_utf8'
  | 'conflict';

export const REJECTION_CODES: readonly RejectionCode[] = [
  'missing_column',
  'missing_value',
  'not_a_number',
  'not_finite',
  'nonpositive_dimension',
  'unknown_unit',
  'unknown_shape',
  'invalid_date',
  'missing_curve_file',
  'path_escapes_folder',
  'curve_too_short',
  'missing_channel',
  'time_not_monotonic',
  'not_utf8',
  'conflict',
];

export interface ExpectedRejection {
  /** file holding the fault, relative to the demo folder, `/`-separated */
  file: string;
  /** 1-based line of the fault in that file, or null where the whole file is at fault */
  line: number | null;
  code: RejectionCode;
  /** manifest the record comes in with, relative to the demo folder */
  manifest: string;
  test_id: string | null;
  note: string;
}

export const METRIC_HEADER = [
  'test_id',
  'lab',
  'grade',
  'supplier',
  'heat',
  'tested_on',
  'shape',
  'diameter[mm]',
  'thickness[mm]',
  'width[mm]',
  'area[mm2]',
  'gauge_length[mm]',
  'orientation',
  'temperature[C]',
  'curve',
  'yield[MPa]',
  'yield_definition',
  'tensile[MPa]',
  'uniform_elongation[%]',
  'elongation[%]',
] as const;

/** A manifest row keyed by its columns (METRIC_HEADER gives names and order). */
export type ManifestRow = Record<(typeof METRIC_HEADER)[number], Cell>;
type Row = ManifestRow;

const COMMENTS = ['incoming inspection record (invented demo data)', 'specimen flat 10.00 x 25.00 mm, L0 80 mm'];
/** data line i (0-based) of a curve written with COMMENTS sits on this 1-based line */
const dataLine = (i: number): number => COMMENTS.length + 2 + i;
const HEADER_LINE = COMMENTS.length + 1;

export interface ProblemSet {
  manifests: string[];
  expected: ExpectedRejection[];
  rows: number;
  accepted: number;
}

export function writeProblemFiles(outDir: string, points: number, rng: Rng): ProblemSet {
  const dir = join(outDir, 'problems');
  mkdirSync(join(dir, 'curves'), { recursive: true });
  const grade = gradeDef('FX-360P');
  const sim = simulateTest(grade, 400, 0, 0, { areaMm2: 250, gaugeLengthMm: 80, parallelLengthMm: 112 }, { withSignal: true, points: Math.max(points, 400), loop: false, removeExtensometer: false }, rng);
  const meta = { testId: 'BRK-P', comments: COMMENTS, areaMm2: 250, gaugeLengthMm: 80, labName: '', testedOn: '' };
  const good = formatCurveCsv(sim.signal!, 'kn-mm', meta).toString('utf8');
  const goodLines = good.trimEnd().split('\n');
  const manifestRel = 'problems/manifest-problems.csv';
  const w = new CsvFileWriter(join(dir, 'manifest-problems.csv'), METRIC_HEADER);
  const expected: ExpectedRejection[] = [];
  let rows = 0;
  const base = (id: string): Row => ({
    test_id: id,
    lab: 'BRK-Incoming',
    grade: 'FX-360P',
    supplier: 'Quarrowdale Steel',
    heat: 'Q24-9001',
    tested_on: '2024-05-14',
    shape: 'flat',
    'diameter[mm]': null,
    'thickness[mm]': '10.00',
    'width[mm]': '25.00',
    'area[mm2]': null,
    'gauge_length[mm]': '80',
    orientation: 'transverse',
    'temperature[C]': 21,
    curve: `curves/${id}.csv`,
    'yield[MPa]': null,
    yield_definition: null,
    'tensile[MPa]': null,
    'uniform_elongation[%]': null,
    'elongation[%]': null,
  });
  const writeCurve = (id: string, text: string | Buffer): void => writeFileSync(join(dir, 'curves', `${id}.csv`), text);
  const withLines = (edit: (lines: string[]) => void): string => {
    const l = goodLines.slice();
    edit(l);
    return l.join('\n') + '\n';
  };
  const addRow = (row: Row): number => {
    rows++;
    return w.write(METRIC_HEADER.map((k) => row[k]));
  };
  const expectCurve = (id: string, line: number | null, code: RejectionCode, note: string): void => {
    expected.push({ file: `problems/curves/${id}.csv`, line, code, manifest: manifestRel, test_id: id, note });
  };
  const expectRow = (id: string, line: number, code: RejectionCode, note: string): void => {
    expected.push({ file: manifestRel, line, code, manifest: manifestRel, test_id: id, note });
  };
  const replaceCell = (line: string, col: number, value: string): string => {
    const c = line.split(',');
    c[col] = value;
    return c.join(',');
  };

  // curve content faults
  let id = 'BRK-P01';
  writeCurve(id, withLines((l) => (l[dataLine(100) - 1] = replaceCell(l[dataLine(100) - 1], 1, 'ERR'))));
  addRow(base(id));
  expectCurve(id, dataLine(100), 'not_a_number', 'force cell "ERR"');

  id = 'BRK-P02';
  writeCurve(id, withLines((l) => (l[dataLine(150) - 1] = replaceCell(l[dataLine(150) - 1], 2, 'NaN'))));
  addRow(base(id));
  expectCurve(id, dataLine(150), 'not_finite', 'extension cell "NaN"');

  id = 'BRK-P03';
  writeCurve(id, withLines((l) => (l[dataLine(200) - 1] = replaceCell(l[dataLine(200) - 1], 1, 'Infinity'))));
  addRow(base(id));
  expectCurve(id, dataLine(200), 'not_finite', 'force cell "Infinity"');

  id = 'BRK-P04';
  writeCurve(id, goodLines.slice(0, dataLine(12) - 1).join('\n') + '\n');
  addRow(base(id));
  expectCurve(id, null, 'curve_too_short', 'the file ends after 12 data lines');

  id = 'BRK-P09';
  writeCurve(id, withLines((l) => (l[HEADER_LINE - 1] = 'time[s],force[tonf],extension[mm]')));
  addRow(base(id));
  expectCurve(id, HEADER_LINE, 'unknown_unit', 'force in "tonf"');

  id = 'BRK-P12';
  writeCurve(
    id,
    withLines((l) => {
      for (let i = HEADER_LINE - 1; i < l.length; i++) l[i] = l[i].split(',').slice(0, 2).join(',');
    }),
  );
  addRow(base(id));
  expectCurve(id, HEADER_LINE, 'missing_channel', 'time and force only: no extension, crosshead, stress or strain');

  id = 'BRK-P13';
  writeCurve(
    id,
    withLines((l) => {
      const i = dataLine(300) - 1;
      const prev = Number(l[i - 1].split(',')[0]);
      l[i] = replaceCell(l[i], 0, (prev - 0.5).toFixed(3));
    }),
  );
  addRow(base(id));
  expectCurve(id, dataLine(300), 'time_not_monotonic', 'time steps back by 0.5 s');

  id = 'BRK-P14';
  {
    const text = good.split('\n');
    const head = Buffer.from(text[0] + '\n', 'utf8');
    const bad = Buffer.concat([Buffer.from('# room temperature 21 ', 'latin1'), Buffer.from([0xb0, 0x43, 0xff, 0x0a])]);
    const rest = Buffer.from(text.slice(1).join('\n'), 'utf8');
    writeCurve(id, Buffer.concat([head, bad, rest]));
  }
  addRow(base(id));
  expectCurve(id, 2, 'not_utf8', 'bytes 0xB0 and 0xFF on line 2 are not UTF-8');

  // manifest faults (each row has a valid curve so that only the stated fault applies)
  let r: Row;
  id = 'BRK-P05';
  expectRow(id, addRow(base(id)) , 'missing_curve_file', 'the curve file is not there');

  id = 'BRK-P06';
  r = base(id);
  r.curve = '../escaped-curve.csv';
  writeFileSync(join(outDir, 'escaped-curve.csv'), good);
  expectRow(id, addRow(r), 'path_escapes_folder', 'the curve path leaves the manifest folder (the file exists)');

  id = 'BRK-P07';
  r = base(id);
  r['thickness[mm]'] = '0.00';
  writeCurve(id, good);
  expectRow(id, addRow(r), 'nonpositive_dimension', 'thickness 0');

  id = 'BRK-P08';
  r = base(id);
  r.shape = 'round';
  r['thickness[mm]'] = null;
  r['width[mm]'] = null;
  r['diameter[mm]'] = '-10.00';
  writeCurve(id, good);
  expectRow(id, addRow(r), 'nonpositive_dimension', 'diameter −10 mm');

  id = 'BRK-P10';
  r = base(id);
  r.shape = 'hexagonal';
  writeCurve(id, good);
  expectRow(id, addRow(r), 'unknown_shape', 'shape "hexagonal"');

  id = 'BRK-P11';
  r = base(id);
  r.tested_on = '2024-02-30';
  writeCurve(id, good);
  expectRow(id, addRow(r), 'invalid_date', '30 February');

  id = 'BRK-P16';
  r = base(id);
  r.tested_on = null;
  writeCurve(id, good);
  expectRow(id, addRow(r), 'missing_value', 'tested_on empty');

  id = 'BRK-P17';
  r = base(id);
  r['width[mm]'] = '2O.50';
  writeCurve(id, good);
  expectRow(id, addRow(r), 'not_a_number', 'width "2O.50" (letter O)');

  id = 'BRK-P15';
  r = base(id);
  writeCurve(id, good);
  addRow(r); // the first record of the pair is valid and accepted
  r = base(id);
  r.heat = 'Q24-9002';
  r.tested_on = '2024-05-15';
  expectRow(id, addRow(r), 'conflict', 'same lab and test_id as the line before, different heat and date');
  w.close();

  // a manifest without the required `grade` column
  const missingRel = 'problems/manifest-missing-column.csv';
  const header = METRIC_HEADER.filter((k) => k !== 'grade');
  const w2 = new CsvFileWriter(join(dir, 'manifest-missing-column.csv'), header);
  const r2 = base('BRK-P18');
  writeCurve('BRK-P18', good);
  w2.write(header.map((k) => r2[k]));
  w2.close();
  expected.push({ file: missingRel, line: 1, code: 'missing_column', manifest: missingRel, test_id: null, note: 'no "grade" column' });

  return { manifests: [manifestRel, missingRel], expected, rows: rows + 1, accepted: 1 };
}
