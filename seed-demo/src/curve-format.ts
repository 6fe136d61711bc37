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

export function formatCurveCsv(sig: Signal, layout: CurveLayout, meta: CurveFileMeta): string {
  const lines: string[] = [];
  const n = sig.length;
  const { timeS: t, forceN: f, extensionMm: x, crossheadMm: c } = sig;
  if (layout === 'foreign') {
    lines.push(`${meta.labName} - strekkprove`);
    lines.push(`Prove ${meta.testId}; dato ${meta.testedOn}; L0 ${meta.gaugeLengthMm.toFixed(2).replace('.', ',')} mm`);
    lines.push(FOREIGN_HEADER.join(';'));
    for (let i = 0; i < n; i++) {
      lines.push(`${t[i].toFixed(3)};${(f[i] / 1000).toFixed(3)};${c[i].toFixed(4)};${x[i].toFixed(4)}`.replace(/\./g, ','));
    }
    lines.push('# slutt');
    return lines.join('\n') + '\n';
  }
  for (const cm of meta.comments) lines.push(`# ${cm}`);
  lines.push(layoutHeader(layout).join(','));
  switch (layout) {
    case 'kn-mm':
      for (let i = 0; i < n; i++) lines.push(`${t[i].toFixed(3)},${(f[i] / 1000).toFixed(3)},${x[i].toFixed(4)}`);
      break;
    case 'n-mm':
      for (let i = 0; i < n; i++) lines.push(`${t[i].toFixed(3)},${f[i].toFixed(1)},${x[i].toFixed(4)}`);
      break;
    case 'lbf-in':
      for (let i = 0; i < n; i++) lines.push(`${t[i].toFixed(3)},${(f[i] / LBF_N).toFixed(1)},${(x[i] / IN_MM).toFixed(6)}`);
      break;
    case 'stress-strain': {
      const a = meta.areaMm2;
      const l0 = meta.gaugeLengthMm;
      for (let i = 0; i < n; i++) lines.push(`${t[i].toFixed(3)},${(f[i] / a).toFixed(3)},${((100 * x[i]) / l0).toFixed(5)}`);
      break;
    }
    case 'crosshead-only':
      for (let i = 0; i < n; i++) lines.push(`${t[i].toFixed(3)},${(f[i] / 1000).toFixed(3)},${c[i].toFixed(4)}`);
      break;
    case 'extensometer-removed':
      for (let i = 0; i < n; i++) lines.push(`${t[i].toFixed(3)},${(f[i] / 1000).toFixed(3)},${x[i].toFixed(4)},${c[i].toFixed(4)}`);
      break;
  }
  return lines.join('\n') + '\n';
}
