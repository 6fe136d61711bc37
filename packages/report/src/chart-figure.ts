import { escapeHtml } from './html-escape.ts';

/** A rendered chart (trusted SVG from `renderSpecToSvg`) in a figure with an escaped caption. */
export function chartFigure(svg: string, caption: string, className = 'chart'): string {
  return `<figure class="${escapeHtml(className)}">${svg}<figcaption>${escapeHtml(caption)}</figcaption></figure>`;
}
