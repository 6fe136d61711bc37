/**
 * Output of `fractile sample --curves`: the random-curves export (pipeline randomCurvesExport) as
 * one JSON document, as the long CSV table after its `#` header lines (written through the one
 * CSV cell writer, `csvTable`), or as a summary table; and, with --out, one CSV and one JSON file
 * per group.
 */
import { mkdirSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import type { RandomCurvesExport } from '@fractile/pipeline';
import { csvTable, groupSlug } from '@fractile/pipeline';
import { log, type OutputFormat } from './context.ts';
import { toTable } from './output.ts';

export async function printRandomCurves(doc: RandomCurvesExport, format: OutputFormat, outDir: string | null): Promise<void> {
  const { randomCurvesTable } = await import('@fractile/pipeline');
  const csvOf = (d: RandomCurvesExport) => {
    const t = randomCurvesTable(d);
    return t.header.map((h) => `# ${h}\n`).join('') + csvTable(t.rows, t.columns);
  };
  if (outDir !== null) {
    mkdirSync(outDir, { recursive: true });
    for (const gr of doc.groups) {
      const one = { ...doc, groups: [gr] };
      const slug = groupSlug(gr.group);
      writeFileSync(join(outDir, `${slug}.random-curves.csv`), csvOf(one));
      writeFileSync(join(outDir, `${slug}.random-curves.json`), JSON.stringify(one) + '\n');
    }
    log(`sample: wrote ${2 * doc.groups.length} random-curve files under ${outDir}`);
  }
  if (format === 'json') process.stdout.write(JSON.stringify(doc) + '\n');
  else if (format === 'csv') process.stdout.write(csvOf(doc));
  else {
    const rows = doc.groups.map((gr) => ({
      group: Object.values(gr.group).join(' / '),
      tests: gr.model?.n_tests ?? 0,
      components: gr.model?.components ?? null,
      variance_explained: gr.model?.variance_explained ?? null,
      uniform_strain: gr.model ? gr.model.uniform_strain.family : null,
      curves: gr.n,
    }));
    process.stdout.write(toTable(rows) + `\n${doc.caution}\n`);
  }
}
