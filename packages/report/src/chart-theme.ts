import type { Config } from 'vega-lite';

/** Colours of the report; one neutral palette for all charts and the page. */
export const PALETTE = {
  ink: '#1d2633',
  muted: '#5d6878',
  grid: '#e5e8ed',
  domain: '#9aa3af',
  sample: '#93a1b3',
  median: '#1f4e79',
  characteristic: '#b4441f',
  spec: '#3a3f47',
  bars: '#a9b8c9',
  fit: '#1f4e79',
  alert: '#c0262d',
  outside: '#e08a1e',
  ewma: '#6b4c9a',
} as const;

export const FONT = 'system-ui, "DejaVu Sans", "Liberation Sans", Arial, sans-serif';

/** Vega-Lite configuration shared by every chart. */
export const CHART_CONFIG: Config = {
  // one accessible name per chart (set on the <svg>) instead of a description of every mark
  aria: false,
  font: FONT,
  background: '#ffffff',
  padding: 6,
  view: { stroke: null },
  axis: {
    labelColor: PALETTE.muted,
    labelFontSize: 10,
    titleColor: PALETTE.ink,
    titleFontSize: 11,
    titleFontWeight: 600,
    gridColor: PALETTE.grid,
    domainColor: PALETTE.domain,
    tickColor: PALETTE.domain,
  },
  legend: {
    labelColor: PALETTE.ink,
    labelFontSize: 10,
    titleFontSize: 10,
    titleColor: PALETTE.muted,
    orient: 'bottom',
    direction: 'horizontal',
    symbolStrokeWidth: 2,
  },
  title: { color: PALETTE.ink, fontSize: 12, fontWeight: 600, anchor: 'start', offset: 6 },
  text: { font: FONT, fontSize: 10 },
};
