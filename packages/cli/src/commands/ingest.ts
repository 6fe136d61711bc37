/**
 * `fractile ingest <manifest>…`: manifests (DESIGN formats, or curve files read through a column
 * map) into the raw tables, each test reduced as it is stored (as `fractile reduce` would, in the
 * worker that parsed its curve; `--no-reduce` leaves that to `reduce`). Each rejection is printed
 * on stderr as `file:line:column: code: message` and recorded; the rest still loads. Exit code 3
 * when anything was rejected.
 */
import type { Command } from 'commander';
import { CliError, globals, log, type CommandModule } from '../context.ts';
import { print } from '../output.ts';
import { existsSync } from 'node:fs';
import { checkManifestFiles } from '../manifest-check.ts';
import { PROGRESS_MODES, progressBar, type ProgressMode } from '../progress.ts';
import { resolveCatalog, withStore } from '../common-options.ts';
import { CODE_VERSION } from '../version.ts';
import { queueIngest, requireServer, wholeNumber } from '../queue-target.ts';

export const EXIT_REJECTED = 3;

export const command: CommandModule = {
  order: 10,
  register(program: Command) {
    program
      .command('ingest')
      .description('load tests from manifests (and their curve files) into the database')
      .argument('[manifest...]', 'manifest CSV files (curve paths are relative to each manifest); default: the "manifests" of ./fractile.json')
      .option('--map <file>', 'column map (JSON) for the curve files of these manifests: delimiter, decimal mark, header row, channels and units')
      .option('--dry-run', 'check and classify everything, write nothing')
      .option('--replace', 'a stored test whose content changed is replaced (the old version is kept as history) instead of rejected')
      .option('--batch-size <n>', 'tests per transaction', '200')
      .option('--workers <n>', 'worker threads that parse (and reduce) curve files (default: 1 on 2–3 cores, else cores − 1, at most 8; 0: none)')
      .option('--no-reduce', 'store only; leave the per-test reduction to `fractile reduce`')
      .option('--catalog <file>', 'grade catalog (JSON) the tests are reduced with; default: the catalog of the last reduce')
      .option('--no-fits', 'reduce without the Hollomon, Swift, Voce and Ramberg–Osgood fits')
      .option('--progress <mode>', 'progress on stderr: bar (a bar on a terminal, a line every 10 s elsewhere), lines ("ingest: done/total" after each batch, for logs) or none', 'bar')
      .option('--queue', 'PostgreSQL server: enqueue the manifests in parts for `fractile worker` processes instead of ingesting here')
      .option('--part-rows <n>', 'with --queue: manifest rows per job', '500')
      .option('--watch', 'with --queue: show the progress until every part is done (exit 1 if a job failed)')
      .addHelpText(
        'after',
        `
Output (--format json): {"run", "accepted", "duplicates", "replaced", "rejected": [{"file", "line", "column", "code", "message"}], "dry_run",
"reduce": {"run", "reduced", "failed", "given", "rest": {the reduce stage's summary for tests still unreduced}} or null}.
Each stored test is reduced in the same transaction (as \`fractile reduce\` with the same catalog would; a later \`reduce\` with
the same catalog computes nothing); --no-reduce stores only.
Rejections are also printed on stderr as file:line:column: code: message (line/column 1-based; 0 = whole file).
Codes: missing_column, missing_value, not_a_number, not_finite, nonpositive_dimension, nonpositive_value, unknown_unit,
unknown_shape, unknown_yield_definition, invalid_date, missing_curve_file, path_escapes_folder, curve_too_short,
missing_channel, time_not_monotonic, not_utf8, conflict, bad_column_map, unreadable_file, malformed_csv, wrong_cell_count,
out_of_range, value_too_long, invalid_text, not_stored (the database refused that one test; the rest of its batch is stored).
Exit status: 0 all accepted or duplicate, ${EXIT_REJECTED} when anything was rejected (the rest is stored), 2 on bad usage,
4 when the embedded database folder is in use by another process (see --wait), 1 on failure.`,
      )
      .action(async (manifests: string[], o: { map?: string; dryRun?: boolean; replace?: boolean; batchSize: string; progress: string; workers?: string; queue?: boolean; partRows: string; watch?: boolean; reduce: boolean; catalog?: string; fits: boolean }, cmd: Command) => {
        const { formatRejection, ingestManifests } = await import('@fractile/ingest');
        const { startIngestReduction } = await import('@fractile/pipeline');
        const g = globals(cmd);
        const batchSize = Number(o.batchSize);
        if (!Number.isInteger(batchSize) || batchSize < 1) throw new CliError(`--batch-size must be a whole number ≥ 1, got "${o.batchSize}"`);
        // the exit status is set after the store is closed (closing the embedded engine resets it)
        const workers = o.workers === undefined ? undefined : Number(o.workers);
        if (workers !== undefined && (!Number.isInteger(workers) || workers < 0)) throw new CliError(`--workers must be a whole number ≥ 0, got "${o.workers}"`);
        if (!(PROGRESS_MODES as readonly string[]).includes(o.progress)) throw new CliError(`--progress must be ${PROGRESS_MODES.join(', ')}, got "${o.progress}"`);
        const inputs = manifests.length
          ? manifests.map((path) => ({ path, map: o.map ?? null }))
          : (g.project?.manifests ?? []).map((m) => ({ path: m.path, map: o.map ?? m.map }));
        if (inputs.length === 0) throw new CliError('name the manifests to ingest (`fractile ingest MANIFEST.csv …`), or list them under "manifests" in ./fractile.json');
        // the queue lives on a server only: say so before looking at the files
        if (o.queue) await requireServer(g, '--queue');
        // before any database is opened: a wrong path creates nothing
        checkManifestFiles(inputs.map((m) => m.path));
        if (o.map !== undefined && !existsSync(o.map)) throw new CliError(`no column map at ${o.map}`);
        if (o.queue) {
          const partRows = wholeNumber(o.partRows, '--part-rows', 1);
          if (o.dryRun) throw new CliError('--dry-run checks in this process: use it without --queue');
          return queueIngest(g, inputs.map((m) => m.path), { map: o.map, replace: o.replace, batchSize, partRows, watch: Boolean(o.watch), progress: o.progress });
        }
        const rejected = await withStore(g, async (store) => {
          const bar = progressBar('ingest', o.progress as ProgressMode);
          const reduction = o.reduce && !o.dryRun
            ? await startIngestReduction(store, { catalog: await resolveCatalog(store.db, o.catalog, g), overrides: o.fits ? {} : { fitLaws: false }, codeVersion: CODE_VERSION })
            : null;
          let summary: Awaited<ReturnType<typeof ingestManifests>>;
          try {
            summary = await ingestManifests(store, inputs, {
              dryRun: Boolean(o.dryRun),
              replace: Boolean(o.replace),
              batchSize,
              workers,
              codeVersion: CODE_VERSION,
              reducer: reduction?.reducer ?? null,
              onProgress: (done, total) => bar.update(done, total),
            });
          } catch (e) {
            await reduction?.fail().catch(() => {});
            throw e;
          } finally {
            bar.stop();
          }
          let reduce = null;
          if (reduction) {
            const r = await reduction.finish({ workers });
            reduce = { run: reduction.run, ...r.atIngest, rest: r.rest };
            log(`reduce: run ${reduction.run}: ${r.atIngest.reduced} reduced, ${r.atIngest.given} summary-only, ${r.atIngest.failed} failed at ingest; then run ${r.rest.run}: ${r.rest.reduced + r.rest.given + r.rest.failed} more, ${r.rest.unchanged} unchanged`);
          }
          for (const r of summary.rejected) log(formatRejection(r));
          log(`${summary.dry_run ? 'dry run: would accept' : `run ${summary.run}: accepted`} ${summary.accepted} (${summary.replaced} replacing a stored version), ${summary.duplicates} duplicate, ${summary.rejected.length} rejected`);
          const row = { run: summary.run, accepted: summary.accepted, duplicates: summary.duplicates, replaced: summary.replaced, rejected: summary.rejected.length, dry_run: summary.dry_run };
          print(g, { kind: 'ingest', data: { ...summary, reduce }, rows: [row], title: 'fractile ingest run: accepted, duplicate, replaced and rejected records', provenance: { manifests: inputs.map((m) => m.path) }, result: false });
          return summary.rejected.length;
        });
        if (rejected > 0) process.exitCode = EXIT_REJECTED;
      });
  },
};
