/**
 * Writes a simulated signal as a curve file: the project's curve format (header of channels with
 * units in brackets, `#` comment lines) in one of several unit layouts, or an outside lab's
 * dialect read through a column map (`;` delimiter, decimal comma, two title lines before the
 * header, its own column names).
 *
 * Numbers are printed with fixed decimals matched to the resolution of each channel (time 1 ms,
 * force 1 N or 0.1 lbf, extension 0.1 µm or 1 µin, stress 1 kPa, strain 0.1 µε); converted from
 * N and mm with the exact factors of NIST SP 811 (1 lbf = 4.4482216152605 N, 1 in = 25.4 mm).
 */
import type { Signal } from './curve-signal.ts';
import type { CurveLayout } from './scenario.ts';
import { AsciiBuffer } from './ascii-buffer.ts';

export const LBF_N = 4.4482216152605;
export const IN_MM = 25.4;

/** The column map that goes with `foreign` curves, in the ingest's column-map format. */
export const FOREIGN_COLUMN_MAP = {
  delimiter: ';',
  decimal: ',',
  header_row: 3,
  comment_prefix: '#',
  channels: {
    time: { column: 'Tid_sek', unit: 's' },
    force: { column: 'Belastning', unit: 'kN' },
    crosshead: { column: 'Traversvei', unit: 'mm' },
    // given by position to exercise 1-based column indices
    extension: { column: 4, unit: 'mm' },
  },
} as const;

const FOREIGN_HEADER = ['Tid_sek', 'Belastning', 'Traversvei', 'Forlengelse_L0'];

export interface CurveFileMeta {
  testId: string;
  comments: readonly string[];
  areaMm2: number;
  gaugeLengthMm: number;
  /** for the foreign dialect's title lines */
  labName: string;
  testedOn: string;
}

/** The header channels (with units) a layout writes. */
export function layoutHeader(layout: CurveLayout): string[] {
  switch (layout) {
    case 'kn-mm':
      return ['time[s]', 'force[kN]', 'extension[mm]'];
    case 'n-mm':
      return ['time[s]', 'force[N]', 'extension[mm]'];
    case 'lbf-in':
      return ['time[s]', 'force[lbf]', 'extension[in]'];
    case 'stress-strain':
      return ['time[s]', 'stress[MPa]', 'strain[%]'];
    case 'crosshead-only':
      return ['time[s]', 'force[kN]', 'crosshead[mm]'];
    case 'extensometer-removed':
      return ['time[s]', 'force[kN]', 'extension[mm]', 'crosshead[mm]'];
    case 'foreign':
      return FOREIGN_HEADER;
  }
}

/** The curve file's bytes (UTF-8; the numbers are ASCII). One buffer may be passed for reuse. */
export function formatCurveCsv(sig: Signal, layout: CurveLayout, meta: CurveFileMeta, out: AsciiBuffer = new AsciiBuffer()): Buffer {
  out.reset();
  const n = sig.length;
  const { timeS: t, forceN: f, extensionMm: x, crossheadMm: c } = sig;
  const COMMA = 0x2c;
  const NL = 0x0a;
  if (layout === 'foreign') {
    const SEMI = 0x3b;
    out.text(`${meta.labName} - strekkprove\n`);
    out.text(`Prove ${meta.testId}; dato ${meta.testedOn}; L0 ${meta.gaugeLengthMm.toFixed(2).replace('.', ',')} mm\n`);
    out.text(FOREIGN_HEADER.join(';') + '\n');
    for (let i = 0; i < n; i++) {
      out.fixed(t[i], 3, COMMA);
      out.byte(SEMI);
      out.fixed(f[i] / 1000, 3, COMMA);
      out.byte(SEMI);
      out.fixed(c[i], 4, COMMA);
      out.byte(SEMI);
      out.fixed(x[i], 4, COMMA);
      out.byte(NL);
    }
    out.text('# slutt\n');
    return Buffer.from(out.bytes());
  }
  for (const cm of meta.comments) out.text(`# ${cm}\n`);
  out.text(layoutHeader(layout).join(',') + '\n');
  // per layout: the two or three channels after time, as (values, scale, decimals)
  let cols: [ArrayLike<number>, number, number][];
  switch (layout) {
    case 'kn-mm':
      cols = [[f, 1e-3, 3], [x, 1, 4]];
      break;
    case 'n-mm':
      cols = [[f, 1, 1], [x, 1, 4]];
      break;
    case 'lbf-in':
      cols = [[f, 1 / LBF_N, 1], [x, 1 / IN_MM, 6]];
      break;
    case 'stress-strain':
      cols = [[f, 1 / meta.areaMm2, 3], [x, 100 / meta.gaugeLengthMm, 5]];
      break;
    case 'crosshead-only':
      cols = [[f, 1e-3, 3], [c, 1, 4]];
      break;
    case 'extensometer-removed':
      cols = [[f, 1e-3, 3], [x, 1, 4], [c, 1, 4]];
      break;
  }
  for (let i = 0; i < n; i++) {
    out.fixed(t[i], 3);
    for (const [v, scale, d] of cols) {
      out.byte(COMMA);
      out.fixed(v[i] * scale, d);
    }
    out.byte(NL);
  }
  return Buffer.from(out.bytes());
}
