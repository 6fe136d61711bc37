/**
 * The data-quality section: files and lines rejected at ingest with their reasons, tests whose
 * reduction failed, and tests that carry flags. Long lists are cut with a count and a pointer
 * to the exports.
 */
import { formatInteger } from './format-number.ts';
import { htmlTable } from './html-table.ts';
import type { ReportCounts, ReportQuality } from './types.ts';

export function qualitySection(quality: ReportQuality, counts: ReportCounts, maxRows: number): string {
  const rejections = htmlTable(
    [{ header: 'file' }, { header: 'line', numeric: true }, { header: 'column', numeric: true }, { header: 'code' }, { header: 'reason' }],
    quality.rejections.map((r) => [
      { text: r.file, className: 'mono' },
      formatInteger(r.line),
      formatInteger(r.column),
      { text: r.code, className: 'mono' },
      r.message,
    ]),
    { maxRows, emptyText: 'No rejected input.' },
  );
  const failed = htmlTable(
    [{ header: 'lab' }, { header: 'test' }, { header: 'code' }, { header: 'reason' }],
    quality.failed.map((f) => [f.lab, { text: f.test_id, className: 'mono' }, { text: f.code, className: 'mono' }, f.message]),
    { maxRows, emptyText: 'No failed tests.' },
  );
  const flagged = htmlTable(
    [{ header: 'lab' }, { header: 'test' }, { header: 'flags' }],
    quality.flagged.map((f) => [f.lab, { text: f.test_id, className: 'mono' }, { text: f.flags.join(', '), className: 'mono' }]),
    { maxRows, emptyText: 'No flagged tests.' },
  );
  return `<section class="block" id="quality">
<h2>Data quality</h2>
<p class="lead">${formatInteger(counts.rejected)} rejected inputs, ${formatInteger(counts.failed)} failed and ${formatInteger(counts.flagged)} flagged tests.</p>
<h3>Rejected input</h3>
${rejections}
<h3>Failed tests</h3>
${failed}
<h3>Flagged tests</h3>
${flagged}
</section>`;
}
