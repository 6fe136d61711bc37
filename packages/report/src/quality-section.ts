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
  const exclusions = htmlTable(
    [{ header: 'lab' }, { header: 'test' }, { header: 'reason' }, { header: 'by' }, { header: 'when' }],
    (quality.exclusions ?? []).map((e) => [e.lab, { text: e.test_id, className: 'mono' }, e.reason, e.decided_by, { text: e.decided_at, className: 'mono' }]),
    { maxRows, emptyText: 'No test is excluded.' },
  );
  const excluded = counts.excluded ?? quality.exclusions?.length ?? 0;
  return `<section class="block" id="quality">
<h2>Data quality</h2>
<p class="lead">${formatInteger(counts.rejected)} rejected inputs, ${formatInteger(counts.failed)} failed and ${formatInteger(counts.flagged)} flagged tests, ${formatInteger(excluded)} excluded tests${counts.values_left_out !== undefined ? `; ${formatInteger(counts.values_left_out)} values left out of the statistics (excluded tests and values a flag makes unfit; per property in the group tables)` : ''}.</p>
<h3>Excluded tests</h3>
<p class="lead">Left out of every statistic by an engineer's decision (<span class="mono">fractile exclude</span>; undone with <span class="mono">fractile include</span>).</p>
${exclusions}
<h3>Rejected input</h3>
${rejections}
<h3>Failed tests</h3>
${failed}
<h3>Flagged tests</h3>
${flagged}
</section>`;
}
