/**
 * Options and output of the commands that run the pipeline and write the report and exports
 * (`run`, `report`, `demo`): the output folder (checked before any database is opened: an existing
 * file of that name is a usage error, not a crash), the stress unit of the FE tables, the
 * worker count; the one-line summary of a reduce run; the printed result.
 */
import { statSync } from 'node:fs';
import type { Command } from 'commander';
import type { ReduceStageSummary, RunAllResult, StressUnit } from '@fractile/pipeline';
import { CliError } from './cli-error.ts';
import { type GlobalOptions, log } from './context.ts';
import { progressBar } from './progress.ts';
import type { Output } from './output.ts';

const UNITS: readonly StressUnit[] = ['MPa', 'ksi'];

export function addExportOptions(cmd: Command): Command {
  return cmd
    .option('--out <dir>', 'folder for report.html and the exports (default: the "out" of ./fractile.json, else fractile-out)')
    .option('--fe-unit <unit>', 'stress unit of the FE tables (curves/*.true-stress-plastic-strain.csv): MPa or ksi', 'MPa');
}

export interface ExportChoice {
  out: string;
  feUnit: StressUnit;
}

/** The output folder must be a folder or not exist yet. */
export function checkOutFolder(out: string, option = '--out'): void {
  let st: ReturnType<typeof statSync>;
  try {
    st = statSync(out);
  } catch {
    return;
  }
  if (!st.isDirectory()) throw new CliError(`${option} ${out} is a file, not a folder: name a folder for report.html and the exports`);
}

export function readExportOptions(o: Record<string, unknown>, g: GlobalOptions): ExportChoice {
  const out = typeof o.out === 'string' ? o.out : (g.project?.out ?? 'fractile-out');
  checkOutFolder(out);
  const feUnit = String(o.feUnit ?? 'MPa') as StressUnit;
  if (!UNITS.includes(feUnit)) throw new CliError(`--fe-unit must be ${UNITS.join(' or ')}, got "${String(o.feUnit)}"`);
  return { out, feUnit };
}

export function workersOption(v: unknown): number | undefined {
  if (v === undefined) return undefined;
  const n = Number(v);
  if (!Number.isInteger(n) || n < 0) throw new CliError(`--workers must be a whole number ≥ 0, got "${String(v)}"`);
  return n;
}

function reduceLine(s: ReduceStageSummary): string {
  return `  reduce: ${s.reduced} reduced, ${s.given} summary-only, ${s.failed} failed, ${s.unchanged} unchanged (read ${s.timings.read.toFixed(1)} s, compute ${s.timings.compute.toFixed(1)} s, write ${s.timings.write.toFixed(1)} s)`;
}

/** The progress callbacks of a pipeline run: a bar for reduce, then one line per stage with its time. */
export function runCallbacks() {
  const bar = progressBar('reduce');
  return {
    onProgress: (d: number, t: number) => bar.update(d, t),
    onReduce: (s: ReduceStageSummary) => {
      bar.stop();
      log(reduceLine(s));
    },
    onStage: (name: string, s: number) => log(`  ${name.padEnd(18)} ${s.toFixed(2)} s`),
  };
}

/** The printed result of a pipeline run: where the report is, how many files, alerts, cross-checked tests. */
export function runAllOutput(r: RunAllResult, kind = 'run', extra: Record<string, unknown> = {}): Output {
  return {
    kind,
    data: { ...r, ...extra },
    rows: [{ report: r.report, exports: r.exports.length, alerts: r.alerts, crosschecked: r.crosschecked }],
    title: 'fractile run: the report and the exports written',
    result: false,
  };
}
