/**
 * True stress–plastic strain chart of one group: every sampled test curve drawn light, the
 * median and characteristic curves bold over them (the legend naming the band kind), the
 * extrapolated part of both dashed, and
 * a vertical rule at the plastic strain up to which the curves are supported by the data.
 * Non-finite points are left out. Returns an SVG string. All curves charts share one
 * structure (`curvesTemplate`), compiled once; each supplies its data (`curvesInput`).
 */
import type { TopLevelSpec } from 'vega-lite';
import { PALETTE } from './chart-theme.ts';
import { formatFixed } from './format-number.ts';
import { groupLabel } from './group-label.ts';
import type { ChartOptions } from './histogram-chart.ts';
import { renderTemplateToSvg, signalText, type TemplateInput } from './render-svg.ts';
import type { CharacteristicCurve, SampleCurve } from './types.ts';

const SERIES = ['individual tests', 'median', 'characteristic'] as const;
const PARTS = ['measured', 'extrapolated'] as const;

interface MainPoint {
  x: number;
  y: number;
  series: 'median' | 'characteristic';
  part: (typeof PARTS)[number];
  segment: string;
}

function mainPoints(curve: CharacteristicCurve): MainPoint[] {
  const out: MainPoint[] = [];
  const from = curve.extrapolated_from;
  for (const series of ['median', 'characteristic'] as const) {
    const ys = series === 'median' ? curve.median_mpa : curve.characteristic_mpa;
    const count = Math.min(curve.plastic_strain.length, ys.length);
    for (let i = 0; i < count; i++) {
      const x = curve.plastic_strain[i];
      const y = ys[i];
      if (!Number.isFinite(x) || !Number.isFinite(y)) continue;
      const extrapolated = from !== null && x > from;
      out.push({ x, y, series, part: extrapolated ? 'extrapolated' : 'measured', segment: `${series}/${extrapolated ? 'e' : 'm'}` });
      // the last measured point also starts the dashed part, so the two parts join
      const next = curve.plastic_strain[i + 1];
      if (from !== null && !extrapolated && next !== undefined && next > from) {
        out.push({ x, y, series, part: 'extrapolated', segment: `${series}/e` });
      }
    }
  }
  return out;
}

/** Signals and data of one curves chart for `curvesTemplate`. */
export function curvesInput(curve: CharacteristicCurve, samples: readonly SampleCurve[], options: ChartOptions = {}): TemplateInput {
  // All test curves go into one path, broken by a null between curves: one mark instead of
  // one per test keeps rendering of ~100 curves fast.
  const sampleValues: { x: number | null; y: number | null; i: number }[] = [];
  for (const s of samples) {
    const count = Math.min(s.plastic_strain.length, s.stress_mpa.length);
    for (let i = 0; i < count; i++) {
      const x = s.plastic_strain[i];
      const y = s.stress_mpa[i];
      if (Number.isFinite(x) && Number.isFinite(y)) sampleValues.push({ x, y, i: sampleValues.length });
    }
    sampleValues.push({ x: null, y: null, i: sampleValues.length });
  }
  const validTo = curve.valid_to_plastic_strain;
  const limit = validTo !== null && Number.isFinite(validTo) ? [{ x: validTo, text: `validity limit ${formatFixed(validTo, 3)}` }] : [];
  return {
    signals: {
      title_text: options.title ?? 'True stress–plastic strain',
      characteristic_label: `characteristic (${curve.band ?? 'pointwise'})`,
      subtitle_text: `n = ${curve.n} tests · ${samples.length} test curves shown`,
    },
    data: { samples: sampleValues, main: mainPoints(curve), limit },
  };
}

/** The chart structure shared by all curves charts; data sets `samples`, `main`, `limit`. */
export function curvesTemplate(width: number, height: number, dashLegend: boolean): TopLevelSpec {
  const x = { type: 'quantitative' as const, title: 'plastic strain [–]', scale: { zero: true, nice: true } };
  const y = { type: 'quantitative' as const, title: 'true stress [MPa]', scale: { zero: false, nice: true } };
  const color = {
    scale: { domain: [...SERIES], range: [PALETTE.sample, PALETTE.median, PALETTE.characteristic] },
    // the legend names the band kind: "characteristic (pointwise)" or "(simultaneous)"
    legend: { title: null, symbolType: 'stroke', labelExpr: "datum.label === 'characteristic' ? characteristic_label : datum.label" },
  };
  return {
    width,
    height,
    params: [{ name: 'title_text', value: '' }, { name: 'subtitle_text', value: '' }, { name: 'characteristic_label', value: 'characteristic' }],
    title: {
      text: { expr: 'title_text' },
      subtitle: signalText('subtitle_text'),
      subtitleColor: PALETTE.muted,
      subtitleFontSize: 10,
    },
    layer: [
      {
        data: { name: 'samples' },
        mark: { type: 'line', strokeWidth: 0.8, opacity: 0.45, clip: true, invalid: 'break-paths-show-domains' },
        encoding: {
          x: { ...x, field: 'x' },
          y: { ...y, field: 'y' },
          order: { field: 'i', type: 'quantitative' },
          color: { ...color, datum: 'individual tests' },
        },
      },
      {
        data: { name: 'main' },
        mark: { type: 'line', strokeWidth: 2.4, clip: true },
        encoding: {
          x: { ...x, field: 'x' },
          y: { ...y, field: 'y' },
          detail: { field: 'segment', type: 'nominal' },
          color: { ...color, field: 'series', type: 'nominal' },
          strokeDash: {
            field: 'part',
            type: 'nominal',
            scale: { domain: [...PARTS], range: [[1, 0], [6, 4]] },
            legend: dashLegend ? { title: null, symbolType: 'stroke' } : null,
          },
        },
      },
      {
        data: { name: 'limit' },
        layer: [
          {
            mark: { type: 'rule' as const, color: PALETTE.spec, strokeDash: [2, 3], strokeWidth: 1.2 },
            encoding: { x: { ...x, field: 'x' } },
          },
          {
            mark: { type: 'text' as const, align: 'right' as const, baseline: 'top' as const, dx: -4, dy: 4, color: PALETTE.spec, fontSize: 10 },
            encoding: { x: { ...x, field: 'x' }, y: { value: 0 }, text: { field: 'text' } },
          },
        ],
      },
    ],
  } satisfies TopLevelSpec;
}

export async function renderCurvesChart(
  curve: CharacteristicCurve,
  samples: readonly SampleCurve[],
  options: ChartOptions = {},
): Promise<string> {
  const label = `True stress [MPa] against plastic strain for ${groupLabel(curve.group)}: test curves, median and characteristic curve (${curve.band ?? 'pointwise'} lower band)`;
  const input = curvesInput(curve, samples, options);
  const width = options.width ?? 620;
  const height = options.height ?? 300;
  const dashLegend = (input.data.main as MainPoint[]).some((p) => p.part === 'extrapolated');
  return renderTemplateToSvg(
    `curves:${width}x${height}:${dashLegend}`,
    () => curvesTemplate(width, height, dashLegend),
    input,
    { idPrefix: options.idPrefix, label },
  );
}
