/**
 * Renders a Vega-Lite spec to an SVG string at build time: Vega-Lite compiles to Vega, Vega's
 * headless view (renderer 'none') writes SVG. The SVG is then made fit for inline use in one
 * HTML page: XML namespace declarations dropped (inline SVG in HTML needs none), element ids
 * renumbered with a per-chart prefix so clip paths of different charts never collide and the
 * same input gives the same page, and an accessible name added.
 */
import * as vega from 'vega';
import * as vegaLite from 'vega-lite';
import type { TopLevelSpec } from 'vega-lite';
import { CHART_CONFIG } from './chart-theme.ts';
import { escapeHtml } from './html-escape.ts';

export interface RenderSvgOptions {
  /** Id prefix for elements inside the SVG, unique within one page; default a hash of the spec. */
  idPrefix?: string;
  /** Accessible name of the chart. */
  label: string;
}

/** A text placeholder in a template spec, replaced by the signal of that name after compiling. */
export function signalText(name: string): string {
  return `__signal:${name}__`;
}

function patchSignals(node: unknown): unknown {
  if (typeof node === 'string') {
    const m = /^__signal:([A-Za-z_][A-Za-z0-9_]*)__$/.exec(node);
    return m ? { signal: m[1] } : node;
  }
  if (Array.isArray(node)) return node.map(patchSignals);
  if (node !== null && typeof node === 'object') {
    return Object.fromEntries(Object.entries(node).map(([k, v]) => [k, patchSignals(v)]));
  }
  return node;
}

/** Values for one rendering of a template: signals (declared as params in the spec) and named data. */
export interface TemplateInput {
  signals: Readonly<Record<string, unknown>>;
  data: Readonly<Record<string, readonly object[]>>;
}

const templates = new Map<string, vega.Runtime>();

/**
 * Renders many charts of one structure with a single compile and parse: the spec is built,
 * compiled and parsed once per key, and each chart only sets its signals and data. Compiling
 * and parsing cost more than drawing a small chart, so this is what keeps a report with
 * hundreds of histograms fast. Placeholders from `signalText` (where Vega-Lite takes no
 * expression, e.g. axis titles) become signal references.
 */
export async function renderTemplateToSvg(
  key: string,
  build: () => TopLevelSpec,
  input: TemplateInput,
  options: RenderSvgOptions,
): Promise<string> {
  let runtime = templates.get(key);
  if (!runtime) {
    const spec = build();
    const withConfig = { ...spec, config: { ...CHART_CONFIG, ...(spec.config ?? {}) } } as TopLevelSpec;
    runtime = vega.parse(patchSignals(vegaLite.compile(withConfig).spec) as vega.Spec);
    templates.set(key, runtime);
  }
  const view = new vega.View(runtime, { renderer: 'none' });
  try {
    for (const [name, value] of Object.entries(input.signals)) view.signal(name, value);
    for (const [name, values] of Object.entries(input.data)) view.data(name, values as object[]);
    const svg = await view.toSVG();
    const prefix = options.idPrefix ?? `c${fnv1a(key + JSON.stringify(input))}`;
    return tidySvg(svg, { idPrefix: prefix, label: options.label });
  } finally {
    view.finalize();
  }
}

export async function renderSpecToSvg(spec: TopLevelSpec, options: RenderSvgOptions): Promise<string> {
  const withConfig = { ...spec, config: { ...CHART_CONFIG, ...(spec.config ?? {}) } } as TopLevelSpec;
  const compiled = vegaLite.compile(withConfig).spec;
  const view = new vega.View(vega.parse(compiled), { renderer: 'none' });
  try {
    const svg = await view.toSVG();
    return tidySvg(svg, { idPrefix: options.idPrefix ?? `c${fnv1a(JSON.stringify(spec))}`, label: options.label });
  } finally {
    view.finalize();
  }
}

/** FNV-1a 32-bit hash as base-36 text; only for naming, not for integrity. */
function fnv1a(text: string): string {
  let hash = 0x811c9dc5;
  for (let i = 0; i < text.length; i++) {
    hash ^= text.charCodeAt(i);
    hash = Math.imul(hash, 0x01000193);
  }
  return (hash >>> 0).toString(36);
}

export function tidySvg(svg: string, options: { idPrefix: string; label: string }): string {
  let out = svg.replace(/\s+xmlns(:\w+)?="[^"]*"/g, '').replace(/\s+version="1\.1"/, '');
  const ids = new Map<string, string>();
  for (const match of out.matchAll(/\sid="([^"]+)"/g)) {
    const id = match[1];
    if (!ids.has(id)) ids.set(id, `${options.idPrefix}-${ids.size + 1}`);
  }
  if (ids.size > 0) {
    out = out.replace(/(\sid="|url\(#|href="#)([^")]+)/g, (whole, lead: string, id: string) => {
      const renamed = ids.get(id);
      return renamed ? `${lead}${renamed}` : whole;
    });
  }
  return out.replace(/^<svg\b/, `<svg role="img" aria-label="${escapeHtml(options.label)}"`);
}
