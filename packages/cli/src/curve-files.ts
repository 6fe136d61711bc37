/**
 * Writes the design-curve exports of a curves run: per group a curve CSV, an engineering-counterparts
 * CSV, an idealizations CSV and a JSON document, each with provenance, the caution and the band kind
 * (pointwise or simultaneous); plus one JSON array of all groups.
 */
import { mkdirSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { designCurvesToJson, designCurveToCsv, designCurveToJson, engineeringToCsv, idealizedToCsv, type DesignCurve } from '@fractile/pipeline';

export function groupSlug(group: Record<string, string>): string {
  const s = Object.values(group).join('_').replace(/[^A-Za-z0-9._-]+/g, '-').replace(/^-+|-+$/g, '');
  return s || 'all';
}

export function writeCurveFiles(dir: string, curves: DesignCurve[]): string[] {
  mkdirSync(dir, { recursive: true });
  const written: string[] = [];
  const put = (name: string, text: string) => {
    const p = join(dir, name);
    writeFileSync(p, text);
    written.push(p);
  };
  for (const c of curves) {
    const slug = groupSlug(c.group);
    put(`${slug}.curve.csv`, designCurveToCsv(c));
    put(`${slug}.engineering.csv`, engineeringToCsv(c));
    put(`${slug}.idealized.csv`, idealizedToCsv(c));
    put(`${slug}.curve.json`, designCurveToJson(c));
  }
  put('curves.json', designCurvesToJson(curves));
  return written;
}
