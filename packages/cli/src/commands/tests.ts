/** `fractile tests`: what is stored, one row per test (identity, grade, supplier, heat, date, geometry, curve or not). */
import type { Command } from 'commander';
import { CliError, globals, type CommandModule } from '../context.ts';
import { checkFilterValues, withStore } from '../common-options.ts';
import { print } from '../output.ts';

const COLUMNS = ['lab', 'test_id', 'version', 'is_current', 'grade', 'supplier', 'heat', 'tested_on', 'shape', 'diameter_mm', 'thickness_mm', 'width_mm', 'area_mm2', 'gauge_length_mm', 'orientation', 'temperature_c', 'has_curve', 'has_summary'];
const TABLE_COLUMNS = ['lab', 'test_id', 'grade', 'supplier', 'heat', 'tested_on', 'shape', 'area_mm2', 'gauge_length_mm', 'has_curve'];

const list = (s: unknown): string[] | undefined => (typeof s === 'string' && s.trim() ? s.split(',').map((x) => x.trim()).filter(Boolean) : undefined);
function isoDate(s: unknown, name: string): string | undefined {
  if (s === undefined) return undefined;
  if (typeof s !== 'string' || !/^\d{4}-\d{2}-\d{2}$/.test(s) || Number.isNaN(Date.parse(s))) throw new CliError(`${name} must be a date YYYY-MM-DD, got "${String(s)}"`);
  return s;
}

export const command: CommandModule = {
  order: 15,
  register(program: Command) {
    program
      .command('tests')
      .description('list the stored tests: identity, grade, supplier, heat, date, geometry (S0 in mm², L0 in mm) and whether a curve is stored')
      .option('--lab <labs>', 'only these labs (comma-separated)')
      .option('--grade <labels>', 'only these grades (comma-separated)')
      .option('--supplier <names>', 'only these suppliers (comma-separated)')
      .option('--from <date>', 'only tests on or after this date (YYYY-MM-DD)')
      .option('--to <date>', 'only tests on or before this date (YYYY-MM-DD)')
      .option('--history', 'also list versions replaced by a later ingest')
      .addHelpText('after', `\nOutput (--format json): an array of {${COLUMNS.join(', ')}}.`)
      .action(async (o: Record<string, unknown>, cmd: Command) => {
        const { listTests } = await import('@fractile/store');
        const g = globals(cmd);
        const filter = {
          lab: list(o.lab),
          grade: list(o.grade),
          supplier: list(o.supplier),
          testedFrom: isoDate(o.from, '--from'),
          testedTo: isoDate(o.to, '--to'),
          includeHistory: Boolean(o.history),
        };
        await withStore(g, async (store) => {
          await checkFilterValues(store.db, filter);
          const rows = (await listTests(store.db, filter)).map((r) => Object.fromEntries(COLUMNS.map((c) => [c, r[c as keyof typeof r]])));
          print(g, { kind: 'tests', data: rows, rows, columns: COLUMNS, tableColumns: TABLE_COLUMNS, title: 'fractile stored tests: identity, grade, supplier, heat, date, geometry', notes: { area_mm2: 'S0, original cross-section [mm²]', gauge_length_mm: 'L0 [mm]' }, provenance: { filter }, result: false });
        });
      });
  },
};
